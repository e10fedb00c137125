import { eq } from 'drizzle-orm'
import { clubSettingsSchema } from '../../shared/schemas/clubs.ts'
import type { AppContext } from '../context.ts'
import { clubs } from '../db/schema-accounts.ts'
import { removeClipObjects } from '../services/clips.ts'
import { deleteClub } from '../services/erasure.ts'
import { everyRole, type ClubRoute } from './club-routes.ts'

const clubView = { id: clubs.id, name: clubs.name, lostSkillStepDown: clubs.lostSkillStepDown }

/** The club itself, its settings, and deleting it for good. */
export function clubRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/',
      allow: everyRole,
      handler: async (req, res) => {
        const [club] = await ctx.db
          .select(clubView)
          .from(clubs)
          .where(eq(clubs.id, req.club.clubId))
        res.json({ ...club, role: req.club.role })
      },
    },
    {
      method: 'patch',
      path: '/settings',
      allow: ['director'],
      handler: async (req, res) => {
        const settings = clubSettingsSchema.parse(req.body)
        const [club] = await ctx.db
          .update(clubs)
          .set(settings)
          .where(eq(clubs.id, req.club.clubId))
          .returning(clubView)
        res.json({ ...club, role: req.club.role })
      },
    },
    {
      method: 'delete',
      path: '/',
      allow: ['director'],
      handler: async (req, res) => {
        await removeClipObjects(ctx, await deleteClub(ctx.db, ctx.jobs, req.club, req.body))
        res.status(204).end()
      },
    },
  ]
}
