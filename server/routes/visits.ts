import { z } from 'zod'
import { visitUpdateSchema } from '../../shared/schemas/visits.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import {
  createRecommendation,
  listRecommendations,
  setRecommendationStatus,
} from '../services/recommendations.ts'
import { cancelVisit, createVisit, listVisits, updateVisit } from '../services/visits.ts'
import type { ClubRoute } from './club-routes.ts'

const visitParams = z.object({ visitId: z.uuid('No such visit.') })
const recommendationParams = z.object({ id: z.uuid('No such recommendation.') })

/**
 * Clinician visits: the director schedules them; the clinician leaves recommendations during
 * one; the coaches of the squad answer them.
 */
export function visitRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/visits',
      allow: ['director', 'clinician'],
      handler: async (req, res) => res.json(await listVisits(ctx.db, req.club)),
    },
    {
      method: 'post',
      path: '/visits',
      allow: ['director'],
      handler: async (req, res) =>
        res.status(201).json(await createVisit(ctx, req.club, req.body, publicOrigin(ctx.env))),
    },
    {
      method: 'patch',
      path: '/visits/:visitId',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await updateVisit(
            ctx.db,
            req.club,
            visitParams.parse(req.params).visitId,
            visitUpdateSchema.parse(req.body),
          ),
        ),
    },
    {
      method: 'post',
      path: '/visits/:visitId/cancel',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(await cancelVisit(ctx.db, req.club, visitParams.parse(req.params).visitId)),
    },
    {
      method: 'get',
      path: '/recommendations',
      allow: ['director', 'coach', 'clinician'],
      handler: async (req, res) => res.json(await listRecommendations(ctx.db, req.club, req.query)),
    },
    {
      method: 'post',
      path: '/recommendations',
      allow: ['clinician'],
      handler: async (req, res) =>
        res.status(201).json(await createRecommendation(ctx, req.club, req.body)),
    },
    {
      method: 'post',
      path: '/recommendations/:id/status',
      allow: ['coach'],
      handler: async (req, res) =>
        res.json(
          await setRecommendationStatus(
            ctx.db,
            req.club,
            recommendationParams.parse(req.params).id,
            req.body,
          ),
        ),
    },
  ]
}
