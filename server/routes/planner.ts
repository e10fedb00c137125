import { z } from 'zod'
import type { AppContext } from '../context.ts'
import {
  createStation,
  deleteStation,
  listStations,
  planSession,
  updateStation,
} from '../services/planner.ts'
import {
  getPlan,
  listPlans,
  recordPlanOutcome,
  savePlan,
  updatePlan,
} from '../services/planner-plans.ts'
import type { ClubRoute } from './club-routes.ts'

const stationParams = z.object({ stationId: z.uuid('No such station.') })
const planParams = z.object({ planId: z.uuid('No such plan.') })
const planQuery = z.object({ squadId: z.uuid('No such squad.').optional() })
/** Coaches plan sessions for their squads; the director for any. */
const planners = ['director', 'coach'] as const

/** The session planner: the club's stations, plans computed, saved, reopened and recorded. */
export function plannerRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/planner/stations',
      allow: planners,
      handler: async (req, res) => res.json(await listStations(ctx.db, req.club.clubId)),
    },
    {
      method: 'post',
      path: '/planner/stations',
      allow: planners,
      handler: async (req, res) =>
        res.status(201).json(await createStation(ctx.db, req.club.clubId, req.body)),
    },
    {
      method: 'put',
      path: '/planner/stations/:stationId',
      allow: planners,
      handler: async (req, res) =>
        res.json(
          await updateStation(
            ctx.db,
            req.club.clubId,
            stationParams.parse(req.params).stationId,
            req.body,
          ),
        ),
    },
    {
      method: 'delete',
      path: '/planner/stations/:stationId',
      allow: planners,
      handler: async (req, res) => {
        await deleteStation(ctx.db, req.club.clubId, stationParams.parse(req.params).stationId)
        res.status(204).end()
      },
    },
    {
      method: 'post',
      path: '/planner/plan',
      allow: planners,
      handler: async (req, res) => res.json(await planSession(ctx.db, req.club, req.body)),
    },
    {
      method: 'get',
      path: '/plans',
      allow: planners,
      handler: async (req, res) =>
        res.json(await listPlans(ctx.db, req.club, planQuery.parse(req.query).squadId)),
    },
    {
      method: 'post',
      path: '/plans',
      allow: planners,
      handler: async (req, res) => res.status(201).json(await savePlan(ctx.db, req.club, req.body)),
    },
    {
      method: 'get',
      path: '/plans/:planId',
      allow: planners,
      handler: async (req, res) =>
        res.json(await getPlan(ctx.db, req.club, planParams.parse(req.params).planId)),
    },
    {
      method: 'put',
      path: '/plans/:planId',
      allow: planners,
      handler: async (req, res) =>
        res.json(await updatePlan(ctx.db, req.club, planParams.parse(req.params).planId, req.body)),
    },
    {
      method: 'post',
      path: '/plans/:planId/outcome',
      allow: planners,
      handler: async (req, res) =>
        res.json(
          await recordPlanOutcome(ctx.db, req.club, planParams.parse(req.params).planId, req.body),
        ),
    },
  ]
}
