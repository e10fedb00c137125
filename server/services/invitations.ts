// Invitations: asking someone to join a club, by e-mail link, and accepting.

import { randomUUID } from 'node:crypto'
import { and, eq, gt, isNull, sql } from 'drizzle-orm'
import { roleLabels, type Role } from '../../shared/domain/club.ts'
import type {
  AcceptInvitationInput,
  InvitationInput,
  InvitationPreview,
  InvitationView,
} from '../../shared/schemas/auth.ts'
import { hashPassword } from '../auth/password.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs, invitations, invitationTokens, memberships, users } from '../db/schema-accounts.ts'
import { AppError, notFound } from '../http/errors.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { visits } from '../db/schema-visits.ts'
import { addVisitCoveringEverySquad } from './visit-access.ts'
import { assertExistingPassword, assertStrongPassword, findUserByEmail } from './accounts.ts'
import { invitationLifetimeMs, windowFor } from './members.ts'

const invitationStatus = (expiresAt: Date) =>
  expiresAt.getTime() > Date.now() ? 'pending' : 'expired'

export async function listInvitations(db: DbOrTx, clubId: string): Promise<InvitationView[]> {
  const rows = await db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.clubId, clubId),
        isNull(invitations.acceptedAt),
        isNull(invitations.withdrawnAt),
      ),
    )
    .orderBy(invitations.createdAt)
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    accessStartsOn: r.accessStartsOn,
    accessEndsOn: r.accessEndsOn,
    createdAt: r.createdAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    status: invitationStatus(r.expiresAt),
  }))
}

/** Puts the invitation's mail on its way in `tx`'s transaction. */
async function sendInvitation(
  ctx: AppContext,
  tx: DbOrTx,
  invitation: {
    clubId: string
    email: string
    role: Role
    accessStartsOn: string | null
    accessEndsOn: string | null
  },
  token: string,
  origin: string,
  extraLines: string[] = [],
) {
  const [club] = await tx.select().from(clubs).where(eq(clubs.id, invitation.clubId))
  const window =
    invitation.role === 'clinician'
      ? [
          '',
          `Your access to the club's squads is open from ${invitation.accessStartsOn} to ${invitation.accessEndsOn}.`,
        ]
      : []
  await enqueueMail(tx, ctx.jobs, {
    to: invitation.email,
    subject: `You are invited to ${club!.name} on Twofold`,
    text: [
      'Hello,',
      '',
      `${club!.name} invites you to join its Twofold space as ${roleLabels[invitation.role]}.`,
      ...window,
      ...extraLines,
      '',
      'Open this link within 7 days to accept:',
      '',
      `${origin}/accept-invitation#token=${token}`,
      '',
      'The link works once. If you did not expect this invitation, ignore this message.',
    ].join('\n'),
  })
}

/** Refuses an address that is already a member of the club or has a pending invitation. */
export async function assertInvitable(db: DbOrTx, clubId: string, email: string) {
  const existing = await findUserByEmail(db, email)
  if (existing) {
    const [member] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.clubId, clubId), eq(memberships.userId, existing.id)))
    if (member) {
      throw new AppError(409, 'already_member', `${email} is already a member of this club.`, [
        { path: 'email', message: 'Already a member of this club.' },
      ])
    }
  }
  const pending = await db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.clubId, clubId),
        eq(sql`lower(${invitations.email})`, email),
        isNull(invitations.acceptedAt),
        isNull(invitations.withdrawnAt),
        gt(invitations.expiresAt, new Date()),
      ),
    )
  if (pending.length > 0) {
    throw new AppError(
      409,
      'already_invited',
      `${email} has a pending invitation: resend or withdraw it.`,
      [{ path: 'email', message: 'Already invited: resend or withdraw that invitation.' }],
    )
  }
}

/**
 * Writes an invitation and its link and puts the mail on its way, all in `tx`; `extraLines`
 * add to the mail (a visit's squads).
 */
