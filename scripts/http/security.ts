/**
 * Security headers and the same-origin rule for posts, as Express middleware in front of
 * React Router.
 *
 * Headers (helmet): a Content-Security-Policy whose scripts are this site's files and the
 * framework's inline scripts carrying this response's nonce; styles may be inline because
 * KaTeX writes its layout into `style` attributes; no framing of pages, by anyone
 * (frame-ancestors 'none' and X-Frame-Options DENY for older browsers; no page frames
 * anything: dispute images are <img>, PDFs downloads, and the attachment route sets its own
 * sandboxing policy); nosniff; the referrer only within the site (addresses carry invitation and
 * reset tokens); HSTS only on https. Development relaxes scripts and connections for Vite's
 * hot reloading, and nothing else.
 */
import { randomBytes } from 'node:crypto'
import type { NextFunction, Request, Response } from 'express'
import helmet from 'helmet'
import { refuse } from './refusal.ts'

export type SecurityLocals = { cspNonce?: string }

/** This response's CSP nonce; none in development, where inline scripts are allowed instead. */
export function nonceOf(res: Response): string | undefined {
  return (res.locals as SecurityLocals).cspNonce
}

/**
 * A fresh nonce per response, in res.locals.cspNonce, then helmet's headers. Development
 * uses no nonce: Vite's hot reloading injects scripts without one, and the browser hides a
 * nonce from the page, which React's development build reports as a hydration mismatch.
 */
export function securityHeaders(mode: 'production' | 'development') {
  const dev = mode === 'development'
  const withHelmet = helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: dev
          ? ["'self'", "'unsafe-inline'"]
          : ["'self'", (_req, res) => `'nonce-${nonceOf(res as Response)}'`],
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:'],
        fontSrc: ["'self'", 'data:'],
        connectSrc: dev ? ["'self'", 'ws:', 'wss:'] : ["'self'"],
        frameSrc: ["'none'"],
        objectSrc: ["'none'"],
        baseUri: ["'none'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
      },
    },
    // Sent below, only over https.
    strictTransportSecurity: false,
    referrerPolicy: { policy: 'same-origin' },
    xFrameOptions: { action: 'deny' },
  })
  return (req: Request, res: Response, next: NextFunction) => {
    if (!dev) (res.locals as SecurityLocals).cspNonce = randomBytes(16).toString('base64')
    if (req.secure) res.setHeader('Strict-Transport-Security', 'max-age=31536000; includeSubDomains')
    withHelmet(req, res, next)
  }
}

/**
 * Pages are built per person (gradebooks, answers, exports): no cache may keep them. A route
 * that states its own Cache-Control replaces this (scripts/http/request-handler.ts).
 */
export function noStore() {
  return (_req: Request, res: Response, next: NextFunction) => {
    res.setHeader('Cache-Control', 'private, no-store')
    next()
  }
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS'])

/** The origin posts must come from: APP_URL's when set, else the address the request was sent to (development). */
export function expectedOrigin(req: Request, appUrl: string | undefined): string {
  if (appUrl) return new URL(appUrl).origin
  return `${req.protocol}://${req.get('host') ?? ''}`.toLowerCase()
}

/** The origin a browser says a request comes from: Origin, or Referer's origin when Origin is absent. */
export function sourceOrigin(req: Request): string | null {
  const origin = req.get('origin')
  if (origin !== undefined) return origin === 'null' ? null : origin.toLowerCase()
  const referer = req.get('referer')
  if (!referer) return null
  try {
    return new URL(referer).origin.toLowerCase()
  } catch {
    return null
  }
}

/**
 * Every request that can change something (POST, PUT, PATCH, DELETE) must come from one of
 * this site's own pages. React Router checks this for page actions only; resource routes
 * (sign-out, /api/preview) rely on this check.
 */
export function sameOriginWrites(appUrl: () => string | undefined) {
  return (req: Request, res: Response, next: NextFunction) => {
    if (SAFE_METHODS.has(req.method)) return next()
    if (sourceOrigin(req) === expectedOrigin(req, appUrl())) return next()
    refuse(
      req,
      res,
      403,
      'This form came from another site',
      'Cyclewright only accepts forms sent from its own pages, so this one was not read and nothing was changed. Go back to Cyclewright, reload the page and send it from there.',
      { close: true },
    )
  }
}
