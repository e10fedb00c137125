import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http'
import type { AddressInfo } from 'node:net'
import type { FakeSmtp } from './fake-smtp.ts'

export interface MailViewer {
  url: string
  close(): Promise<void>
}

const loopbackHosts = new Set(['127.0.0.1', 'localhost', '[::1]'])
const loopbackPeers = new Set(['127.0.0.1', '::1', '::ffff:127.0.0.1'])

const escape = (text: string) =>
  text.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  )

/** Links in a message become clickable; everything else is escaped text. */
function body(text: string) {
  return text
    .split(/(https?:\/\/[^\s<>"']+)/g)
    .map((part, i) =>
      i % 2 === 1 ? `<a href="${escape(part)}">${escape(part)}</a>` : escape(part),
    )
    .join('')
}

function page(fake: FakeSmtp) {
  const messages = fake.messages()
  const items = messages
    .map(
      (m) => `<article>
  <h2>${escape(m.subject || '(no subject)')}</h2>
  <p class="meta">To ${escape(m.to.join(', '))} · <time datetime="${m.receivedAt}">${escape(new Date(m.receivedAt).toUTCString())}</time></p>
  <pre>${body(m.text)}</pre>
</article>`,
    )
    .join('\n')
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Twofold local mail</title>
<style>
body { font-family: system-ui, sans-serif; margin: 1.5rem auto; max-width: 50rem; padding: 0 1rem; color: #1b1f24; }
article { border: 1px solid #c9ced6; border-radius: 6px; padding: 0 1rem 1rem; margin-bottom: 1rem; }
.meta { color: #4a525c; }
pre { white-space: pre-wrap; font-family: inherit; margin: 0; }
a { color: #0b4fa8; }
</style>
</head>
<body>
<main>
<h1>Local mail</h1>
<p>No mail provider is configured, so Twofold delivers its messages to this local stand-in for
everybody's inbox. It is served only on this computer's loopback address and never in production.
Reload the page to see new messages.</p>
${messages.length ? items : '<p>No messages yet.</p>'}
</main>
</body>
</html>`
}

/**
 * A read-only page of the local fake mail server's messages: the development stand-in for each
 * person's own inbox. It listens on 127.0.0.1 only and answers only requests that name a loopback
 * host, so neither another machine nor a web page rebinding its name to this one can read it.
 */
export async function startMailViewer(fake: FakeSmtp, port = 0): Promise<MailViewer> {
  const server: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    const host = (req.headers.host ?? '').replace(/:\d+$/, '')
    const secure = {
      'Content-Security-Policy':
        "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'",
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'no-referrer',
    }
    if (!loopbackHosts.has(host) || !loopbackPeers.has(req.socket.remoteAddress ?? '')) {
      res.writeHead(403, { 'Content-Type': 'text/plain; charset=utf-8', ...secure })
      return res.end('The local mail viewer answers only on this computer.\n')
    }
    if (req.method !== 'GET' || (req.url ?? '/') !== '/') {
      res.writeHead(404, { 'Content-Type': 'text/plain; charset=utf-8', ...secure })
      return res.end('Not found.\n')
    }
    res.writeHead(200, { 'Content-Type': 'text/html; charset=utf-8', ...secure })
    res.end(page(fake))
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve())
  })
  const actual = (server.address() as AddressInfo).port
  return {
    url: `http://127.0.0.1:${actual}/`,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections()
        server.close(() => resolve())
      }),
  }
}
