import type { RequestHandler } from 'express'
import { AppError } from './errors.ts'

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS'])

/**
 * CSRF defence: a state-changing request must come from this site. Browsers send Origin on
 * every such request (and Sec-Fetch-Site); requests from other origins get 403. A request
 * with neither header is not from a browser page and carries no ambient risk.
 */
export function requireSameOrigin(publicUrl?: string): RequestHandler {
  const configured = publicUrl ? new URL(publicUrl).origin : undefined
  return (req, _res, next) => {
    if (safeMethods.has(req.method)) return next()
    const origin = req.get('origin')
    const fetchSite = req.get('sec-fetch-site')
    // With PUBLIC_URL the app has one address; without it (the demo), the one it was reached at.
    const own = configured ?? `${req.protocol}://${req.get('host')}`
    if (origin !== undefined) {
      if (origin === own) return next()
      return next(
        new AppError(403, 'cross_origin', 'This request did not come from Twofold itself.'),
      )
    }
    if (fetchSite !== undefined && fetchSite !== 'same-origin' && fetchSite !== 'none') {
      return next(
        new AppError(403, 'cross_origin', 'This request did not come from Twofold itself.'),
      )
    }
    next()
  }
}
