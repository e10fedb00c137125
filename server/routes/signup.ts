import { Router } from 'express'
import {
  clubSignupConfirmSchema,
  clubSignupPreviewInputSchema,
  clubSignupRequestSchema,
} from '../../shared/schemas/signup.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import { describeMe } from '../services/accounts.ts'
import { confirmClubSignup, previewClubSignup, requestClubSignup } from '../services/signups.ts'
import { clientOf } from './auth.ts'

/** /api/signup: a person starts a club, confirmed by a link e-mailed to them. Public. */
export function signupRouter(ctx: AppContext) {
  const router = Router()

  router.post('/request', async (req, res) => {
    const input = clubSignupRequestSchema.parse(req.body)
    await ctx.limits.assertSignupAllowed(input.email, clientOf(req))
    await requestClubSignup(ctx, input, publicOrigin(ctx.env))
    // The same answer whether or not the address has an account.
    res.status(202).json({
      message: `A confirmation link is on its way to ${input.email}. It works once, for 24 hours.`,
    })
  })

  // Tokens travel in request bodies, never in URLs, so that they stay out of logs.
  router.post('/preview', async (req, res) => {
    const { token } = clubSignupPreviewInputSchema.parse(req.body)
    res.json(await previewClubSignup(ctx.db, token))
  })

  router.post('/confirm', async (req, res) => {
    const input = clubSignupConfirmSchema.parse(req.body)
    const { user, club } = await confirmClubSignup(ctx, input, clientOf(req))
    // A new session for the new director: one planted before is worthless.
    if (req.auth) await ctx.sessions.lucia.invalidateSession(req.auth.session.id)
    await ctx.sessions.start(req, res, user.id, { clubId: club.id })
    req.log.info({ event: 'club-started', userId: user.id, clubId: club.id }, 'club started')
    res.status(201).json(await describeMe(ctx, user, club.id))
  })

  return router
}
