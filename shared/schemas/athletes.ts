import { z } from 'zod'
import { disciplines } from '../domain/club.ts'
import { csvRowsSchema } from './csv.ts'
import { somethingToChange, text } from './text.ts'

/** The oldest birth year accepted: a wide margin for adult and masters athletes. */
export const earliestBirthYear = 1930

export const athleteInputSchema = z.object({
  givenName: text().min(1, 'Enter the given name.').max(80),
  familyName: text().min(1, 'Enter the family name.').max(80),
  birthYear: z
    .number({ error: 'Enter the birth year as a number, e.g. 2014.' })
    .int()
    .min(earliestBirthYear, `The birth year must be ${earliestBirthYear} or later.`)
    .refine((year) => year <= new Date().getFullYear(), 'The birth year cannot be in the future.'),
  squadId: z.uuid('Choose a squad.'),
  discipline: z.enum(disciplines, `Choose a discipline: ${disciplines.join(', ')}.`),
})
export type AthleteInput = z.infer<typeof athleteInputSchema>

/** PATCH /athletes/:athleteId: any subset but none at all; moving squads keeps the history. */
export const athleteUpdateSchema = athleteInputSchema
  .partial()
  .extend({
    archived: z.boolean().optional(),
  })
  .superRefine(somethingToChange('Nothing to change: send at least one field of the athlete.'))
export type AthleteUpdate = z.infer<typeof athleteUpdateSchema>

export const athleteViewSchema = athleteInputSchema.extend({
  id: z.uuid(),
  squadName: z.string(),
  archived: z.boolean(),
})
export type AthleteView = z.infer<typeof athleteViewSchema>

export const athleteListQuerySchema = z.object({
  squadId: z.uuid().optional(),
  includeArchived: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
})

/** The roster CSV columns, in file order; the squad is named, not referenced by id. */
export const rosterCsvColumns = [
  'givenName',
  'familyName',
  'birthYear',
  'squad',
  'discipline',
] as const

/** POST /athletes/import: rows keyed by the CSV header; all or nothing. */
export const rosterImportSchema = z.object({
  rows: csvRowsSchema(5000),
  dryRun: z.boolean().default(false),
})
