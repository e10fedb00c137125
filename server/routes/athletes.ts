import { z } from 'zod'
import { athleteListQuerySchema, rosterImportSchema } from '../../shared/schemas/athletes.ts'
import { todayIso } from '../../shared/domain/access.ts'
import { progressDueQuerySchema, progressEventInputSchema } from '../../shared/schemas/progress.ts'
import type { AppContext } from '../context.ts'
import { sendCsv, sendImportResult } from '../http/responses.ts'
import {
  addAthlete,
  exportRoster,
  getAthlete,
  importRoster,
  listAthletes,
  updateAthlete,
} from '../services/athletes.ts'
import { removeClipObjects } from '../services/clips.ts'
import { eraseAthlete } from '../services/erasure.ts'
import { progressDue } from '../services/progress-due.ts'
import { previewEvent, recordEvent } from '../services/progress-events.ts'
import { athleteRecords, missingSkills, recordDetail } from '../services/progress-reads.ts'
import type { ClubRoute } from './club-routes.ts'

const athleteParams = z.object({ athleteId: z.uuid('No such athlete.') })
const recordParams = athleteParams.extend({ elementId: z.uuid('No such element.') })
const readers = ['director', 'coach', 'clinician'] as const
const writers = ['director', 'coach'] as const

/**
 * Athletes (erasing one for good), the roster CSV, progress events and records, and the coaches'
 * missing-skills list and who has had nothing logged for a while.
 */
export function athleteRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/athletes',
      allow: readers,
      handler: async (req, res) =>
        res.json(await listAthletes(ctx.db, req.club, athleteListQuerySchema.parse(req.query))),
    },
    {
      method: 'post',
      path: '/athletes',
      allow: writers,
      handler: async (req, res) =>
        res.status(201).json(await addAthlete(ctx.db, req.club, req.body)),
    },
    {
      method: 'post',
      path: '/athletes/import',
      allow: writers,
      handler: async (req, res) => {
        const { rows, dryRun } = rosterImportSchema.parse(req.body)
        const result = await importRoster(ctx.db, req.club, rows, dryRun)
        sendImportResult(res, result, dryRun)
      },
    },
    {
      method: 'get',
      path: '/athletes/export',
      allow: readers,
      handler: async (req, res) => {
        const { squadId } = athleteListQuerySchema.parse(req.query)
        sendCsv(res, 'roster.csv', await exportRoster(ctx.db, req.club, squadId))
      },
    },
    {
      method: 'get',
      path: '/athletes/:athleteId',
      allow: readers,
      handler: async (req, res) =>
        res.json(await getAthlete(ctx.db, req.club, athleteParams.parse(req.params).athleteId)),
    },
    {
      method: 'patch',
      path: '/athletes/:athleteId',
      allow: writers,
      handler: async (req, res) =>
        res.json(
          await updateAthlete(
            ctx.db,
            req.club,
            athleteParams.parse(req.params).athleteId,
            req.body,
          ),
        ),
    },
    {
      method: 'post',
      path: '/athletes/:athleteId/erase',
      allow: ['director'],
      handler: async (req, res) => {
        const objects = await eraseAthlete(
          ctx.db,
          ctx.jobs,
          req.club,
          athleteParams.parse(req.params).athleteId,
          req.body,
        )
        await removeClipObjects(ctx, objects)
        res.status(204).end()
      },
    },
    {
      method: 'get',
      path: '/athletes/:athleteId/records',
      allow: readers,
      handler: async (req, res) =>
        res.json(await athleteRecords(ctx.db, req.club, athleteParams.parse(req.params).athleteId)),
    },
    {
      method: 'get',
      path: '/athletes/:athleteId/records/:elementId',
      allow: readers,
      handler: async (req, res) => {
        const { athleteId, elementId } = recordParams.parse(req.params)
        res.json(await recordDetail(ctx.db, req.club, athleteId, elementId))
      },
    },
    {
      method: 'post',
      path: '/athletes/:athleteId/events/check',
      allow: writers,
      handler: async (req, res) =>
        res.json(
          await previewEvent(
            ctx.db,
            req.club,
            athleteParams.parse(req.params).athleteId,
            progressEventInputSchema.parse(req.body),
          ),
        ),
    },
    {
      method: 'post',
      path: '/athletes/:athleteId/events',
      allow: writers,
      handler: async (req, res) => {
        const result = await recordEvent(
          ctx.db,
          req.club,
          athleteParams.parse(req.params).athleteId,
          progressEventInputSchema.parse(req.body),
        )
        // A repeat of an entry already stored creates nothing: 200 with the stored event.
        res.status(result.replayed ? 200 : 201).json(result)
      },
    },
    {
      method: 'get',
      path: '/missing-skills',
      allow: readers,
      handler: async (req, res) => {
        const { squadId } = z.object({ squadId: z.uuid().optional() }).parse(req.query)
        res.json(await missingSkills(ctx.db, req.club, { squadId }))
      },
    },
    {
      method: 'get',
      path: '/progress-due',
      allow: readers,
      handler: async (req, res) => {
        const { days } = progressDueQuerySchema.parse(req.query)
        res.json(await progressDue(ctx.db, req.club, { days, today: todayIso() }))
      },
    },
  ]
}
