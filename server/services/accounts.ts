import { and, eq, gt, isNull, ne, sql } from 'drizzle-orm'
import type { Me, MembershipView } from '../../shared/schemas/auth.ts'
import { todayIso } from '../../shared/domain/access.ts'
import { hashPassword, verifyPassword } from '../auth/password.ts'
import { passwordProblem } from '../auth/password-policy.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs, memberships, passwordResets, users } from '../db/schema-accounts.ts'
import { AppError } from '../http/errors.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { clinicianVisitDays } from './visit-access.ts'

export const resetLifetimeMs = 2 * 3_600_000

// Verifying against a fixed hash when the account does not exist keeps the answer time the
// same, so that timing does not tell which e-mail addresses have accounts.
let dummyHash: Promise<string> | undefined
const dummy = () => (dummyHash ??= hashPassword('not-a-real-password-for-timing'))

export async function findUserByEmail(db: DbOrTx, email: string) {
  const [user] = await db
    .select()
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.trim().toLowerCase()))
  return user
}

/** The person's account when the password matches, else null. */
export async function checkCredentials(db: DbOrTx, email: string, password: string) {
  const user = await findUserByEmail(db, email)
  if (!user?.passwordHash) {
    await verifyPassword(await dummy(), password)
    return null
  }
  return (await verifyPassword(user.passwordHash, password)) ? user : null
}

/**
 * Checks the password of a person's existing account, given where a new account would be made
 * (accepting an invitation, confirming a club), under the same limits as signing in.
 */
export async function assertExistingPassword(
  ctx: Pick<AppContext, 'limits'>,
  user: { email: string; passwordHash: string | null },
  client: string,
  password: string,
) {
  const matches = await ctx.limits.checkPassword(user.email, client, async () =>
    Boolean(user.passwordHash && (await verifyPassword(user.passwordHash, password))),
  )
  if (!matches) {
    throw new AppError(
      400,
      'wrong_password',
      'That is not the password of your existing account.',
      [{ path: 'password', message: 'Enter the password of your existing Twofold account.' }],
    )
  }
}

/** Refuses a weak password with the estimator's advice, on the given field. */
export async function assertStrongPassword(password: string, field: string, personal: string[]) {
  const problem = await passwordProblem(password, personal)
  if (problem)
    throw new AppError(400, 'weak_password', problem, [{ path: field, message: problem }])
}

export async function membershipViews(db: DbOrTx, userId: string): Promise<MembershipView[]> {
  const rows = await db
    .select({
      clubId: memberships.clubId,
      clubName: clubs.name,
      role: memberships.role,
      accessStartsOn: memberships.accessStartsOn,
      accessEndsOn: memberships.accessEndsOn,
    })
    .from(memberships)
    .innerJoin(clubs, eq(clubs.id, memberships.clubId))
    .where(eq(memberships.userId, userId))
    .orderBy(clubs.name)
  const today = todayIso()
  // A clinician's dates are those of their visit open today, else of the next one to come.
  return Promise.all(
    rows.map(async (r) => {
      if (r.role !== 'clinician') return { ...r, accessOpen: true }
      const days = await clinicianVisitDays(db, r.clubId, userId, today)
      return {
        ...r,
        accessStartsOn: days.next?.firstDay ?? null,
        accessEndsOn: days.next?.lastDay ?? null,
        accessOpen: days.open,
      }
    }),
  )
}

export async function describeMe(
  ctx: AppContext,
  user: { id: string; email: string; name: string },
  activeClubId: string | null,
): Promise<Me> {
  const list = await membershipViews(ctx.db, user.id)
  const active =
    list.find((m) => m.clubId === activeClubId) ?? list.find((m) => m.accessOpen) ?? list[0]
  return {
    user: { id: user.id, email: user.email, name: user.name },
    memberships: list,
    activeClubId: active?.clubId ?? null,
  }
}

/** Changes the person's password; the current one is checked through the password limits. */
export async function changePassword(
  ctx: AppContext,
  person: { id: string; email: string },
  client: string,
  current: string,
  next: string,
) {
  const userId = person.id
  const [user] = await ctx.db.select().from(users).where(eq(users.id, userId))
  const matches = await ctx.limits.checkPassword(person.email, client, async () =>
    Boolean(user?.passwordHash && (await verifyPassword(user.passwordHash, current))),
  )
  if (!user || !matches) {
    throw new AppError(400, 'wrong_password', 'The current password is not right.', [
      { path: 'currentPassword', message: 'The current password is not right.' },
    ])
  }
  await assertStrongPassword(next, 'newPassword', [user.email, user.name])
  await ctx.db
    .update(users)
    .set({ passwordHash: await hashPassword(next) })
    .where(eq(users.id, userId))
}

/** Sends a single-use reset link when the address has an account; silent otherwise. */
export async function requestPasswordReset(ctx: AppContext, email: string, origin: string) {
  const user = await findUserByEmail(ctx.db, email)
  if (!user) return
  const token = newToken()
  // A new link ends every earlier one: only the newest mail can reset the password.
  // The link and its mail commit together.
  await ctx.db.transaction(async (tx) => {
    // Two requests at once take turns on the person's row: one link survives, not two.
    await tx.select({ id: users.id }).from(users).where(eq(users.id, user.id)).for('update')
    await tx.delete(passwordResets).where(eq(passwordResets.userId, user.id))
    await tx.insert(passwordResets).values({
      tokenHash: hashToken(token),
      userId: user.id,
      expiresAt: new Date(Date.now() + resetLifetimeMs),
    })
    await enqueueMail(tx, ctx.jobs, {
      to: user.email,
      subject: 'Reset your Twofold password',
      text: [
        `Hello ${user.name},`,
        '',
        'Someone (we hope you) asked to reset the password of your Twofold account.',
        'Open this link within 2 hours to choose a new password:',
        '',
        `${origin}/reset-password#token=${token}`,
        '',
        'The link works once. If you did not ask for it, ignore this message: your password stays as it is.',
      ].join('\n'),
    })
  })
}

/** Sets a new password from a reset link; the link is spent and every session of the person ends. */
export async function confirmPasswordReset(ctx: AppContext, token: string, newPassword: string) {
  const now = new Date()
  const [reset] = await ctx.db
    .select()
    .from(passwordResets)
    .where(
      and(
        eq(passwordResets.tokenHash, hashToken(token)),
        isNull(passwordResets.usedAt),
        gt(passwordResets.expiresAt, now),
      ),
    )
  if (!reset) {
    throw new AppError(
      400,
      'invalid_token',
      'This reset link has expired or was already used. Ask for a new one.',
      [{ path: 'token', message: 'This reset link has expired or was already used.' }],
    )
  }
  const [user] = await ctx.db.select().from(users).where(eq(users.id, reset.userId))
  await assertStrongPassword(newPassword, 'newPassword', [user!.email, user!.name])
  const passwordHash = await hashPassword(newPassword)
  await ctx.db.transaction(async (tx) => {
    const spent = await tx
      .update(passwordResets)
      .set({ usedAt: now })
      .where(and(eq(passwordResets.tokenHash, reset.tokenHash), isNull(passwordResets.usedAt)))
      .returning()
    if (spent.length === 0)
      throw new AppError(400, 'invalid_token', 'This reset link was already used.')
    await tx.update(users).set({ passwordHash }).where(eq(users.id, reset.userId))
    // Using a link ends any other link of the person's.
    await tx
      .delete(passwordResets)
      .where(
        and(eq(passwordResets.userId, reset.userId), ne(passwordResets.tokenHash, reset.tokenHash)),
      )
  })
  await ctx.sessions.endAll(reset.userId)
}
