import type { RequestHandler } from 'express'

/**
 * Every API answer is about a signed-in person's club or account (or an error about it): no
 * browser or proxy cache may keep a copy, downloads included. A route that means to be cached
 * can still set its own header after this.
 */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store')
  next()
}
