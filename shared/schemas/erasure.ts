import { z } from 'zod'
import { text } from './text.ts'

const confirmation = (message: string) =>
  z.object({ confirmName: text({ error: message }).min(1, message).max(300) })

/** POST /athletes/:athleteId/erase (directors): the athlete's full name, typed. */
export const athleteErasureSchema = confirmation("Type the athlete's full name to confirm.")
export type AthleteErasure = z.infer<typeof athleteErasureSchema>

/** DELETE /api/clubs/:clubId (directors): the club's name, typed. */
export const clubDeletionSchema = confirmation("Type the club's name to confirm.")
export type ClubDeletion = z.infer<typeof clubDeletionSchema>
