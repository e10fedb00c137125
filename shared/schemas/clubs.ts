import { z } from 'zod'

export const clubInputSchema = z.object({
  name: z.string().trim().min(2, 'Enter the club name.').max(120),
  slug: z
    .string()
    .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Use lower-case letters, digits and dashes.')
    .max(60),
})
export type ClubInput = z.infer<typeof clubInputSchema>
