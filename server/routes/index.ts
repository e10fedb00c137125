import type { AppContext } from '../context.ts'
import { archiveRoutes } from './archives.ts'
import { athleteRoutes } from './athletes.ts'
import { auditRoutes } from './audits.ts'
import { catalogueRoutes } from './catalogue.ts'
import { clipRoutes } from './clips.ts'
import { clubRoutes } from './club.ts'
import type { ClubRoute } from './club-routes.ts'
import { memberRoutes } from './members.ts'
import { progressBatchRoutes } from './progress-batch.ts'
import { reportPdfRoutes } from './report-pdfs.ts'
import { squadRoutes } from './squads.ts'
import { visitRoutes } from './visits.ts'

/** Every route under /api/clubs/:clubId. Add a resource's routes here. */
export function allClubRoutes(ctx: AppContext): ClubRoute[] {
  return [
    ...clubRoutes(ctx),
    ...memberRoutes(ctx),
    ...catalogueRoutes(ctx),
    ...squadRoutes(ctx),
    ...athleteRoutes(ctx),
    ...progressBatchRoutes(ctx),
    ...auditRoutes(ctx),
    ...reportPdfRoutes(ctx),
    ...archiveRoutes(ctx),
    ...visitRoutes(ctx),
    ...clipRoutes(ctx),
  ]
}
