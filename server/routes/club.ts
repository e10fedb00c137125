import { eq } from 'drizzle-orm'
import { clubSettingsSchema } from '../../shared/schemas/clubs.ts'
import type { AppContext } from '../context.ts'
import { clubs, invitations, memberships, users } from '../db/schema.ts'
import { everyRole, type ClubRoute } from './club-routes.ts'

const clubView = { id: clubs.id, name: clubs.name, lostSkillStepDown: clubs.lostSkillStepDown }

/** The club itself, its settings, and the Outbox of the local fake mail server. */
export function clubRoutes(ctx: AppContext): ClubRoute[] {
  const routes: ClubRoute[] = [
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
  ]
  const fake = ctx.mailer.fake
  if (fake) {
    // The Outbox exists only while the fake stands in for a provider. It shows the messages
    // addressed to this club's members and invitees.
    routes.push({
      method: 'get',
      path: '/outbox',
      allow: ['director'],
      handler: async (req, res) => {
        const addresses = await clubAddresses(ctx, req.club.clubId)
        res.json(fake.messages().filter((m) => m.to.some((to) => addresses.has(to))))
      },
    })
  }
  return routes
}

async function clubAddresses(ctx: AppContext, clubId: string) {
  const members = await ctx.db
    .select({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.clubId, clubId))
  const invited = await ctx.db
    .select({ email: invitations.email })
    .from(invitations)
    .where(eq(invitations.clubId, clubId))
  return new Set([...members, ...invited].map((r) => r.email.toLowerCase()))
}
