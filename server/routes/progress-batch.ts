import { z } from 'zod'
import { todayIso } from '../../shared/domain/access.ts'
import { batchInputSchema, batchListQuerySchema } from '../../shared/schemas/progress-batch.ts'
import type { AppContext } from '../context.ts'
import { previewBatch, saveBatch } from '../services/progress-batch.ts'
import type { ClubRoute } from './club-routes.ts'

const squadParams = z.object({ squadId: z.uuid('No such squad.') })

/** A squad's entries on one element or a pair at once: coaches of the squad and directors. */
export function progressBatchRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      // The list alone, read-only: the tablet's service worker keeps it for offline use.
      method: 'get',
      path: '/squads/:squadId/progress-batch',
      allow: ['director', 'coach'],
      handler: async (req, res) => {
        const { squadId } = squadParams.parse(req.params)
        const query = batchListQuerySchema.parse(req.query)
        res.json(
          await previewBatch(ctx.db, req.club, squadId, {
            elementId: query.elementId,
            counterpartId: query.counterpartId ?? null,
            occurredOn: query.occurredOn ?? todayIso(),
            dryRun: true,
            entries: [],
          }),
        )
      },
    },
    {
      method: 'post',
      path: '/squads/:squadId/progress-batch',
      allow: ['director', 'coach'],
      handler: async (req, res) => {
        const { squadId } = squadParams.parse(req.params)
        const input = batchInputSchema.parse(req.body)
        if (input.dryRun) res.json(await previewBatch(ctx.db, req.club, squadId, input))
        else {
          const result = await saveBatch(ctx.db, req.club, squadId, input)
          // A repeat of a batch already stored creates nothing: 200 with the stored events.
          res.status(result.results.every((r) => r.replayed) ? 200 : 201).json(result)
        }
      },
    },
  ]
}
