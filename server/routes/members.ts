import { z } from 'zod'
import { invitationInputSchema, membershipUpdateSchema } from '../../shared/schemas/auth.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import {
  createInvitation,
  listInvitations,
  resendInvitation,
  withdrawInvitation,
} from '../services/invitations.ts'
import { endMembership, listMembers, updateMembership } from '../services/members.ts'
import type { ClubRoute } from './club-routes.ts'

const userParams = z.object({ userId: z.string().min(1).max(64) })
const invitationParams = z.object({ id: z.uuid() })

/** The director's members and invitations. */
export function memberRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/members',
      allow: ['director'],
      handler: async (req, res) => res.json(await listMembers(ctx.db, req.club.clubId)),
    },
    {
      method: 'patch',
      path: '/members/:userId',
      allow: ['director'],
      handler: async (req, res) => {
        const { userId } = userParams.parse(req.params)
        await updateMembership(ctx, req.club, userId, membershipUpdateSchema.parse(req.body))
        res.json((await listMembers(ctx.db, req.club.clubId)).find((m) => m.userId === userId))
      },
    },
    {
      method: 'delete',
      path: '/members/:userId',
      allow: ['director'],
      handler: async (req, res) => {
        const { userId } = userParams.parse(req.params)
        await endMembership(ctx, req.club, userId)
        res.status(204).end()
      },
    },
    {
      method: 'get',
      path: '/invitations',
      allow: ['director'],
      handler: async (req, res) => res.json(await listInvitations(ctx.db, req.club.clubId)),
    },
    {
      method: 'post',
      path: '/invitations',
      allow: ['director'],
      handler: async (req, res) => {
        const input = invitationInputSchema.parse(req.body)
        res.status(201).json(await createInvitation(ctx, req.club, input, publicOrigin(ctx.env)))
      },
    },
    {
      method: 'post',
      path: '/invitations/:id/resend',
      allow: ['director'],
      handler: async (req, res) => {
        const { id } = invitationParams.parse(req.params)
        await resendInvitation(ctx, req.club, id, publicOrigin(ctx.env))
        res.status(204).end()
      },
    },
    {
      method: 'delete',
      path: '/invitations/:id',
      allow: ['director'],
      handler: async (req, res) => {
        const { id } = invitationParams.parse(req.params)
        await withdrawInvitation(ctx, req.club, id)
        res.status(204).end()
      },
    },
  ]
}
