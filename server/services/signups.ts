import { randomUUID } from 'node:crypto'
import { and, eq, gt, isNull } from 'drizzle-orm'
import type {
  ClubSignupConfirm,
  ClubSignupPreview,
  ClubSignupRequest,
} from '../../shared/schemas/signup.ts'
import { hashPassword } from '../auth/password.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubSignups, memberships, users } from '../db/schema-accounts.ts'
import { AppError } from '../http/errors.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { assertExistingPassword, assertStrongPassword, findUserByEmail } from './accounts.ts'
import { createClubNamed } from './clubs.ts'

export const signupLifetimeMs = 24 * 3_600_000

/**
 * Records a club asked for and e-mails a single-use confirmation link to the address. Nothing
 * here depends on whether the address has an account, so neither the answer nor its timing
 * tells; the person learns it from the link, which only the address's owner reads.
 */
export async function requestClubSignup(ctx: AppContext, input: ClubSignupRequest, origin: string) {
  const token = newToken()
  await ctx.db.transaction(async (tx) => {
    await tx.insert(clubSignups).values({
      tokenHash: hashToken(token),
      email: input.email,
      personName: input.name,
      clubName: input.clubName,
      expiresAt: new Date(Date.now() + signupLifetimeMs),
    })
    await enqueueMail(tx, ctx.jobs, {
      to: input.email,
      subject: `Confirm ${input.clubName} on Twofold`,
      text: [
        `Hello ${input.name},`,
        '',
        `Someone (we hope you) asked to start ${input.clubName} on Twofold, with this address as its director.`,
        'Open this link within 24 hours to confirm and sign in:',
        '',
        `${origin}/confirm-club#token=${token}`,
        '',
        'The link works once. If you did not ask for it, ignore this message: no club is created.',
      ].join('\n'),
    })
  })
}

const invalidSignup = () =>
  new AppError(
    410,
    'signup_invalid',
    'This confirmation link has expired or was already used. If you confirmed it, sign in; otherwise start the club again.',
  )

async function usableSignup(db: DbOrTx, token: string) {
  const [row] = await db
    .select()
    .from(clubSignups)
    .where(
      and(
        eq(clubSignups.tokenHash, hashToken(token)),
        isNull(clubSignups.usedAt),
        gt(clubSignups.expiresAt, new Date()),
      ),
    )
  if (!row) throw invalidSignup()
  return row
}

/** What the confirmation page shows: the club, the person, and which password to ask for. */
export async function previewClubSignup(db: DbOrTx, token: string): Promise<ClubSignupPreview> {
  const signup = await usableSignup(db, token)
  return {
    clubName: signup.clubName,
    name: signup.personName,
    email: signup.email,
    existingAccount: Boolean(await findUserByEmail(db, signup.email)),
  }
}

/**
 * Confirms a sign-up: a new account with a strong password or, for an address that has one,
 * its current password (checked under the password limits). The club with the standard
 * catalogue and templates, the account and the director membership are created in the
 * transaction that spends the token, so a link makes one club at most.
 */
export async function confirmClubSignup(ctx: AppContext, input: ClubSignupConfirm, client: string) {
  const signup = await usableSignup(ctx.db, input.token)
  const existing = await findUserByEmail(ctx.db, signup.email)
  let passwordHash: string | undefined
  if (existing) {
    await assertExistingPassword(ctx, existing, client, input.password)
  } else {
    await assertStrongPassword(input.password, 'password', [
      signup.email,
      signup.personName,
      signup.clubName,
    ])
    passwordHash = await hashPassword(input.password)
  }
  return ctx.db.transaction(async (tx) => {
    const spent = await tx
      .update(clubSignups)
      .set({ usedAt: new Date() })
      .where(
        and(
          eq(clubSignups.tokenHash, signup.tokenHash),
          isNull(clubSignups.usedAt),
          gt(clubSignups.expiresAt, new Date()),
        ),
      )
      .returning()
    if (spent.length === 0) throw invalidSignup()
    const user = existing ?? (await newAccount(tx, signup.email, signup.personName, passwordHash!))
    const club = await createClubNamed(tx, signup.clubName)
    await tx.insert(memberships).values({ clubId: club.id, userId: user.id, role: 'director' })
    return { user, club }
  })
}

async function newAccount(tx: DbOrTx, email: string, name: string, passwordHash: string) {
  const [user] = await tx
    .insert(users)
    .values({ id: randomUUID(), email, name, passwordHash })
    .onConflictDoNothing()
    .returning()
  // An account made for this address since the page was opened (an invitation accepted
  // meanwhile): its owner confirms with that password instead.
  if (!user) {
    throw new AppError(
      409,
      'account_exists',
      'This address has an account now: open the link again and confirm with its password.',
    )
  }
  return user
}
