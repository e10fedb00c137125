import { z } from 'zod'
import { directions, modalities } from '../domain/element.ts'
import { isoDateSchema } from './auth.ts'
import { text } from './text.ts'

/** POST/PUT /planner/stations: a station of the club's gym, saved and reused. */
export const stationInputSchema = z.object({
  name: text('Name the station.')
    .min(1, 'Name the station.')
    .max(80, 'Keep the name to 80 characters.'),
  modality: z.enum(modalities, { error: 'Choose the modality the station serves.' }),
  capacity: z
    .number('Enter how many athletes work on it at once.')
    .int('Enter a whole number of athletes.')
    .min(1, 'At least one athlete works on a station.')
    .max(20, 'At most 20 athletes at once.'),
  secondsPerTurn: z
    .number('Enter the seconds one turn takes.')
    .int('Enter whole seconds.')
    .min(5, 'A turn takes at least 5 seconds.')
    .max(900, 'A turn takes at most 900 seconds (15 minutes).'),
  needsSpotter: z.boolean('Say whether a coach spots at it.'),
})
export type StationInput = z.infer<typeof stationInputSchema>
export const stationSchema = stationInputSchema.extend({ id: z.uuid() })
export type Station = z.infer<typeof stationSchema>

/** POST /planner/plan: what the coach asks for. */
export const planRequestSchema = z
  .object({
    squadId: z.uuid('Choose a squad.'),
    athleteIds: z
      .array(z.uuid('Choose athletes of the squad.'))
      .min(1, 'Choose at least one athlete present.')
      .max(60, 'Plan for at most 60 athletes at once.'),
    minutes: z
      .number('Enter the minutes available.')
      .int('Enter whole minutes.')
      .min(5, 'Plan at least 5 minutes.')
      .max(240, 'Plan at most 240 minutes.'),
    blocks: z
      .number('Enter the number of rotation blocks.')
      .int('Enter a whole number of blocks.')
      .min(1, 'At least one block.')
      .max(12, 'At most 12 blocks.'),
    changeoverSeconds: z
      .number('Enter the changeover seconds.')
      .int('Enter whole seconds.')
      .min(0, 'The changeover cannot be negative.')
      .max(300, 'Keep the changeover to 300 seconds.')
      .default(60),
    coaches: z
      .number('Enter the coaches present.')
      .int('Enter a whole number of coaches.')
      .min(0, 'The coaches present cannot be negative.')
      .max(20, 'At most 20 coaches.'),
    stationIds: z
      .array(z.uuid('Choose the club’s stations.'))
      .min(1, 'Choose at least one station.')
      .max(20, 'At most 20 stations.'),
    focus: z.discriminatedUnion(
      'mode',
      [
        z.object({ mode: z.literal('gaps') }),
        z.object({
          mode: z.literal('elements'),
          elementIds: z
            .array(z.uuid('Choose elements of the catalogue.'))
            .min(1, 'Choose at least one element.')
            .max(10, 'Choose at most 10 elements.'),
        }),
      ],
      { error: 'Choose the focus.' },
    ),
  })
  .superRefine((value, ctx) => {
    if (value.minutes * 60 < value.blocks * (value.changeoverSeconds + 1))
      ctx.addIssue({
        code: 'custom',
        path: ['blocks'],
        message: 'Too many blocks for the minutes: each block needs time beyond its changeover.',
      })
  })
export type PlanRequest = z.input<typeof planRequestSchema>

const focusStepSchema = z.object({
  elementId: z.uuid(),
  elementName: z.string().max(200),
  direction: z.enum(directions),
  stepIndex: z.number().int().min(0),
  stepName: z.string().max(200),
  modality: z.enum(modalities),
  kind: z.enum(['reached', 'next']),
})

/** The model a plan is computed from, as the server built it (saved with the plan). */
export const planModelSchema = z.object({
  minutes: z.number().int().min(5).max(240),
  blocks: z.number().int().min(1).max(12),
  changeoverSeconds: z.number().int().min(0).max(300),
  coaches: z.number().int().min(0).max(20),
  stations: z.array(stationSchema).min(1).max(20),
  athletes: z
    .array(
      z.object({
        id: z.uuid(),
        name: z.string().max(200),
        options: z.array(focusStepSchema).max(40),
      }),
    )
    .min(1)
    .max(60),
})

export const placementSchema = z.object({
  athleteId: z.uuid(),
  block: z.number().int().min(0).max(11),
  stationId: z.uuid(),
  option: z.number().int().min(0),
  turns: z.number().int().min(0).max(10_000),
})

export const solverReportSchema = z.object({
  status: z.string(),
  gap: z.number(),
  bound: z.number(),
  milliseconds: z.number(),
})

/** The answer to a plan request. */
export interface PlanResult {
  model: z.infer<typeof planModelSchema>
  placements: z.infer<typeof placementSchema>[]
  /** The solver's smallest number of turns for any athlete, before the block layout. */
  solverMinTurns: number
  solver: z.infer<typeof solverReportSchema>
  /** Why not every athlete can get a turn; empty when they all can. */
  reasons: string[]
  /** Where the focus came from, e.g. "the audit as of 2027-03-31" or "chosen elements". */
  focusSource: string
}

/** POST /plans (save) and PUT /plans/:planId (save again after moves). */
export const savePlanSchema = z.object({
  squadId: z.uuid('Choose a squad.'),
  sessionDate: isoDateSchema,
  model: planModelSchema,
  placements: z.array(placementSchema).max(60 * 12),
})
export type SavePlanInput = z.infer<typeof savePlanSchema>

export interface SavedPlanSummary {
  id: string
  squadId: string
  squadName: string
  sessionDate: string
  athleteCount: number
  recordedAt: string | null
  updatedAt: string
}

export interface SavedPlan extends SavedPlanSummary {
  model: z.infer<typeof planModelSchema>
  placements: z.infer<typeof placementSchema>[]
  outcome: PlanOutcome | null
}

/** POST /plans/:planId/outcome: who passed the next step of what they worked on. */
export const planOutcomeSchema = z.object({
  occurredOn: isoDateSchema.refine(
    (d) => d <= new Date(Date.now() + 86_400_000).toISOString().slice(0, 10),
    'The date cannot be in the future.',
  ),
  passed: z
    .array(
      z.object({
        athleteId: z.uuid('Choose an athlete.'),
        elementId: z.uuid('Choose an element.'),
      }),
    )
    .max(600, 'At most 600 passes at once.'),
})
export type PlanOutcomeInput = z.infer<typeof planOutcomeSchema>

export interface PlanOutcome {
  occurredOn: string
  passed: { athleteId: string; elementId: string; stepIndex: number }[]
  recordedBy: string | null
}
