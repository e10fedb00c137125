import { and, eq } from 'drizzle-orm'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, coachSquads, squads } from '../db/schema-athletes.ts'
import { AppError, notFound } from '../http/errors.ts'
import { todayIso } from '../../shared/domain/access.ts'
import { clinicianSquadIds } from './visit-access.ts'

// Squad-level scoping on top of the club check: directors see and change every squad; coaches
// only the squads assigned to them; clinicians read the squads their open visits cover and
// change none.

/**
 * The squads the person may read: every one, the ids assigned to a coach, or those covered by
 * a clinician's visits open today.
 */
export async function readableSquadIds(db: DbOrTx, access: ClubAccess): Promise<'all' | string[]> {
  if (access.role === 'director') return 'all'
  if (access.role === 'clinician')
    return clinicianSquadIds(db, access.clubId, access.userId, todayIso())
  if (access.role !== 'coach') return []
  const rows = await db
    .select({ squadId: coachSquads.squadId })
    .from(coachSquads)
    .where(and(eq(coachSquads.clubId, access.clubId), eq(coachSquads.userId, access.userId)))
  return rows.map((r) => r.squadId)
}

async function squadExists(db: DbOrTx, clubId: string, squadId: string) {
  const [row] = await db
    .select({ id: squads.id, name: squads.name })
    .from(squads)
    .where(and(eq(squads.clubId, clubId), eq(squads.id, squadId)))
  if (!row) throw notFound('No such squad in this club.')
  return row
}

export async function assertCanReadSquad(db: DbOrTx, access: ClubAccess, squadId: string) {
  const squad = await squadExists(db, access.clubId, squadId)
  const readable = await readableSquadIds(db, access)
  if (readable !== 'all' && !readable.includes(squadId)) {
    throw new AppError(403, 'forbidden', `${squad.name} is not one of your squads.`)
  }
  return squad
}

export async function assertCanWriteSquad(db: DbOrTx, access: ClubAccess, squadId: string) {
  const squad = await squadExists(db, access.clubId, squadId)
  if (access.role === 'director') return squad
  if (access.role === 'clinician') {
    throw new AppError(
      403,
      'forbidden',
      'Visiting clinicians read squads; they do not change them.',
    )
  }
  const readable = await readableSquadIds(db, access)
  if (readable === 'all' || readable.includes(squadId)) return squad
  throw new AppError(403, 'forbidden', `${squad.name} is not one of your squads.`)
}

/** The athlete's squad, checked for reading or writing. */
export async function athleteInScope(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  mode: 'read' | 'write',
) {
  const [athlete] = await db
    .select()
    .from(athletes)
    .where(and(eq(athletes.clubId, access.clubId), eq(athletes.id, athleteId)))
  if (!athlete) throw notFound('No such athlete in this club.')
  if (mode === 'read') await assertCanReadSquad(db, access, athlete.squadId)
  else await assertCanWriteSquad(db, access, athlete.squadId)
  return athlete
}
