import { z } from 'zod'
import { directions, rotationClasses, shapes, twistBands } from '../domain/element.ts'
import { csvRowsSchema } from './csv.ts'
import { elementSchema } from './elements.ts'
import { progressionStepSchema, progressionStepsSchema } from './progressions.ts'

// The catalogue API beyond the element itself: list filters, steps, prerequisites, import,
// templates. Paths are below /api/clubs/:clubId.

/** GET /elements query: every filter optional, `q` searches the name, the notes and the notation. */
export const elementQuerySchema = z.object({
  apparatus: z.string().trim().min(1).max(40).optional(),
  direction: z.enum(directions).optional(),
  rotationClass: z.enum(rotationClasses).optional(),
  twistBand: z.enum(twistBands).optional(),
  shape: z.enum(shapes).optional(),
  q: z.string().trim().max(80).optional(),
})
export type ElementQuery = z.infer<typeof elementQuerySchema>

export const prerequisiteSchema = z.object({
  /** The element required. */
  elementId: z.uuid('Choose the element that is required.'),
  /** The step of it the athlete must have reached (0-based index). */
  stepIndex: z.number().int().min(0, 'Choose a step.'),
})
export type Prerequisite = z.infer<typeof prerequisiteSchema>

/** GET /elements/:id: the element with its progression and prerequisites. */
export const elementDetailSchema = elementSchema.safeExtend({
  steps: z.array(progressionStepSchema),
  prerequisites: z.array(
    prerequisiteSchema.extend({
      name: z.string(),
      apparatus: z.string(),
      stepName: z.string().nullable(),
    }),
  ),
  /** How many athletes have a record on this element (deleting is refused while any do). */
  athletesWithRecords: z.number().int().min(0),
  templateFamily: z.string(),
  /** The version of `steps`: an edit of them sends it back and is refused once it is stale. */
  stepsVersion: z.number().int().min(1),
})
export type ElementDetail = z.infer<typeof elementDetailSchema>

/**
 * PUT /elements/:id/steps. While athletes have records on the element the change must say where
 * each old step goes: `mapping[oldIndex] = newIndex`, one entry per old step. `stepsVersion` is
 * the version of the steps the edit was made against; if they have changed since, the server
 * answers 409 with the element as it now stands and applies nothing.
 */
export const stepsUpdateSchema = z.object({
  steps: progressionStepsSchema,
  mapping: z.array(z.number().int().min(0)).nullish(),
  stepsVersion: z
    .number({ error: 'Send the version of the progression this edit was made against.' })
    .int('The progression version is a whole number.')
    .min(1, 'The progression version is a whole number from 1.'),
})
export type StepsUpdate = z.infer<typeof stepsUpdateSchema>

/** PUT /elements/:id/prerequisites: the whole list; a cycle is refused naming its elements. */
export const prerequisitesUpdateSchema = z.object({
  prerequisites: z.array(prerequisiteSchema).max(20, 'At most 20 prerequisites per element.'),
})

/** POST /elements/import: rows already read from CSV; nothing is saved unless all are valid. */
export const elementImportSchema = z.object({
  rows: csvRowsSchema(2000),
  /** Check only: answer the per-row errors without saving. */
  dryRun: z.boolean().default(false),
})

export const importIssueSchema = z.object({
  /** 1-based data row of the file (the header is not counted). */
  row: z.number().int().min(1),
  field: z.string(),
  message: z.string(),
})
export type ImportIssue = z.infer<typeof importIssueSchema>

export const importResultSchema = z.object({
  valid: z.boolean(),
  errors: z.array(importIssueSchema),
  /** Rows saved (0 for a dry run or an invalid file). */
  created: z.number().int().min(0),
})
export type ImportResult = z.infer<typeof importResultSchema>

export const progressionTemplateSchema = z.object({
  family: z.string(),
  label: z.string(),
  steps: z.array(progressionStepSchema),
})
export type ProgressionTemplateView = z.infer<typeof progressionTemplateSchema>

/** PUT /progression-templates/:family: new steps for elements created from now on. */
export const templateUpdateSchema = z.object({ steps: progressionStepsSchema })
