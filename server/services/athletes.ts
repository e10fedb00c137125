import { and, asc, eq, inArray, isNull } from 'drizzle-orm'
import {
  athleteInputSchema,
  athleteUpdateSchema,
  rosterCsvColumns,
  type AthleteInput,
  type AthleteView,
} from '../../shared/schemas/athletes.ts'
import type { ImportIssue, ImportResult } from '../../shared/schemas/catalogue.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, squads } from '../db/schema-athletes.ts'
import { toCsv } from '../http/csv.ts'
import {
  assertCanReadSquad,
  assertCanWriteSquad,
  athleteInScope,
  readableSquadIds,
} from './scope.ts'

export async function createAthlete(db: DbOrTx, clubId: string, input: AthleteInput) {
  const values = athleteInputSchema.parse(input)
  const [athlete] = await db
    .insert(athletes)
    .values({ ...values, clubId })
    .returning()
  return athlete!
}

export async function listAthletes(
  db: DbOrTx,
  access: ClubAccess,
  query: { squadId?: string; includeArchived?: boolean } = {},
): Promise<AthleteView[]> {
  if (query.squadId) await assertCanReadSquad(db, access, query.squadId)
  const readable = await readableSquadIds(db, access)
  if (readable !== 'all' && readable.length === 0) return []
  const rows = await db
    .select({ athlete: athletes, squadName: squads.name })
    .from(athletes)
    .innerJoin(squads, and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)))
    .where(
      and(
        eq(athletes.clubId, access.clubId),
        query.squadId ? eq(athletes.squadId, query.squadId) : undefined,
        readable === 'all' ? undefined : inArray(athletes.squadId, readable),
        query.includeArchived ? undefined : isNull(athletes.archivedAt),
      ),
    )
    .orderBy(asc(athletes.familyName), asc(athletes.givenName))
  return rows.map(({ athlete, squadName }) => ({
    id: athlete.id,
    givenName: athlete.givenName,
    familyName: athlete.familyName,
    birthYear: athlete.birthYear,
    squadId: athlete.squadId,
    discipline: athlete.discipline,
    squadName,
    archived: athlete.archivedAt !== null,
  }))
}

export async function getAthlete(db: DbOrTx, access: ClubAccess, athleteId: string) {
  const athlete = await athleteInScope(db, access, athleteId, 'read')
  const [view] = (
    await listAthletes(db, { ...access, role: 'director' }, { includeArchived: true })
  ).filter((a) => a.id === athlete.id)
  return view!
}

/** Adds an athlete to a squad the person may change. */
export async function addAthlete(db: DbOrTx, access: ClubAccess, raw: unknown) {
  const input = athleteInputSchema.parse(raw)
  await assertCanWriteSquad(db, access, input.squadId)
  const athlete = await createAthlete(db, access.clubId, input)
  return getAthlete(db, access, athlete.id)
}

/** Changes names, birth year, squad (the history moves along) or archives. */
export async function updateAthlete(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  raw: unknown,
) {
  const input = athleteUpdateSchema.parse(raw)
  const current = await athleteInScope(db, access, athleteId, 'write')
  if (input.squadId && input.squadId !== current.squadId)
    await assertCanWriteSquad(db, access, input.squadId)
  const { archived, ...fields } = input
  await db
    .update(athletes)
    .set({
      ...fields,
      ...(archived === undefined
        ? {}
        : { archivedAt: archived ? (current.archivedAt ?? new Date()) : null }),
    })
    .where(and(eq(athletes.clubId, access.clubId), eq(athletes.id, athleteId)))
  return getAthlete(db, access, athleteId)
}

/**
 * Validates every roster row (fields, squad by name, squads the person may change, duplicates in
 * the file); saves all rows in one transaction only when none has a problem.
 */
export async function importRoster(
  db: DbOrTx,
  access: ClubAccess,
  rows: Record<string, unknown>[],
  dryRun: boolean,
): Promise<ImportResult> {
  const clubSquads = await db.select().from(squads).where(eq(squads.clubId, access.clubId))
  const readable = await readableSquadIds(db, access)
  const writable = (id: string) =>
    access.role === 'director' ||
    (access.role === 'coach' && readable !== 'all' && readable.includes(id))
  const errors: ImportIssue[] = []
  const valid: AthleteInput[] = []
  const seen = new Map<string, number>()
  rows.forEach((raw, i) => {
    const row = i + 1
    const text = (key: string) => String(raw[key] ?? '').trim()
    const squadName = text('squad')
    const squad = clubSquads.find((s) => s.name.toLowerCase() === squadName.toLowerCase())
    if (!squad) {
      errors.push({
        row,
        field: 'squad',
        message: squadName ? `There is no squad called “${squadName}”.` : 'Name the squad.',
      })
    } else if (!writable(squad.id)) {
      errors.push({ row, field: 'squad', message: `${squad.name} is not one of your squads.` })
    }
    const year = text('birthYear')
    const parsed = athleteInputSchema.safeParse({
      givenName: text('givenName'),
      familyName: text('familyName'),
      birthYear: /^\d+$/.test(year) ? Number(year) : year,
      squadId: squad?.id ?? '00000000-0000-4000-8000-000000000000',
      discipline: text('discipline') || squad?.discipline,
    })
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        // Without a known squad the discipline has nothing to inherit from: the squad error says it.
        const inherited = issue.path[0] === 'discipline' && !squad && text('discipline') === ''
        if (issue.path[0] !== 'squadId' && !inherited)
          errors.push({ row, field: String(issue.path[0] ?? ''), message: issue.message })
      }
      return
    }
    const key =
      `${parsed.data.givenName}|${parsed.data.familyName}|${parsed.data.birthYear}`.toLowerCase()
    if (seen.has(key)) {
      errors.push({ row, field: 'givenName', message: `The same athlete as row ${seen.get(key)}.` })
      return
    }
    seen.set(key, row)
    if (squad) valid.push(parsed.data)
  })
  if (errors.length > 0 || dryRun) return { valid: errors.length === 0, errors, created: 0 }
  await db.transaction(async (tx) => {
    // One statement per 500 rows keeps large files fast without a huge single query.
    for (let i = 0; i < valid.length; i += 500) {
      await tx
        .insert(athletes)
        .values(valid.slice(i, i + 500).map((a) => ({ ...a, clubId: access.clubId })))
    }
  })
  return { valid: true, errors: [], created: valid.length }
}

export async function exportRoster(db: DbOrTx, access: ClubAccess, squadId?: string) {
  const list = await listAthletes(db, access, { squadId })
  return toCsv(
    rosterCsvColumns,
    list.map((a) => ({
      givenName: a.givenName,
      familyName: a.familyName,
      birthYear: a.birthYear,
      squad: a.squadName,
      discipline: a.discipline,
    })),
  )
}

/** A squad's athletes on its roster (none archived), by family name then given name. */
export function squadRoster(db: DbOrTx, clubId: string, squadId: string) {
  return db
    .select({ id: athletes.id, givenName: athletes.givenName, familyName: athletes.familyName })
    .from(athletes)
    .where(
      and(eq(athletes.clubId, clubId), eq(athletes.squadId, squadId), isNull(athletes.archivedAt)),
    )
    .orderBy(asc(athletes.familyName), asc(athletes.givenName))
}
