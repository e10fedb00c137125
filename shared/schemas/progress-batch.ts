import { z } from 'zod'
import {
  checkResultSchema,
  clientEventIdSchema,
  occurredOnSchema,
  recordViewSchema,
  skipReasonSchema,
} from './progress.ts'
import { pauseReasons } from '../domain/progress.ts'

/** One athlete who passed a step in a squad batch. */
export const batchEntrySchema = z.object({
  athleteId: z.uuid('Choose an athlete.'),
  elementId: z.uuid('Choose an element.'),
  /** The step passed; the athlete's next step when left out. */
  stepIndex: z.number().int().min(0, 'Choose a step.').nullish(),
  skipReason: skipReasonSchema.nullish(),
  clientEventId: clientEventIdSchema.nullish(),
  /**
   * The newest event the coach's screen showed for this record (null: it had none), as the
   * single entry's: a repeat without a client id meets 409 instead of moving the athlete twice.
   */
  expectedLastEventId: z.uuid('Send the newest event the screen showed, or null.').nullable(),
})
export type BatchEntry = z.infer<typeof batchEntrySchema>

/**
 * POST /squads/:squadId/progress-batch: a squad's "passed the next step" entries on one element
 * or a pair (the backward element and its forward mirror), saved in one transaction. With
 * `dryRun`, nothing is written and every athlete's row comes back with its checks.
 */
export const batchInputSchema = z
  .object({
    elementId: z.uuid('Choose an element.'),
    /** The element's mirror, logged alongside it. */
    counterpartId: z.uuid('Choose the mirrored element.').nullish(),
    occurredOn: occurredOnSchema,
    dryRun: z.boolean().default(false),
    entries: z.array(batchEntrySchema).max(200, 'Save at most 200 entries at once.').default([]),
  })
  .superRefine((value, ctx) => {
    if (!value.dryRun && value.entries.length === 0)
      ctx.addIssue({ code: 'custom', path: ['entries'], message: 'Tick at least one athlete.' })
    const seen = new Set<string>()
    const clientIds = new Set<string>()
    value.entries.forEach((entry, i) => {
      if (entry.clientEventId) {
        if (clientIds.has(entry.clientEventId))
          ctx.addIssue({
            code: 'custom',
            path: ['entries', i, 'clientEventId'],
            message: 'This entry id is already used by another entry of the batch.',
          })
        clientIds.add(entry.clientEventId)
      }
      const key = `${entry.athleteId}|${entry.elementId}`
      if (seen.has(key))
        ctx.addIssue({
          code: 'custom',
          path: ['entries', i, 'athleteId'],
          message: 'This athlete is already in the list for this element.',
        })
      seen.add(key)
    })
  })
export type BatchInput = z.input<typeof batchInputSchema>

/**
 * GET /squads/:squadId/progress-batch: the batch screen's list with no entries, read-only, so
 * that the tablet's service worker can keep it for offline use. `occurredOn` is the day the
 * checks are worked out for (the server's today when left out).
 */
export const batchListQuerySchema = z.object({
  elementId: z.uuid('Choose an element.'),
  counterpartId: z.uuid('Choose the mirrored element.').optional(),
  occurredOn: occurredOnSchema.optional(),
})
export type BatchListQuery = z.input<typeof batchListQuerySchema>

/** One athlete × element of the batch screen: where they stand and what passing next means. */
export const batchRowSchema = z.object({
  athleteId: z.uuid(),
  givenName: z.string(),
  familyName: z.string(),
  elementId: z.uuid(),
  stepIndex: z.number().nullable(),
  paused: z.boolean(),
  lastEventId: z.uuid().nullable(),
  /** The rest of the record (RecordView), for the tablet to foresee an entry kept offline. */
  highestStepIndex: z.number().nullable(),
  stepReachedOn: z.string().nullable(),
  pauseReason: z.enum(pauseReasons).nullable(),
  plannedStepIndex: z.number().nullable(),
  lastEventOn: z.string().nullable(),
  flagged: z.boolean(),
  /** The step a tick records (the entry's, or the one after the current step); null at the top. */
  nextStep: z.object({ index: z.number(), name: z.string(), criterion: z.string() }).nullable(),
  /** The checks that recording it would run now (the same as a single entry's). */
  checks: z.array(checkResultSchema),
  /** The position of this row's entry in the request, when it has one. */
  entryIndex: z.number().nullable(),
})
export type BatchRow = z.infer<typeof batchRowSchema>

export const batchPreviewSchema = z.object({
  squad: z.object({ id: z.uuid(), name: z.string() }),
  elements: z.array(
    z.object({
      id: z.uuid(),
      name: z.string(),
      direction: z.enum(['forward', 'backward', 'sideward']),
      stepCount: z.number(),
      /**
       * Every step with its pass criterion and least days (null: none): the tablet names the next
       * step after a kept entry and works out its checks. A list kept before the least days were
       * sent has none.
       */
      steps: z.array(
        z.object({
          index: z.number(),
          name: z.string(),
          criterion: z.string(),
          minDays: z.number().nullable().optional(),
        }),
      ),
    }),
  ),
  rows: z.array(batchRowSchema),
})
export type BatchPreview = z.infer<typeof batchPreviewSchema>

export const batchResultSchema = z.object({
  results: z.array(
    z.object({
      entryIndex: z.number(),
      athleteId: z.uuid(),
      elementId: z.uuid(),
      eventId: z.uuid(),
      record: recordViewSchema,
      checks: z.array(checkResultSchema),
      replayed: z.boolean(),
    }),
  ),
})
export type BatchResult = z.infer<typeof batchResultSchema>
