import { and, eq, isNull, sql } from 'drizzle-orm'
import Papa from 'papaparse'
import { csvRowsSchema } from '../../shared/schemas/csv.ts'
import { clubSetupRowSchema, type ClubSetupRow } from '../../shared/schemas/signup.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import type { Db, DbOrTx } from '../db/client.ts'
import { clubs, invitationTokens, invitations, memberships } from '../db/schema-accounts.ts'
import type { JobQueue } from '../jobs/queue.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { createClubNamed } from './clubs.ts'
import { invitationLifetimeMs } from './members.ts'

/** What setting up clubs needs: the database, the job queue for mail and where links point. */
export interface ClubSetupDeps {
  db: Db
  jobs: Pick<JobQueue, 'send'>
  /** `publicOrigin(env)`: never a request's headers. */
  origin: string
}

export type ClubSetupOutcome =
  | {
      row: number
      club: string
      status: 'created' | 'invited-again'
      slug: string
      /** Where the invitation goes, as the outbox has it. */
      directorEmail: string
    }
  | { row: number; club: string; status: 'failed'; reason: string }

export const clubSetupColumns = ['club', 'directorEmail', 'directorName'] as const

/** More than a federation sets up at once; a bigger file is split. */
const maxRows = 2000

/** Each problem as "field: message", on one line. */
export const describeIssues = (issues: { path: PropertyKey[]; message: string }[]) =>
  issues
    .map(
      (issue) =>
        `${issue.path.map(String).join('.') || 'row'}: ${issue.message.replace(/\.$/, '')}`,
    )
    .join('; ')

/** Thrown for a file that cannot be read as a list of clubs at all (no row is tried). */
export class ClubFileError extends Error {}

class RowFailure extends Error {}

async function sendDirectorInvitation(
  tx: DbOrTx,
  deps: ClubSetupDeps,
  row: ClubSetupRow,
  clubName: string,
  token: string,
) {
  await enqueueMail(tx, deps.jobs as JobQueue, {
    to: row.directorEmail,
    subject: `${clubName} is ready for you on Twofold`,
    text: [
      `Hello ${row.directorName},`,
      '',
      `${clubName} is set up on Twofold with you as its director. Its standard catalogue of elements and progression templates are ready.`,
      '',
      'Open this link within 7 days to accept and sign in:',
      '',
      `${deps.origin}/accept-invitation#token=${token}`,
      '',
      'The link works once. If you did not expect this message, ignore it.',
    ].join('\n'),
  })
}

/** A director invitation to `clubId`, replacing any open one, so only the newest link works. */
async function inviteDirector(tx: DbOrTx, clubId: string, email: string) {
  const token = newToken()
  const expiresAt = new Date(Date.now() + invitationLifetimeMs)
  // Nobody has joined the club: every earlier link of it stops working.
  await tx.delete(invitationTokens).where(eq(invitationTokens.clubId, clubId))
  await tx
    .update(invitations)
    .set({ withdrawnAt: new Date() })
    .where(
      and(
        eq(invitations.clubId, clubId),
        isNull(invitations.acceptedAt),
        isNull(invitations.withdrawnAt),
      ),
    )
  const [invitation] = await tx
    .insert(invitations)
    .values({
      clubId,
      email,
      role: 'director',
      expiresAt,
      invitedBy: null,
    })
    .returning({ id: invitations.id })
  await tx.insert(invitationTokens).values({
    tokenHash: hashToken(token),
    clubId,
    invitationId: invitation!.id,
    expiresAt,
  })
  return token
}

/**
 * Sets up one club in its own transaction: the club with the standard catalogue and templates,
 * and a director invitation e-mailed to `directorEmail`. A club of the same name that nobody has
 * joined yet (its director never accepted) gets a new invitation instead of a second club; one
 * with members is refused, so running the same list twice creates nothing twice. The mail is
 * queued in the same transaction: the club is kept with its invitation on its way, or neither.
 */
