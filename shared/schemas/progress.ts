import { z } from 'zod'
import { pauseReasons } from '../domain/progress.ts'
import { isoDateSchema } from './auth.ts'
import { text } from './text.ts'

/** The day an event happened: not in the future. */
export const occurredOnSchema = isoDateSchema.refine(
  // A day of grace: east of UTC a coach's morning is already the next UTC date.
  (d) => d <= new Date(Date.now() + 86_400_000).toISOString().slice(0, 10),
  'The date cannot be in the future.',
)

export const skipReasonSchema = text().max(500, 'Keep the reason to 500 characters.')

/**
 * The id the tablet makes for an entry (a UUID): the server stores an entry with the same id
 * once, so a retry never makes a second event.
 */
export const clientEventIdSchema = z.uuid('The entry id must be a UUID.')

/** POST /athletes/:athleteId/events (and /events/check to preview the checks). */
export const progressEventInputSchema = z
  .object({
    elementId: z.uuid('Choose an element.'),
    kind: z.enum(['step', 'pause', 'resume'], 'Choose what happened.'),
    stepIndex: z.number().int().min(0, 'Choose a step.').nullish(),
    pauseReason: z.enum(pauseReasons, 'Choose why training pauses.').nullish(),
    /** For a lost-skill pause: the step the athlete rebuilds from. */
    plannedStepIndex: z.number().int().min(0).nullish(),
    occurredOn: occurredOnSchema,
    note: text().max(1000, 'Keep the note to 1000 characters.').nullish(),
    skipReason: skipReasonSchema.nullish(),
    clientEventId: clientEventIdSchema.nullish(),
    /** A correction: the earlier, mistaken event that this one voids. */
    correctsEventId: z.uuid().nullish(),
    /**
     * The newest event the coach's screen showed for this record (null when it had none). If
     * someone else has written since, the server answers 409 with the current record.
     */
    expectedLastEventId: z.uuid().nullable(),
  })
  .superRefine((value, ctx) => {
    if (value.kind === 'step' && (value.stepIndex === null || value.stepIndex === undefined))
      ctx.addIssue({ code: 'custom', path: ['stepIndex'], message: 'Choose the step reached.' })
    if (value.kind === 'pause' && !value.pauseReason)
      ctx.addIssue({
        code: 'custom',
        path: ['pauseReason'],
        message: 'Choose why training pauses.',
      })
  })
export type ProgressEventInput = z.infer<typeof progressEventInputSchema>

export const checkResultSchema = z.object({
  code: z.enum(['skipped-step', 'min-days', 'prerequisite', 'lost-skill-step-down']),
  severity: z.enum(['warning', 'requires-reason']),
  message: z.string(),
  skippedStepIndices: z.array(z.number()).optional(),
  proposedStepIndex: z.number().optional(),
})
export type CheckResultView = z.infer<typeof checkResultSchema>

export const eventViewSchema = z.object({
  id: z.uuid(),
  kind: z.enum(['step', 'pause', 'resume']),
  /** In the element's current steps. */
  stepIndex: z.number().nullable(),
  pauseReason: z.enum(pauseReasons).nullable(),
  plannedStepIndex: z.number().nullable(),
  occurredOn: z.string(),
  recordedAt: z.string(),
  coachName: z.string().nullable(),
  note: z.string().nullable(),
  skipReason: z.string().nullable(),
  correctsEventId: z.uuid().nullable(),
  /** True when a later correction voids it. */
  voided: z.boolean(),
  checks: z.array(checkResultSchema),
})
export type EventView = z.infer<typeof eventViewSchema>

export const recordViewSchema = z.object({
  athleteId: z.uuid(),
  elementId: z.uuid(),
  stepIndex: z.number().nullable(),
  highestStepIndex: z.number().nullable(),
  stepReachedOn: z.string().nullable(),
  paused: z.boolean(),
  pauseReason: z.enum(pauseReasons).nullable(),
  plannedStepIndex: z.number().nullable(),
  lastEventOn: z.string().nullable(),
  lastEventId: z.uuid().nullable(),
  flagged: z.boolean(),
})
export type RecordView = z.infer<typeof recordViewSchema>

