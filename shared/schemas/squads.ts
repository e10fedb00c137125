import { z } from 'zod'
import { disciplines, squadLevels } from '../domain/club.ts'
import { text } from './text.ts'

export const squadInputSchema = z.object({
  name: text().min(1, 'Give the squad a name.').max(80),
  level: z.enum(squadLevels),
  discipline: z.enum(disciplines),
})
export type SquadInput = z.infer<typeof squadInputSchema>

export const squadSchema = squadInputSchema.extend({
  id: z.uuid(),
  clubId: z.uuid(),
})
export type Squad = z.infer<typeof squadSchema>

export const squadViewSchema = squadSchema.extend({
  coachIds: z.array(z.string()),
  athleteCount: z.number().int().min(0),
})
export type SquadView = z.infer<typeof squadViewSchema>

/** PUT /squads/:squadId/coaches: the whole list of coaches assigned to the squad. */
export const squadCoachesSchema = z.object({
  userIds: z.array(z.string().min(1)).max(50),
})