export async function setUpClub(
  deps: ClubSetupDeps,
  input: unknown,
  rowNumber = 1,
): Promise<ClubSetupOutcome> {
  const parsed = clubSetupRowSchema.safeParse(input)
  if (!parsed.success) {
    const club = (input as { club?: unknown } | null)?.club
    return {
      row: rowNumber,
      club: typeof club === 'string' ? club.trim() : '',
      status: 'failed',
      reason: describeIssues(parsed.error.issues),
    }
  }
  const row = parsed.data
  try {
    return await deps.db.transaction(async (tx) => {
      const [same] = await tx
        .select({ id: clubs.id, name: clubs.name, slug: clubs.slug })
        .from(clubs)
        .where(eq(sql`lower(${clubs.name})`, row.club.toLowerCase()))
        .limit(1)
      if (same) {
        const [member] = await tx
          .select({ userId: memberships.userId })
          .from(memberships)
          .where(eq(memberships.clubId, same.id))
          .limit(1)
        if (member) {
          throw new RowFailure(
            `a club named "${same.name}" already exists (${same.slug}) and has members`,
          )
        }
      }
      const club = same ?? (await createClubNamed(tx, row.club))
      const token = await inviteDirector(tx, club.id, row.directorEmail)
      await sendDirectorInvitation(tx, deps, row, club.name, token)
      return {
        row: rowNumber,
        club: club.name,
        status: same ? 'invited-again' : 'created',
        slug: club.slug,
        directorEmail: row.directorEmail,
      } as const
    })
  } catch (err) {
    const reason = err instanceof RowFailure ? err.message : `nothing kept: ${rootCause(err)}`
    return { row: rowNumber, club: row.club, status: 'failed', reason }
  }
}

/** The innermost error's first line: the database's or the mail server's own words. */
function rootCause(err: unknown): string {
  let e = err
  while (e instanceof Error && e.cause instanceof Error) e = e.cause
  return e instanceof Error ? (e.message.split('\n')[0] ?? e.name) : String(e)
}

/** Sets up each club in turn, each in its own transaction; one failing stops no other. */
export async function setUpClubs(deps: ClubSetupDeps, rows: unknown[]) {
  const outcomes: ClubSetupOutcome[] = []
  for (const [i, row] of rows.entries()) outcomes.push(await setUpClub(deps, row, i + 1))
  return outcomes
}

/**
 * The rows of a CSV file of clubs (columns club, directorEmail, directorName), numbered from 1
 * below the header. A row with a cell that is not one line of plain text carries the reason, and
 * fails alone. Throws `ClubFileError` for a file missing a column, empty, or too long.
 */
export function readClubsCsv(text: string) {
  const parsed = Papa.parse<Record<string, unknown>>(text.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (header) => header.trim(),
  })
  const missing = clubSetupColumns.filter((c) => !parsed.meta.fields?.includes(c))
  if (missing.length > 0) {
    throw new ClubFileError(
      `The file needs the columns ${clubSetupColumns.join(', ')} in its first line; missing: ${missing.join(', ')}.`,
    )
  }
  if (parsed.data.length === 0) throw new ClubFileError('The file has no rows below its header.')
  if (parsed.data.length > maxRows) {
    throw new ClubFileError(`At most ${maxRows} clubs at once: split the file.`)
  }
  const problems = new Map<number, string[]>()
  const note = (row: number, message: string) =>
    problems.set(row, [...(problems.get(row) ?? []), message])
  for (const error of parsed.errors) if (error.row !== undefined) note(error.row + 1, error.message)
  const cells = csvRowsSchema(maxRows).safeParse(parsed.data)
  for (const issue of cells.error?.issues ?? []) {
    const [row, column] = issue.path
    if (typeof row === 'number') note(row, `${String(column)}: ${issue.message}`)
  }
  return parsed.data.map((cellsOfRow, i) => ({
    row: i + 1,
    cells: cellsOfRow,
    problem: problems.get(i + 1)?.join('; ') ?? null,
  }))
}

/** Sets up every club of a CSV file; rows the file itself spoils fail with their reason. */
export async function setUpClubsFromCsv(deps: ClubSetupDeps, text: string) {
  const outcomes: ClubSetupOutcome[] = []
  for (const { row, cells, problem } of readClubsCsv(text)) {
    outcomes.push(
      problem
        ? { row, club: String(cells.club ?? '').trim(), status: 'failed', reason: problem }
        : await setUpClub(deps, cells, row),
    )
  }
  return outcomes
}
