import { and, eq, inArray, isNull } from 'drizzle-orm'
import { gapDeficit } from '../../shared/domain/audit/formulas.ts'
import { displayNames } from '../../shared/domain/element-names.ts'
import { replayRecord, type CheckResult } from '../../shared/domain/progress.ts'
import type { MissingSkill, RecordDetail, RecordView } from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { users } from '../db/schema-accounts.ts'
import { athletes, progressEvents, progressRecords, squads } from '../db/schema-athletes.ts'
import { elementSteps } from '../db/schema-catalogue.ts'
import { listElements } from './catalogue.ts'
import { athleteOfRecord, elementContext, recordView, toDomainEvent } from './progress-records.ts'
import { assertCanReadSquad, athleteInScope, readableSquadIds } from './scope.ts'

export async function recordDetail(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  elementId: string,
): Promise<RecordDetail> {
  await athleteInScope(db, access, athleteId, 'read')
  const element = await elementContext(db, access.clubId, elementId)
  const rows = await db
    .select({ event: progressEvents, coachName: users.name })
    .from(progressEvents)
    .leftJoin(users, eq(users.id, progressEvents.coachId))
    .where(
      and(
        eq(progressEvents.clubId, access.clubId),
        eq(progressEvents.athleteId, athleteId),
        eq(progressEvents.elementId, elementId),
      ),
    )
  const domain = rows.map((r) => toDomainEvent(r.event, element))
  const effective = new Set(replayRecord(domain).history.map((e) => e.id))
  const [stored] = await db
    .select()
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, access.clubId),
        eq(progressRecords.athleteId, athleteId),
        eq(progressRecords.elementId, elementId),
      ),
    )
  const events = rows
    .map((r, i) => {
      const d = domain[i]!
      return {
        id: r.event.id,
        kind: r.event.kind,
        stepIndex: d.kind === 'step' ? d.stepIndex : null,
        pauseReason: r.event.pauseReason,
        plannedStepIndex: d.kind === 'pause' ? (d.plannedStepIndex ?? null) : null,
        occurredOn: r.event.occurredOn,
        recordedAt: r.event.recordedAt.toISOString(),
        coachName: r.coachName,
        note: r.event.note,
        skipReason: r.event.skipReason,
        correctsEventId: r.event.correctsEventId,
        voided: !effective.has(r.event.id),
        checks: r.event.checks as CheckResult[],
      }
    })
    .sort(
      (a, b) =>
        b.occurredOn.localeCompare(a.occurredOn) || b.recordedAt.localeCompare(a.recordedAt),
    )
  return { ...recordView(stored, athleteId, elementId), steps: element.steps, events }
}

/** All records of one athlete, by element id. */
export async function athleteRecords(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
): Promise<RecordView[]> {
  await athleteInScope(db, access, athleteId, 'read')
  const rows = await db
    .select()
    .from(progressRecords)
    .where(and(eq(progressRecords.clubId, access.clubId), eq(progressRecords.athleteId, athleteId)))
  return rows
    .filter((r) => r.lastEventId !== null)
    .map((r) => recordView(r, athleteId, r.elementId))
}

async function stepCounts(db: DbOrTx, clubId: string) {
  const rows = await db
    .select({ elementId: elementSteps.elementId, position: elementSteps.position })
    .from(elementSteps)
    .where(eq(elementSteps.clubId, clubId))
  const counts = new Map<string, number>()
  for (const r of rows)
    counts.set(r.elementId, Math.max(counts.get(r.elementId) ?? 0, r.position + 1))
  return counts
}

/**
 * The coach's list: athletes whose forward mirror trails their backward element by `threshold`
 * steps or more (in the mirror's own steps), or has not started, or is missing from the catalogue.
 */
export async function missingSkills(
  db: DbOrTx,
  access: ClubAccess,
  options: { squadId?: string; threshold?: number } = {},
): Promise<MissingSkill[]> {
  const threshold = options.threshold ?? 2
  if (options.squadId) await assertCanReadSquad(db, access, options.squadId)
  const readable = await readableSquadIds(db, access)
  const squadFilter = options.squadId ? [options.squadId] : readable
  if (squadFilter !== 'all' && squadFilter.length === 0) return []
  const [list, counts, rows] = await Promise.all([
    listElements(db, access.clubId),
    stepCounts(db, access.clubId),
    db
      .select({
        athleteId: progressRecords.athleteId,
        elementId: progressRecords.elementId,
        stepIndex: progressRecords.stepIndex,
        givenName: athletes.givenName,
        familyName: athletes.familyName,
        squadId: athletes.squadId,
        squadName: squads.name,
      })
      .from(progressRecords)
      .innerJoin(athletes, athleteOfRecord)
      .innerJoin(squads, and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)))
      .where(
        and(
          eq(progressRecords.clubId, access.clubId),
          isNull(athletes.archivedAt),
          squadFilter === 'all' ? undefined : inArray(athletes.squadId, squadFilter),
        ),
      ),
  ])
  const shownName = displayNames(list)
  const elementById = new Map(list.map((e) => [e.id, { ...e, name: shownName.get(e.id)! }]))
  const stepOf = new Map(rows.map((r) => [`${r.athleteId}|${r.elementId}`, r.stepIndex]))
  const result: MissingSkill[] = []
  for (const r of rows) {
    const element = elementById.get(r.elementId)
    if (!element || element.direction !== 'backward' || r.stepIndex === null) continue
    const stepCount = counts.get(element.id) ?? 1
    const mirror = element.counterpartId ? elementById.get(element.counterpartId) : undefined
    const mirrorStep = mirror ? (stepOf.get(`${r.athleteId}|${mirror.id}`) ?? null) : null
    const mirrorCount = mirror ? (counts.get(mirror.id) ?? 1) : stepCount
    const trail = gapDeficit(
      { stepIndex: r.stepIndex, stepCount },
      mirror ? { stepIndex: mirrorStep, stepCount: mirrorCount } : null,
    )
    if (mirror && mirrorStep !== null && trail < threshold) continue
    result.push({
      athleteId: r.athleteId,
      athleteName: `${r.givenName} ${r.familyName}`,
      squadId: r.squadId,
      squadName: r.squadName,
      backward: { elementId: element.id, name: element.name, stepIndex: r.stepIndex, stepCount },
      forward: mirror
        ? { elementId: mirror.id, name: mirror.name, stepIndex: mirrorStep, stepCount: mirrorCount }
        : null,
      trailBy: mirror ? trail : null,
    })
  }
  // Largest trail first; elements with no forward element in the catalogue last (the director's
  // to add, shown by the client on demand).
  return result.sort(
    (a, b) => (b.trailBy ?? -1) - (a.trailBy ?? -1) || a.athleteName.localeCompare(b.athleteName),
  )
}
