import { Router, type Request, type Response } from 'express'
import type { Role } from '../../shared/domain/club.ts'
import { allowRoles, type ClubAccess } from '../auth/club-access.ts'

export type ClubRequest = Request & { club: ClubAccess }

/**
 * One route of club data. Every club route is declared this way, with the roles it allows, so
 * that the access matrix test can list them all and no route exists without a role check.
 */
export interface ClubRoute {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  /** Below /api/clubs/:clubId, e.g. '/members/:userId'. */
  path: string
  allow: readonly Role[]
  handler: (req: ClubRequest, res: Response) => unknown
}

export const everyRole: readonly Role[] = ['director', 'coach', 'clinician', 'board']

export function clubRoutesRouter(routes: ClubRoute[]) {
  const router = Router({ mergeParams: true })
  for (const route of routes) {
    router[route.method](route.path, allowRoles(route.allow), async (req, res) => {
      await route.handler(req as ClubRequest, res)
    })
  }
  return router
}