export async function insertInvitation(
  ctx: AppContext,
  tx: DbOrTx,
  access: ClubAccess,
  input: InvitationInput,
  origin: string,
  extraLines: string[] = [],
) {
  const token = newToken()
  const expiresAt = new Date(Date.now() + invitationLifetimeMs)
  const [created] = await tx
    .insert(invitations)
    .values({
      clubId: access.clubId,
      email: input.email,
      role: input.role,
      ...windowFor(input.role, input.accessStartsOn, input.accessEndsOn),
      expiresAt,
      invitedBy: access.userId,
    })
    .returning()
  await tx.insert(invitationTokens).values({
    tokenHash: hashToken(token),
    clubId: access.clubId,
    invitationId: created!.id,
    expiresAt,
  })
  await sendInvitation(ctx, tx, created!, token, origin, extraLines)
  return created!
}

export async function createInvitation(
  ctx: AppContext,
  access: ClubAccess,
  input: InvitationInput,
  origin: string,
) {
  await assertInvitable(ctx.db, access.clubId, input.email)
  const row = await ctx.db.transaction((tx) => insertInvitation(ctx, tx, access, input, origin))
  return (await listInvitations(ctx.db, access.clubId)).find((i) => i.id === row.id)!
}

/**
 * A clinician accepting: the visits that named the invitation are theirs; without one, the
 * invitation's dates become a visit covering every squad (an invitation from the Members screen).
 */
async function linkInvitedVisits(
  tx: DbOrTx,
  invitation: {
    clubId: string
    id: string
    accessStartsOn: string | null
    accessEndsOn: string | null
  },
  userId: string,
) {
  const linked = await tx
    .update(visits)
    .set({ clinicianId: userId })
    .where(and(eq(visits.clubId, invitation.clubId), eq(visits.invitationId, invitation.id)))
    .returning({ id: visits.id })
  if (linked.length === 0 && invitation.accessStartsOn && invitation.accessEndsOn)
    await addVisitCoveringEverySquad(tx, {
      clubId: invitation.clubId,
      userId,
      firstDay: invitation.accessStartsOn,
      lastDay: invitation.accessEndsOn,
    })
}

async function openInvitation(db: DbOrTx, clubId: string, id: string) {
  const [row] = await db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.clubId, clubId),
        eq(invitations.id, id),
        isNull(invitations.acceptedAt),
        isNull(invitations.withdrawnAt),
      ),
    )
  if (!row) throw notFound('No such open invitation.')
  return row
}

/** A new link and a new 7-day expiry; the old link stops working. */
export async function resendInvitation(
  ctx: AppContext,
  access: ClubAccess,
  id: string,
  origin: string,
) {
  const token = newToken()
  const expiresAt = new Date(Date.now() + invitationLifetimeMs)
  await ctx.db.transaction(async (tx) => {
    const row = await openInvitation(tx, access.clubId, id)
    await tx
      .update(invitations)
      .set({ expiresAt })
      .where(and(eq(invitations.clubId, access.clubId), eq(invitations.id, id)))
    await deleteLink(tx, access.clubId, id)
    await tx
      .insert(invitationTokens)
      .values({ tokenHash: hashToken(token), clubId: access.clubId, invitationId: id, expiresAt })
    await sendInvitation(ctx, tx, row, token, origin)
  })
}

/** Deletes the link of an invitation: it never works again. */
function deleteLink(db: DbOrTx, clubId: string, invitationId: string) {
  return db
    .delete(invitationTokens)
    .where(
      and(eq(invitationTokens.clubId, clubId), eq(invitationTokens.invitationId, invitationId)),
    )
}

export async function withdrawInvitation(ctx: AppContext, access: ClubAccess, id: string) {
  await openInvitation(ctx.db, access.clubId, id)
  await ctx.db.transaction(async (tx) => {
    await tx
      .update(invitations)
      .set({ withdrawnAt: new Date() })
      .where(and(eq(invitations.clubId, access.clubId), eq(invitations.id, id)))
    await deleteLink(tx, access.clubId, id)
  })
}

