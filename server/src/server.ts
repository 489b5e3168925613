import { createApp } from './app';
import { instanceId } from './features/health/instance-id';

/** Starts the HTTP server; SIGINT/SIGTERM close it gracefully (in-flight requests finish). */
const { app, ctx, close } = createApp();
const { config, logger } = ctx;

const server = app.listen(config.PORT, config.HOST, () => {
  logger.info({ url: config.publicUrl, instanceId }, `Spincycle listening on http://${config.HOST}:${config.PORT}`);
});
server.on('error', (err: NodeJS.ErrnoException) => {
  const hint =
    err.code === 'EADDRINUSE'
      ? `: port ${config.PORT} is in use (find the process with \`ss -ltnp 'sport = :${config.PORT}'\`, or set PORT)`
      : '';
  logger.fatal({ err }, `could not listen on ${config.HOST}:${config.PORT}${hint}`);
  process.exit(1);
});

let stopping = false;
function shutdown(signal: string): void {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'shutting down');
  server.close(() => {
    close().finally(() => process.exit(0));
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
process.on('unhandledRejection', (err) => logger.error({ err }, 'unhandled promise rejection'));
process.on('uncaughtException', (err) => {
  logger.fatal({ err }, 'uncaught exception');
  process.exit(1);
});