/** GET /athletes/:athleteId/records/:elementId */
export const recordDetailSchema = recordViewSchema.extend({
  steps: z.array(
    z.object({
      name: z.string(),
      modality: z.string(),
      /** What the athlete shows to pass the step. */
      criterion: z.string(),
      minDays: z.number().nullable(),
    }),
  ),
  events: z.array(eventViewSchema),
})
export type RecordDetail = z.infer<typeof recordDetailSchema>

/**
 * The answer of POST /events: the new event's id, the record and the checks kept with the event.
 * `replayed` is true when an entry with the same client id was already stored (nothing new was
 * written; the record is as it stands now).
 */
export const eventResultSchema = z.object({
  eventId: z.uuid(),
  record: recordViewSchema,
  checks: z.array(checkResultSchema),
  replayed: z.boolean(),
})
export type EventResult = z.infer<typeof eventResultSchema>

export const gridQuerySchema = z.object({
  apparatus: z.string().trim().min(1).max(40).optional(),
  rotationClass: z.enum(['none', 'single', 'double', 'triple']).optional(),
})

/** GET /squads/:squadId/grid: athletes × elements, columns ordered so that pairs stand together. */
export const gridSchema = z.object({
  squad: z.object({ id: z.uuid(), name: z.string() }),
  athletes: z.array(z.object({ id: z.uuid(), givenName: z.string(), familyName: z.string() })),
  columns: z.array(
    z.object({
      elementId: z.uuid(),
      name: z.string(),
      apparatus: z.string(),
      direction: z.enum(['forward', 'backward', 'sideward']),
      rotationClass: z.string(),
      notation: z.string().nullable(),
      stepCount: z.number(),
      /** The mirrored element's column, when it is in the grid. */
      counterpartId: z.uuid().nullable(),
      /** Columns of one pair share it: backward and forward side by side. */
      pairKey: z.string(),
    }),
  ),
  /** cells[athleteIndex][columnIndex]: step index reached, null when not started. */
  cells: z.array(
    z.array(z.object({ step: z.number().nullable(), paused: z.boolean(), flagged: z.boolean() })),
  ),
})
export type Grid = z.infer<typeof gridSchema>

/** GET /missing-skills: where the forward mirror trails the backward element by 2 steps or more. */
export const missingSkillSchema = z.object({
  athleteId: z.uuid(),
  athleteName: z.string(),
  squadId: z.uuid(),
  squadName: z.string(),
  backward: z.object({
    elementId: z.uuid(),
    name: z.string(),
    stepIndex: z.number(),
    stepCount: z.number(),
  }),
  forward: z
    .object({
      elementId: z.uuid(),
      name: z.string(),
      stepIndex: z.number().nullable(),
      stepCount: z.number(),
    })
    .nullable(),
  /** Steps by which the forward element trails; null when the catalogue has no forward mirror. */
  trailBy: z.number().nullable(),
})
export type MissingSkill = z.infer<typeof missingSkillSchema>

/** GET /progress-due: who has had nothing logged for `days` days (28 unless asked). */
export const progressDueQuerySchema = z.object({
  days: z.coerce
    .number('Give the number of days as a whole number.')
    .int('Give the number of days as a whole number.')
    .min(1, 'Give at least 1 day.')
    .max(365, 'Give at most 365 days.')
    .default(28),
})

export const dueAthleteSchema = z.object({
  athleteId: z.uuid(),
  athleteName: z.string(),
  squadId: z.uuid(),
  squadName: z.string(),
  /** The day of the latest progress logged for them, on any element; null when none ever. */
  lastEventOn: z.string().nullable(),
})
export type DueAthlete = z.infer<typeof dueAthleteSchema>
