import { z } from 'zod'
import {
  recommendationPriorities,
  recommendationStatuses,
  type VisitPhase,
} from '../domain/visits.ts'
import { emailSchema, isoDateSchema } from './auth.ts'
import { text } from './text.ts'

const visitFields = {
  firstDay: isoDateSchema,
  lastDay: isoDateSchema,
  squadIds: z
    .array(z.uuid('Choose squads of this club.'))
    .min(1, 'Choose at least one squad.')
    .max(100),
  agenda: text().max(2000).default(''),
}

const lastNotBeforeFirst = (
  value: { firstDay?: string; lastDay?: string },
  ctx: z.RefinementCtx,
) => {
  if (value.firstDay && value.lastDay && value.lastDay < value.firstDay)
    ctx.addIssue({
      code: 'custom',
      path: ['lastDay'],
      message: 'The last day cannot be before the first day.',
    })
}

/**
 * POST /visits: a clinician of the club (`clinicianId`) or, for someone not yet a member, the
 * e-mail address the invitation goes to.
 */
export const visitInputSchema = z
  .object({
    clinicianId: z.string().min(1).max(100).optional(),
    email: emailSchema.optional(),
    ...visitFields,
  })
  .superRefine((value, ctx) => {
    if (!value.clinicianId && !value.email)
      ctx.addIssue({
        code: 'custom',
        path: ['clinicianId'],
        message: 'Choose a clinician or enter the e-mail address to invite.',
      })
    lastNotBeforeFirst(value, ctx)
  })
export type VisitInput = z.input<typeof visitInputSchema>

/** PATCH /visits/:visitId: new dates, squads or agenda. */
export const visitUpdateSchema = z
  .object({
    firstDay: visitFields.firstDay,
    lastDay: visitFields.lastDay,
    squadIds: visitFields.squadIds,
    agenda: text().max(2000),
  })
  .partial()
  .superRefine(lastNotBeforeFirst)
export type VisitUpdate = z.infer<typeof visitUpdateSchema>

export interface VisitView {
  id: string
  clinicianId: string | null
  clinicianName: string | null
  /** The invited address while the invitation is not accepted yet. */
  invitedEmail: string | null
  firstDay: string
  lastDay: string
  agenda: string
  squads: { id: string; name: string }[]
  cancelledAt: string | null
  phase: VisitPhase
  recommendationCount: number
}

export const recommendationInputSchema = z
  .object({
    squadId: z.uuid('Choose a squad.'),
    athleteId: z.uuid('Choose an athlete.').optional(),
    elementId: z.uuid('Choose an element.').optional(),
    suggestedStepIndex: z.number().int().min(0, 'Choose a step.').max(50).optional(),
    /** A clip of the athlete the recommendation is about. */
    clipId: z.uuid('Choose a clip of this athlete.').optional(),
    text: text().min(1, 'Write the recommendation.').max(4000),
    priority: z.enum(recommendationPriorities, 'Choose a priority.').default('normal'),
    dueOn: isoDateSchema,
  })
  .superRefine((value, ctx) => {
    if (value.elementId && !value.athleteId)
      ctx.addIssue({
        code: 'custom',
        path: ['athleteId'],
        message: 'A recommendation on an element names the athlete.',
      })
    if (value.elementId && value.suggestedStepIndex === undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['suggestedStepIndex'],
        message: 'Choose the step to aim for.',
      })
    if (value.clipId && !value.athleteId)
      ctx.addIssue({
        code: 'custom',
        path: ['athleteId'],
        message: 'A recommendation on a clip names the athlete.',
      })
    if (!value.elementId && value.suggestedStepIndex !== undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['elementId'],
        message: 'A suggested step needs an element.',
      })
  })
export type RecommendationInput = z.input<typeof recommendationInputSchema>

/** POST /recommendations/:id/status: a reason to decline and a note when done are required. */
export const recommendationStatusSchema = z
  .object({
    status: z.enum(['accepted', 'declined', 'done'], 'Choose accept, decline or done.'),
    note: text().max(2000).default(''),
  })
  .superRefine((value, ctx) => {
    if (value.status === 'declined' && !value.note)
      ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say why you decline it.' })
    if (value.status === 'done' && !value.note)
      ctx.addIssue({ code: 'custom', path: ['note'], message: 'Add a note on what was done.' })
  })
export type RecommendationStatusInput = z.input<typeof recommendationStatusSchema>

export const recommendationQuerySchema = z.object({
  squadId: z.uuid('No such squad.').optional(),
  athleteId: z.uuid('No such athlete.').optional(),
  elementId: z.uuid('No such element.').optional(),
  visitId: z.uuid('No such visit.').optional(),
  /** Only those still asking something of the coaches (open or accepted). */
  open: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .optional(),
})

export interface RecommendationHistoryEntry {
  status: (typeof recommendationStatuses)[number]
  note: string
  byName: string | null
  at: string
}

export interface RecommendationView {
  id: string
  visitId: string
  squadId: string
  squadName: string
  athleteId: string | null
  athleteName: string | null
  elementId: string | null
  elementName: string | null
  suggestedStepIndex: number | null
  suggestedStepName: string | null
  clipId: string | null
  text: string
  priority: (typeof recommendationPriorities)[number]
  dueOn: string
  status: (typeof recommendationStatuses)[number]
  clinicianName: string | null
  createdAt: string
  history: RecommendationHistoryEntry[]
}
