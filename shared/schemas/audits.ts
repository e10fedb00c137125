import type { OutcomeSummary, VisitOutcomes } from '../domain/visit-outcomes.ts'
import { z } from 'zod'
import { ageCategories } from '../domain/age-categories.ts'
import type { AuditComparison } from '../domain/audit/comparison.ts'
import type { AuditResult } from '../domain/audit/types.ts'
import { disciplines } from '../domain/club.ts'
import { directions, rotationClasses, twistBands } from '../domain/element.ts'
import { isoDateSchema } from './auth.ts'
import { apparatusSchema } from './elements.ts'
import { text } from './text.ts'

/** POST /audits: a scope (the club, or one squad) and an as-of date or the end of a quarter. */
export const auditRunSchema = z
  .object({
    squadId: z.uuid('Choose a squad or the whole club.').nullable().default(null),
    asOf: isoDateSchema.optional(),
    quarter: z
      .string()
      .regex(/^\d{4}-Q[1-4]$/, 'Write the quarter as YYYY-Qn, e.g. 2026-Q3.')
      .optional(),
  })
  .refine((v) => !(v.asOf && v.quarter), {
    path: ['quarter'],
    message: 'Give a date or a quarter, not both.',
  })
export type AuditRun = z.infer<typeof auditRunSchema>

export const auditSummarySchema = z.object({
  id: z.uuid(),
  squadId: z.uuid().nullable(),
  scopeName: z.string(),
  asOf: z.string(),
  inputHash: z.string(),
  createdAt: z.string(),
  publishedAt: z.string().nullable(),
  /** Another audit of the same scope and date was run before this one. */
  rerun: z.boolean(),
  /** Null when no athlete in scope has a record: no data. */
  clubFrontLag: z.number().nullable(),
  balanceRatio: z.number().nullable(),
  athleteCount: z.number(),
})
export type AuditSummary = z.infer<typeof auditSummarySchema>

export const auditJobSchema = z.object({
  id: z.string(),
  status: z.enum(['running', 'done', 'failed']),
  phase: z.string(),
  done: z.number(),
  total: z.number(),
  auditId: z.uuid().nullable(),
  error: z.string().nullable(),
})
export type AuditJob = z.infer<typeof auditJobSchema>

/** GET /audits/:id: the stored result (coaches see their squads' rows), with names to show. */
export interface AuditReport {
  audit: AuditSummary
  result: AuditResult
  comparison: AuditComparison
  previous: AuditSummary | null
  /** The same scope's audits, one per date (the last run for it), oldest first. */
  trend: { id: string; asOf: string; clubFrontLag: number | null; balanceRatio: number | null }[]
  athleteNames: Record<string, string>
  squadNames: Record<string, string>
  /** True when the rows were limited to the coach's squads. */
  limitedToSquads: boolean
  /** What the scope's visits changed, with the elements' and steps' names; null without one. */
  visitOutcomes: (VisitOutcomes & { elementNames: Record<string, string> }) | null
}

const requirementSchema = z.object({
  id: z.string().min(1).max(60),
  label: text().min(1, 'Describe the requirement.').max(200),
  source: text().min(1, 'Name the source, or write "from memory".').max(300),
  matches: z.object({
    direction: z.union([z.enum(directions), z.array(z.enum(directions)).min(1)]).optional(),
    minRotationClass: z.enum(rotationClasses).optional(),
    minTwistBand: z.enum(twistBands).optional(),
  }),
  minStepIndex: z.union([z.number().int().min(0), z.literal('competition-ready')]),
})

/**
 * POST /requirement-profiles creates (409 when the id is taken); PUT /requirement-profiles/:id
 * edits one that exists. The client derives the id from the name (`profileIdFromLabel`).
 */
export const requirementProfileSchema = z.object({
  id: z.string().regex(/^[a-z0-9-]{1,60}$/, 'Use lower-case letters, digits and dashes.'),
  label: text().min(1, 'Name the profile.').max(200),
  discipline: z.enum(disciplines, 'Choose a discipline.'),
  /** Only elements of this apparatus meet the profile's requirements. */
  apparatus: apparatusSchema,
  categories: z.array(z.enum(ageCategories)).min(1, 'Choose at least one category.'),
  source: text().min(1, 'Name the source, or write "from memory".').max(300),
  requirements: z
    .array(requirementSchema)
    .min(1, 'A profile needs at least one requirement.')
    .max(30),
})
export type RequirementProfileInput = z.infer<typeof requirementProfileSchema>

/** PUT /age-thresholds/:discipline */
export const ageThresholdInputSchema = z
  .object({
    juniorFromAge: z.number().int().min(5).max(30),
    seniorFromAge: z.number().int().min(6).max(40),
    source: text().min(1, 'Name the source, or write "from memory".').max(300),
  })
  .refine((v) => v.seniorFromAge > v.juniorFromAge, {
    path: ['seniorFromAge'],
    message: 'The senior age must be above the junior age.',
  })

/** GET /board-summary: aggregates only, never an athlete. */
export interface BoardSummary {
  clubName: string
  /** One point per date, the last audit published for it; null lags are no data. */
  trend: {
    asOf: string
    clubFrontLag: number | null
    clubBackLag: number | null
    balanceRatio: number | null
  }[]
  latest: {
    asOf: string
    publishedAt: string
    athleteCount: number
    clubFrontLag: number | null
    clubBackLag: number | null
    balanceRatio: number | null
    catalogueGaps: number
    athletesWithGaps: number
    readinessAlerts: number
    /** The same changes as the director's report shows for this audit (`compareAudits`). */
    comparison: Omit<AuditComparison, 'squadFrontLags'>
    /** Squads with records, by name; those without are only counted. */
    squads: { name: string; frontLag: number; athleteCount: number }[]
    squadsWithoutRecords: number
    /** The counts of the visits' outcomes only, never the athletes. */
    visitOutcomes: OutcomeSummary | null
  } | null
}
