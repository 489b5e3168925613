import { Router } from 'express';

/**
 * `/dev/mailbox`: shows what the local SMTP fake received, so that someone trying the demo
 * can click a reset or invitation link. Mounted only when the fakes run (MAILBOX_URL set).
 */
export function createDevMailboxRoutes(mailboxUrl: string): Router {
  const router = Router();
  router.get('/{*path}', async (req, res) => {
    const target = new URL(req.originalUrl.replace(/^\/dev\/mailbox/, '') || '/', mailboxUrl);
    try {
      const upstream = await fetch(target);
      res.status(upstream.status).type(upstream.headers.get('content-type') ?? 'text/html');
      res.send(Buffer.from(await upstream.arrayBuffer()));
    } catch {
      res.status(502).json({ code: 'mailbox_unreachable', message: `The local mail fake at ${mailboxUrl} does not answer` });
    }
  });
  return router;
}
