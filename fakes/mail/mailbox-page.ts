import type { FakeMessage } from './mail-fake';

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** Turns http(s) URLs of a plain-text body into links (after escaping everything else). */
function linkify(text: string): string {
  return escapeHtml(text).replace(/https?:\/\/[^\s<]+/g, (url) => `<a href="${url}">${url}</a>`);
}

/** The development mailbox: newest first, optionally for one recipient. No scripts (the fake's CSP forbids them). */
export function renderMailboxPage(messages: FakeMessage[], to?: string): string {
  const shown = to ? messages.filter((m) => m.to.some((r) => r.toLowerCase() === to.toLowerCase())) : messages;
  const items = shown
    .map(
      (m) => `<article>
  <header><h2>${escapeHtml(m.subject || '(no subject)')}</h2>
  <p class="meta">To <strong>${escapeHtml(m.to.join(', '))}</strong> · from ${escapeHtml(m.from)} · <time datetime="${m.receivedAt}">${m.receivedAt.replace('T', ' ').slice(0, 19)} UTC</time></p></header>
  <pre>${linkify(m.text)}</pre>
  ${m.attachments.length ? `<p class="meta">Attachments: ${m.attachments.map((a) => `${escapeHtml(a.filename)} (${a.contentType}, ${a.size} bytes)`).join('; ')}</p>` : ''}
</article>`,
    )
    .join('\n');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Development mailbox · Spincycle</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="referrer" content="no-referrer">
<style>
 body{font-family:'IBM Plex Sans',system-ui,sans-serif;margin:0;background:#f4f5f8;color:#1b1c22}
 main{max-width:60rem;margin:0 auto;padding:1.5rem}
 h1{font-size:1.5rem;margin:0 0 .25rem} .note{color:#4a4d5a;margin:0 0 1.5rem}
 article{background:#fff;border:1px solid #d9dbe4;border-radius:8px;padding:1rem 1.25rem;margin-bottom:1rem}
 h2{font-size:1.1rem;margin:0} .meta{color:#4a4d5a;font-size:.9rem;margin:.25rem 0}
 pre{white-space:pre-wrap;font-family:inherit;margin:.75rem 0 0} a{color:#2d2f8f}
</style></head>
<body><main>
<h1>Development mailbox</h1>
<p class="note">Messages the local SMTP fake received (newest first). Nothing here left this machine. ${shown.length} message${shown.length === 1 ? '' : 's'}${to ? ` to ${escapeHtml(to)}` : ''}.</p>
${items || '<p>No messages yet.</p>'}
</main></body></html>`;
}
