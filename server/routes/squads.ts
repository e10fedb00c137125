import { z } from 'zod'
import { gridQuerySchema } from '../../shared/schemas/progress.ts'
import { squadCoachesSchema, squadInputSchema } from '../../shared/schemas/squads.ts'
import type { AppContext } from '../context.ts'
import { squadGrid } from '../services/progress-grid.ts'
import {
  createSquad,
  getSquad,
  listSquads,
  setSquadCoaches,
  updateSquad,
} from '../services/squads.ts'
import type { ClubRoute } from './club-routes.ts'

const squadParams = z.object({ squadId: z.uuid('No such squad.') })
const readers = ['director', 'coach', 'clinician'] as const

/** Squads: the director shapes them, coaches read theirs, clinicians read during the visit. */
export function squadRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/squads',
      allow: readers,
      handler: async (req, res) => res.json(await listSquads(ctx.db, req.club)),
    },
    {
      method: 'post',
      path: '/squads',
      allow: ['director'],
      handler: async (req, res) => {
        const squad = await createSquad(ctx.db, req.club.clubId, squadInputSchema.parse(req.body))
        res.status(201).json(await getSquad(ctx.db, req.club, squad.id))
      },
    },
    {
      method: 'get',
      path: '/squads/:squadId',
      allow: readers,
      handler: async (req, res) =>
        res.json(await getSquad(ctx.db, req.club, squadParams.parse(req.params).squadId)),
    },
    {
      method: 'patch',
      path: '/squads/:squadId',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await updateSquad(
            ctx.db,
            req.club,
            squadParams.parse(req.params).squadId,
            squadInputSchema.parse(req.body),
          ),
        ),
    },
    {
      method: 'put',
      path: '/squads/:squadId/coaches',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await setSquadCoaches(
            ctx.db,
            req.club,
            squadParams.parse(req.params).squadId,
            squadCoachesSchema.parse(req.body).userIds,
          ),
        ),
    },
    {
      method: 'get',
      path: '/squads/:squadId/grid',
      allow: readers,
      handler: async (req, res) =>
        res.json(
          await squadGrid(
            ctx.db,
            req.club,
            squadParams.parse(req.params).squadId,
            gridQuerySchema.parse(req.query),
          ),
        ),
    },
  ]
}
