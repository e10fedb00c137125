import { Router, type Request } from 'express'
import { z } from 'zod'
import {
  acceptInvitationSchema,
  changePasswordSchema,
  type LocalMail,
  resetConfirmSchema,
  resetRequestSchema,
  signInSchema,
  switchClubSchema,
  tokenSchema,
} from '../../shared/schemas/auth.ts'
import { requireSignIn } from '../auth/club-access.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import { AppError, notFound } from '../http/errors.ts'
import {
  changePassword,
  checkCredentials,
  confirmPasswordReset,
  describeMe,
  membershipViews,
  requestPasswordReset,
} from '../services/accounts.ts'
import { acceptInvitation, previewInvitation } from '../services/invitations.ts'

/** The client's address as Express resolves it (through X-Forwarded-For only with TRUST_PROXY). */
export const clientOf = (req: Request) => req.ip ?? req.socket.remoteAddress ?? 'unknown'

/** /api/auth: signing in and out, the person's own account and sessions, invitations, resets. */
export function authRouter(ctx: AppContext) {
  const router = Router()

  router.post('/sign-in', async (req, res) => {
    const input = signInSchema.parse(req.body)
    const device = ctx.sessions.readDevice(req)
    const user = await ctx.limits.checkPassword(
      input.email,
      clientOf(req),
      () => checkCredentials(ctx.db, input.email, input.password),
      device,
    )
    if (!user) {
      req.log.warn({ event: 'sign-in-failed' }, 'sign-in failed')
      throw new AppError(
        401,
        'invalid_credentials',
        'That e-mail and password do not match an account.',
      )
    }
    // A new session at every sign-in: a session id planted before sign-in is worthless.
    if (req.auth) await ctx.sessions.lucia.invalidateSession(req.auth.session.id)
    const memberships = await membershipViews(ctx.db, user.id)
    const clubId = memberships.find((m) => m.accessOpen)?.clubId ?? memberships[0]?.clubId ?? null
    const session = await ctx.sessions.start(req, res, user.id, { clubId })
    ctx.sessions.setDevice(
      req,
      res,
      await ctx.limits.rememberDevice(user.email, device ?? undefined),
    )
    req.log.info({ event: 'sign-in', userId: user.id }, 'signed in')
    res.json(await describeMe(ctx, user, session.clubId))
  })

  // Where the demo's mail goes. The viewer itself answers only on this computer's loopback.
  router.get('/local-mail', (_req, res) => {
    res.json({ url: ctx.mailer.viewer?.url ?? null } satisfies LocalMail)
  })

  router.post('/sign-out', async (req, res) => {
    await ctx.sessions.end(req, res)
    res.status(204).end()
  })

  router.get('/me', requireSignIn, async (req, res) => {
    res.json(await describeMe(ctx, req.auth!.user, req.auth!.session.clubId))
  })

  router.post('/club', requireSignIn, async (req, res) => {
    const { clubId } = switchClubSchema.parse(req.body)
    const memberships = await membershipViews(ctx.db, req.auth!.user.id)
    if (!memberships.some((m) => m.clubId === clubId)) throw notFound('No such club.')
    await ctx.sessions.setClub(req.auth!.session.id, clubId)
    res.json(await describeMe(ctx, req.auth!.user, clubId))
  })

  router.get('/sessions', requireSignIn, async (req, res) => {
    res.json(await ctx.sessions.list(req.auth!.user.id, req.auth!.session.id))
  })

  router.delete('/sessions/:handle', requireSignIn, async (req, res) => {
    const handle = z
      .string()
      .regex(/^[0-9a-f]{24}$/)
      .safeParse(req.params.handle)
    if (!handle.success || !(await ctx.sessions.endByHandle(req.auth!.user.id, handle.data))) {
      throw notFound('No such session.')
    }
    res.status(204).end()
  })

  router.post('/sessions/end-others', requireSignIn, async (req, res) => {
    await ctx.sessions.endOthers(req.auth!.user.id, req.auth!.session.id)
    res.status(204).end()
  })

  router.post('/password', requireSignIn, async (req, res) => {
    const input = changePasswordSchema.parse(req.body)
    await changePassword(
      ctx,
      req.auth!.user,
      clientOf(req),
      input.currentPassword,
      input.newPassword,
    )
    await ctx.sessions.endOthers(req.auth!.user.id, req.auth!.session.id)
    res.status(204).end()
  })

  router.post('/password-reset/request', async (req, res) => {
    const { email } = resetRequestSchema.parse(req.body)
    await ctx.limits.assertResetAllowed(email, clientOf(req))
    await requestPasswordReset(ctx, email, publicOrigin(ctx.env))
    // The same answer whether or not the address has an account.
    res.status(202).json({ message: 'If that address has an account, a reset link is on its way.' })
  })

  router.post('/password-reset/confirm', async (req, res) => {
    const input = resetConfirmSchema.parse(req.body)
    await confirmPasswordReset(ctx, input.token, input.newPassword)
    ctx.sessions.clearCookie(req, res)
    res.status(204).end()
  })

  // Tokens travel in request bodies, never in URLs, so that they stay out of logs.
  router.post('/invitations/preview', async (req, res) => {
    const { token } = z.object({ token: tokenSchema }).parse(req.body)
    res.json(await previewInvitation(ctx.db, token))
  })

  router.post('/invitations/accept', async (req, res) => {
    const input = acceptInvitationSchema.parse(req.body)
    const { user, clubId } = await acceptInvitation(ctx, input, clientOf(req))
    if (req.auth) await ctx.sessions.lucia.invalidateSession(req.auth.session.id)
    await ctx.sessions.start(req, res, user.id, { clubId })
    req.log.info({ event: 'invitation-accepted', userId: user.id, clubId }, 'invitation accepted')
    res.json(await describeMe(ctx, user, clubId))
  })

  return router
}
