import { and, eq, inArray, sql } from 'drizzle-orm'
import { squadInputSchema, type SquadInput, type SquadView } from '../../shared/schemas/squads.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { memberships } from '../db/schema-accounts.ts'
import { coachSquads, squads } from '../db/schema-athletes.ts'
import { AppError, notFound } from '../http/errors.ts'
import { assertCanReadSquad, readableSquadIds } from './scope.ts'

export async function createSquad(db: DbOrTx, clubId: string, input: SquadInput) {
  const values = squadInputSchema.parse(input)
  const clash = await db
    .select({ id: squads.id })
    .from(squads)
    .where(and(eq(squads.clubId, clubId), eq(squads.name, values.name)))
  if (clash.length > 0) {
    throw new AppError(409, 'duplicate_name', `There is already a squad called ${values.name}.`, [
      { path: 'name', message: 'Another squad has this name.' },
    ])
  }
  const [squad] = await db
    .insert(squads)
    .values({ ...values, clubId })
    .returning()
  return squad!
}

/** Gives a coach (already a member of the club) access to a squad. */
export async function assignCoach(db: DbOrTx, clubId: string, squadId: string, userId: string) {
  await db.insert(coachSquads).values({ clubId, squadId, userId }).onConflictDoNothing()
}

// The coaches and the counts come with each squad, in one statement. Written out, because in a
// query of one table Drizzle leaves column names unqualified, which inside a subquery would name
// the subquery's own columns.
const squadColumns = {
  id: squads.id,
  clubId: squads.clubId,
  name: squads.name,
  level: squads.level,
  discipline: squads.discipline,
  coachIds: sql<string[]>`array(select c.user_id from coach_squads c
    where c.club_id = squads.club_id and c.squad_id = squads.id order by c.user_id)`,
  athleteCount: sql<number>`(select count(*)::int from athletes a
    where a.club_id = squads.club_id and a.squad_id = squads.id and a.archived_at is null)`,
}

const prepareClubSquads = (db: DbOrTx) =>
  db
    .select(squadColumns)
    .from(squads)
    .where(eq(squads.clubId, sql.placeholder('clubId')))
    .orderBy(squads.name)
    .prepare('')

/**
 * A whole club's list is asked for on most screens: its SQL is built once for each database
 * handle (and sent unnamed, as in auth/lucia.ts), not again for every request.
 */
const clubSquadsOn = new WeakMap<DbOrTx, ReturnType<typeof prepareClubSquads>>()

/** The squads the person may see, with their coaches and number of active athletes. */
export async function listSquads(db: DbOrTx, access: ClubAccess): Promise<SquadView[]> {
  const readable = await readableSquadIds(db, access)
  if (readable === 'all') {
    let clubSquads = clubSquadsOn.get(db)
    if (!clubSquads) clubSquadsOn.set(db, (clubSquads = prepareClubSquads(db)))
    return clubSquads.execute({ clubId: access.clubId })
  }
  if (readable.length === 0) return []
  return db
    .select(squadColumns)
    .from(squads)
    .where(and(eq(squads.clubId, access.clubId), inArray(squads.id, readable)))
    .orderBy(squads.name)
}

export async function getSquad(db: DbOrTx, access: ClubAccess, squadId: string) {
  await assertCanReadSquad(db, access, squadId)
  const [squad] = (await listSquads(db, { ...access, role: 'director' })).filter(
    (s) => s.id === squadId,
  )
  return squad!
}

export async function updateSquad(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  input: SquadInput,
) {
  const values = squadInputSchema.parse(input)
  const clash = await db
    .select({ id: squads.id })
    .from(squads)
    .where(and(eq(squads.clubId, access.clubId), eq(squads.name, values.name)))
  if (clash.some((c) => c.id !== squadId)) {
    throw new AppError(409, 'duplicate_name', `There is already a squad called ${values.name}.`, [
      { path: 'name', message: 'Another squad has this name.' },
    ])
  }
  const updated = await db
    .update(squads)
    .set(values)
    .where(and(eq(squads.clubId, access.clubId), eq(squads.id, squadId)))
    .returning()
  if (updated.length === 0) throw notFound('No such squad in this club.')
  return getSquad(db, access, squadId)
}

/** Replaces the squad's coaches; each must be a coach of the club. */
export async function setSquadCoaches(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  userIds: string[],
) {
  await db.transaction(async (tx) => {
    await assertCanReadSquad(tx, access, squadId)
    const unique = [...new Set(userIds)]
    if (unique.length > 0) {
      const members = await tx
        .select({ userId: memberships.userId, role: memberships.role })
        .from(memberships)
        .where(and(eq(memberships.clubId, access.clubId), inArray(memberships.userId, unique)))
      const notCoaches = unique.filter(
        (id) => members.find((m) => m.userId === id)?.role !== 'coach',
      )
      if (notCoaches.length > 0) {
        throw new AppError(
          400,
          'invalid_input',
          'Only the club’s coaches can be assigned to a squad.',
          [{ path: 'userIds', message: 'Only the club’s coaches can be assigned to a squad.' }],
        )
      }
    }
    await tx
      .delete(coachSquads)
      .where(and(eq(coachSquads.clubId, access.clubId), eq(coachSquads.squadId, squadId)))
    if (unique.length > 0) {
      await tx
        .insert(coachSquads)
        .values(unique.map((userId) => ({ clubId: access.clubId, squadId, userId })))
    }
  })
  return getSquad(db, access, squadId)
}
