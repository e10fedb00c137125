// What an audit reads, as of a date: the catalogue, the athletes of the scope and each record
// replayed from its events. Kept apart from running and storing audits because it is the part
// whose speed matters (see bench/audit.bench.ts).

import { and, asc, eq, inArray, isNull, lte } from 'drizzle-orm'
import { defaultAgeThresholds, type AgeThresholdTable } from '../../shared/domain/age-categories.ts'
import type { AuditInputs, RequirementProfile } from '../../shared/domain/audit.ts'
import { athletePace, replayRecord, type ProgressEvent } from '../../shared/domain/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import {
  ageThresholds,
  athletes,
  elementStepMaps,
  elementSteps,
  elements,
  progressEvents,
  requirementProfiles,
} from '../db/schema.ts'
import { listElements } from './catalogue.ts'
import { replayColumns, toDomainEvent } from './progress.ts'

export async function clubProfiles(db: DbOrTx, clubId: string): Promise<RequirementProfile[]> {
  const rows = await db
    .select()
    .from(requirementProfiles)
    .where(eq(requirementProfiles.clubId, clubId))
    .orderBy(asc(requirementProfiles.id))
  return rows.map((r) => ({
    id: r.id,
    label: r.label,
    discipline: r.discipline,
    categories: r.categories as RequirementProfile['categories'],
    source: r.source,
    requirements: r.requirements as RequirementProfile['requirements'],
  }))
}

export async function clubAgeThresholds(db: DbOrTx, clubId: string): Promise<AgeThresholdTable> {
  const rows = await db.select().from(ageThresholds).where(eq(ageThresholds.clubId, clubId))
  const table = { ...defaultAgeThresholds }
  for (const r of rows)
    table[r.discipline] = {
      juniorFromAge: r.juniorFromAge,
      seniorFromAge: r.seniorFromAge,
      source: r.source,
    }
  return table
}

/**
 * Everything the audit reads, as of a date: the catalogue, the athletes of the scope, each
 * record replayed from its events up to that date (highest step reached, in today's steps), the
 * athletes' recent pace, the club's profiles and age bands.
 */
export async function gatherInputs(
  db: DbOrTx,
  clubId: string,
  squadId: string | null,
  asOf: string,
): Promise<AuditInputs> {
  const [catalogue, stepRows, maps, roster, profiles, thresholds] = await Promise.all([
    listElements(db, clubId),
    db
      .select({ elementId: elementSteps.elementId, position: elementSteps.position })
      .from(elementSteps)
      .where(eq(elementSteps.clubId, clubId)),
    db.select().from(elementStepMaps).where(eq(elementStepMaps.clubId, clubId)),
    db
      .select({
        id: athletes.id,
        squadId: athletes.squadId,
        birthYear: athletes.birthYear,
        discipline: athletes.discipline,
      })
      .from(athletes)
      .where(
        and(
          eq(athletes.clubId, clubId),
          isNull(athletes.archivedAt),
          squadId ? eq(athletes.squadId, squadId) : undefined,
        ),
      ),
    clubProfiles(db, clubId),
    clubAgeThresholds(db, clubId),
  ])
  const stepCount = new Map<string, number>()
  for (const s of stepRows)
    stepCount.set(s.elementId, Math.max(stepCount.get(s.elementId) ?? 0, s.position + 1))
  const versions = new Map<string, { stepsVersion: number; maps: Map<number, number[]> }>()
  const elementRows = await db
    .select({ id: elements.id, stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(eq(elements.clubId, clubId))
  for (const e of elementRows) versions.set(e.id, { stepsVersion: e.stepsVersion, maps: new Map() })
  for (const m of maps) versions.get(m.elementId)?.maps.set(m.fromVersion, m.mapping)

  const inScope = new Set(roster.map((a) => a.id))
  const eventRows = await db
    .select(replayColumns)
    .from(progressEvents)
    .where(
      and(
        eq(progressEvents.clubId, clubId),
        lte(progressEvents.occurredOn, asOf),
        squadId && roster.length > 0 ? inArray(progressEvents.athleteId, [...inScope]) : undefined,
      ),
    )
  const histories = new Map<string, ProgressEvent[]>()
  for (const row of eventRows) {
    if (!inScope.has(row.athleteId)) continue
    const key = `${row.athleteId}|${row.elementId}`
    let list = histories.get(key)
    if (!list) histories.set(key, (list = []))
    list.push(toDomainEvent(row, versions.get(row.elementId)!))
  }
  const records: AuditInputs['records'][number][] = []
  const byAthlete = new Map<string, ProgressEvent[][]>()
  for (const [key, events] of histories) {
    const [athleteId, elementId] = key.split('|') as [string, string]
    records.push({
      athleteId,
      elementId,
      stepIndex: replayRecord(events, { asOf }).highestStepIndex,
    })
    let list = byAthlete.get(athleteId)
    if (!list) byAthlete.set(athleteId, (list = []))
    list.push(events)
  }
  const paces: Record<string, number> = {}
  for (const [athleteId, list] of byAthlete) paces[athleteId] = athletePace(list, asOf)
  return {
    asOf,
    elements: catalogue.map((e) => ({
      id: e.id,
      name: e.name,
      direction: e.direction,
      rotationClass: e.rotationClass,
      twistBand: e.twistBand,
      counterpartId: e.counterpartId,
      stepCount: stepCount.get(e.id) ?? 1,
    })),
    athletes: roster,
    records,
    paces,
    profiles,
    ageThresholds: thresholds,
  }
}
