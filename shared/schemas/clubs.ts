import { z } from 'zod'
import { roles } from '../domain/club.ts'
import { text } from './text.ts'

export const clubInputSchema = z.object({
  name: text().min(2, 'Enter the club name.').max(120),
  slug: z
    .string()
    .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Use lower-case letters, digits and dashes.')
    .max(60),
})
export type ClubInput = z.infer<typeof clubInputSchema>

/** PATCH /settings (directors). */
export const clubSettingsSchema = z.object({
  lostSkillStepDown: z
    .number()
    .int('Enter a whole number of steps.')
    .min(0, 'Use 0 or more steps.')
    .max(10, 'Use at most 10 steps.'),
})
export type ClubSettings = z.infer<typeof clubSettingsSchema>

/** GET /api/clubs/:clubId: the club and the person's role in it. */
export const clubViewSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  lostSkillStepDown: z.number().int(),
  role: z.enum(roles),
})
export type ClubView = z.infer<typeof clubViewSchema>