const invalidInvitation = () =>
  new AppError(
    410,
    'invitation_invalid',
    'This invitation has expired, was withdrawn or was already used. Ask the club for a new one.',
  )

/**
 * The open invitation a link belongs to. The link is found by its hash alone, which gives the
 * club; the invitation is then read within that club.
 */
async function usableInvitation(db: DbOrTx, token: string) {
  const now = new Date()
  const [link] = await db
    .select({ clubId: invitationTokens.clubId, invitationId: invitationTokens.invitationId })
    .from(invitationTokens)
    .where(
      and(eq(invitationTokens.tokenHash, hashToken(token)), gt(invitationTokens.expiresAt, now)),
    )
  if (!link) throw invalidInvitation()
  const [row] = await db
    .select({ invitation: invitations, clubName: clubs.name })
    .from(invitations)
    .innerJoin(clubs, eq(clubs.id, invitations.clubId))
    .where(
      and(
        eq(invitations.clubId, link.clubId),
        eq(invitations.id, link.invitationId),
        isNull(invitations.acceptedAt),
        isNull(invitations.withdrawnAt),
        gt(invitations.expiresAt, now),
      ),
    )
  if (!row) throw invalidInvitation()
  return row
}

export async function previewInvitation(db: DbOrTx, token: string): Promise<InvitationPreview> {
  const { invitation, clubName } = await usableInvitation(db, token)
  return {
    clubName,
    email: invitation.email,
    role: invitation.role,
    accessStartsOn: invitation.accessStartsOn,
    accessEndsOn: invitation.accessEndsOn,
    existingAccount: Boolean(await findUserByEmail(db, invitation.email)),
  }
}

/**
 * Accepts an invitation: a new account (name and a strong password) or, for a person who has
 * one, their current password. The token is spent in the same transaction as the membership.
 */
export async function acceptInvitation(
  ctx: AppContext,
  input: AcceptInvitationInput,
  client: string,
) {
  const { invitation } = await usableInvitation(ctx.db, input.token)
  const existing = await findUserByEmail(ctx.db, invitation.email)
  let passwordHash: string | undefined
  if (existing) {
    await assertExistingPassword(ctx, existing, client, input.password)
  } else {
    if (!input.name)
      throw new AppError(400, 'invalid_input', 'Enter your name.', [
        { path: 'name', message: 'Enter your name.' },
      ])
    await assertStrongPassword(input.password, 'password', [invitation.email, input.name])
    passwordHash = await hashPassword(input.password)
  }
  return ctx.db.transaction(async (tx) => {
    const spent = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(
        and(
          eq(invitations.clubId, invitation.clubId),
          eq(invitations.id, invitation.id),
          isNull(invitations.acceptedAt),
        ),
      )
      .returning()
    if (spent.length === 0) throw invalidInvitation()
    await deleteLink(tx, invitation.clubId, invitation.id)
    const user =
      existing ??
      (
        await tx
          .insert(users)
          .values({
            id: randomUUID(),
            email: invitation.email,
            name: input.name!,
            passwordHash: passwordHash!,
          })
          .returning()
      )[0]!
    await tx
      .insert(memberships)
      .values({
        clubId: invitation.clubId,
        userId: user.id,
        role: invitation.role,
        accessStartsOn: invitation.accessStartsOn,
        accessEndsOn: invitation.accessEndsOn,
      })
      .onConflictDoUpdate({
        target: [memberships.clubId, memberships.userId],
        set: {
          role: invitation.role,
          accessStartsOn: invitation.accessStartsOn,
          accessEndsOn: invitation.accessEndsOn,
        },
      })
    if (invitation.role === 'clinician') await linkInvitedVisits(tx, invitation, user.id)
    return { user, clubId: invitation.clubId }
  })
}
