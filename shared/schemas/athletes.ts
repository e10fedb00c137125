import { z } from 'zod'
import { disciplines } from '../domain/club.ts'

/** The oldest birth year accepted: a wide margin for adult and masters athletes. */
export const earliestBirthYear = 1930

export const athleteInputSchema = z.object({
  givenName: z.string().trim().min(1, 'Enter the given name.').max(80),
  familyName: z.string().trim().min(1, 'Enter the family name.').max(80),
  birthYear: z
    .number({ error: 'Enter the birth year as a number, e.g. 2014.' })
    .int()
    .min(earliestBirthYear, `The birth year must be ${earliestBirthYear} or later.`)
    .refine((year) => year <= new Date().getFullYear(), 'The birth year cannot be in the future.'),
  squadId: z.uuid('Choose a squad.'),
  discipline: z.enum(disciplines),
})
export type AthleteInput = z.infer<typeof athleteInputSchema>
