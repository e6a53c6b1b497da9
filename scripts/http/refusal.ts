/**
 * The short answers the HTTP server gives on its own, before React Router sees a request
 * (a body too large, a post from another site): a small HTML page for a browser's page
 * request, JSON for /api/, and plain text for React Router's own data requests (`….data`),
 * whose client shows that text in the app's error page.
 */
import type { Request, Response } from 'express'

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`)

export function refusalPage(title: string, message: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escape(title)} · Cyclewright</title>
<style>body{font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;line-height:1.5;color:#1f2933}h1{font-size:1.5rem}</style>
</head>
<body>
<main>
<h1>${escape(title)}</h1>
<p>${escape(message)}</p>
<p><a href="/">Go to your home page</a></p>
</main>
</body>
</html>
`
}

export function refuse(
  req: Request,
  res: Response,
  status: number,
  title: string,
  message: string,
  opts: { close?: boolean; headers?: Record<string, string> } = {},
) {
  if (res.headersSent) return
  res.status(status)
  res.setHeader('Cache-Control', 'no-store')
  for (const [k, v] of Object.entries(opts.headers ?? {})) res.setHeader(k, v)
  // The body was not read: the connection cannot carry another request after this one.
  if (opts.close) res.setHeader('Connection', 'close')
  const path = req.path
  if (path.startsWith('/api/')) {
    res.json({ error: message })
  } else if (path.endsWith('.data')) {
    res.type('text/plain; charset=utf-8').send(message)
  } else {
    res.type('text/html; charset=utf-8').send(refusalPage(title, message))
  }
}
