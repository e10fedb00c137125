import { and, asc, eq, inArray, isNull } from 'drizzle-orm'
import {
  replayRecord,
  type ProgressEvent,
  type ProgressRecord,
} from '../../shared/domain/progress.ts'
import { translateStepIndex } from '../../shared/domain/step-versions.ts'
import type { RecordView } from '../../shared/schemas/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressEvents, progressRecords } from '../db/schema-athletes.ts'
import { elements, elementStepMaps, elementSteps } from '../db/schema-catalogue.ts'
import { notFound } from '../http/errors.ts'

/** Joins a progress record to its athlete, within the record's club. */
export const athleteOfRecord = and(
  eq(athletes.clubId, progressRecords.clubId),
  eq(athletes.id, progressRecords.athleteId),
)

/**
 * Progress records: an element's steps as events are read through, the replay of an athlete's
 * events on one element into its stored record, and the rebuilds after a steps change. Nothing
 * here imports the catalogue, which calls in after a steps change.
 */
export type EventRow = typeof progressEvents.$inferSelect
export type RecordRow = typeof progressRecords.$inferSelect

export interface ElementContext {
  id: string
  name: string
  stepsVersion: number
  steps: { name: string; modality: string; criterion: string; minDays: number | null }[]
  maps: Map<number, number[]>
}

/**
 * Holds the elements' rows FOR SHARE until the writer's transaction ends, taken first and in id
 * order by every writer of events (one entry, a squad's batch, a history). A steps change holds
 * its element FOR UPDATE, so it and a writer never interleave: the writer reads the steps and
 * their version after the change commits, or the change waits until the writer's events and
 * records are stored and then rebuilds them. Writers do not block each other.
 */
export async function lockElements(db: DbOrTx, clubId: string, elementIds: string[]) {
  const ids = [...new Set(elementIds)].sort()
  if (ids.length === 0) return
  await db
    .select({ id: elements.id })
    .from(elements)
    .where(and(eq(elements.clubId, clubId), inArray(elements.id, ids)))
    .orderBy(asc(elements.id))
    .for('share')
}

export async function elementContext(
  db: DbOrTx,
  clubId: string,
  elementId: string,
): Promise<ElementContext> {
  const [element] = await db
    .select({ id: elements.id, name: elements.name, stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(and(eq(elements.clubId, clubId), eq(elements.id, elementId)))
  if (!element) throw notFound('No such element in this club’s catalogue.')
  const steps = await db
    .select({
      name: elementSteps.name,
      modality: elementSteps.modality,
      criterion: elementSteps.criterion,
      minDays: elementSteps.minDays,
    })
    .from(elementSteps)
    .where(and(eq(elementSteps.clubId, clubId), eq(elementSteps.elementId, elementId)))
    .orderBy(asc(elementSteps.position))
  const maps = await db
    .select({ fromVersion: elementStepMaps.fromVersion, mapping: elementStepMaps.mapping })
    .from(elementStepMaps)
    .where(and(eq(elementStepMaps.clubId, clubId), eq(elementStepMaps.elementId, elementId)))
  return { ...element, steps, maps: new Map(maps.map((m) => [m.fromVersion, m.mapping])) }
}

/** The columns of an event that replaying it needs. */
export const replayColumns = {
  id: progressEvents.id,
  athleteId: progressEvents.athleteId,
  elementId: progressEvents.elementId,
  kind: progressEvents.kind,
  stepIndex: progressEvents.stepIndex,
  stepsVersion: progressEvents.stepsVersion,
  pauseReason: progressEvents.pauseReason,
  plannedStepIndex: progressEvents.plannedStepIndex,
  occurredOn: progressEvents.occurredOn,
  recordedAt: progressEvents.recordedAt,
  coachId: progressEvents.coachId,
  note: progressEvents.note,
  skipReason: progressEvents.skipReason,
  correctsEventId: progressEvents.correctsEventId,
}
type ReplayRow = Pick<EventRow, keyof typeof replayColumns>

/** A stored event as the domain replays it, its step indices read in the current steps. */
export function toDomainEvent(
  row: ReplayRow,
  element: Pick<ElementContext, 'stepsVersion' | 'maps'>,
): ProgressEvent {
  const now = (index: number) =>
    translateStepIndex(index, row.stepsVersion, element.stepsVersion, element.maps)
  const meta = {
    id: row.id,
    occurredOn: row.occurredOn,
    recordedAt: row.recordedAt.toISOString(),
    coachId: row.coachId ?? '',
    ...(row.note ? { note: row.note } : {}),
    ...(row.correctsEventId ? { correctsEventId: row.correctsEventId } : {}),
    ...(row.skipReason ? { skipReason: row.skipReason } : {}),
  }
  if (row.kind === 'step') return { ...meta, kind: 'step', stepIndex: now(row.stepIndex ?? 0) }
  if (row.kind === 'pause') {
    return {
      ...meta,
      kind: 'pause',
      reason: row.pauseReason ?? 'other',
      ...(row.plannedStepIndex === null ? {} : { plannedStepIndex: now(row.plannedStepIndex) }),
    }
  }
  return { ...meta, kind: 'resume' }
}

export async function eventRows(db: DbOrTx, clubId: string, athleteId: string, elementId: string) {
  return db
    .select()
    .from(progressEvents)
    .where(
      and(
        eq(progressEvents.clubId, clubId),
        eq(progressEvents.athleteId, athleteId),
        eq(progressEvents.elementId, elementId),
      ),
    )
}

export function recordView(
  row: RecordRow | undefined,
  athleteId: string,
  elementId: string,
): RecordView {
  return {
    athleteId,
    elementId,
    stepIndex: row?.stepIndex ?? null,
    highestStepIndex: row?.highestStepIndex ?? null,
    stepReachedOn: row?.stepReachedOn ?? null,
    paused: row?.paused ?? false,
    pauseReason: row?.pauseReason ?? null,
    plannedStepIndex: row?.plannedStepIndex ?? null,
    lastEventOn: row?.lastEventOn ?? null,
    lastEventId: row?.lastEventId ?? null,
    flagged: row?.flagged ?? false,
  }
}

/** The columns of progress_records that come straight from a replay. */
export function storedState(record: ProgressRecord) {
  return {
    stepIndex: record.stepIndex,
    highestStepIndex: record.highestStepIndex,
    stepReachedOn: record.stepReachedOn,
    paused: record.paused,
    pauseReason: record.pauseReason,
    plannedStepIndex: record.plannedStepIndex,
    lastEventOn: record.lastEventOn,
    timeline: record.timeline,
  }
}

/** The stored columns of a record (but its key) replayed from all of its event rows. */
export function rebuiltRecord(
  rows: (ReplayRow & { flagged: boolean })[],
  element: Pick<ElementContext, 'stepsVersion' | 'maps'>,
) {
  const record = replayRecord(rows.map((r) => toDomainEvent(r, element)))
  const newest = [...rows].sort(
    (a, b) => b.recordedAt.getTime() - a.recordedAt.getTime() || b.id.localeCompare(a.id),
  )[0]
  const effective = new Set(record.history.map((e) => e.id))
  return {
    ...storedState(record),
    lastEventId: newest?.id ?? null,
    flagged: rows.some((r) => r.flagged && effective.has(r.id)),
    updatedAt: new Date(),
  }
}

/** Rebuilds the stored state of one record from its events. */
export async function recompute(
  db: DbOrTx,
  clubId: string,
  athleteId: string,
  element: ElementContext,
) {
  const rows = await eventRows(db, clubId, athleteId, element.id)
  const values = rebuiltRecord(rows, element)
  const [saved] = await db
    .insert(progressRecords)
    .values({ clubId, athleteId, elementId: element.id, ...values })
    .onConflictDoUpdate({
      target: [progressRecords.clubId, progressRecords.athleteId, progressRecords.elementId],
      set: values,
    })
    .returning()
  return recordView(saved, athleteId, element.id)
}

/**
 * A record's timeline replayed from its events, for a row stored before timelines were kept
 * (the start-up backfill normally leaves none).
 */
export async function replayedTimeline(
  db: DbOrTx,
  clubId: string,
  athleteId: string,
  elementId: string,
) {
  const element = await elementContext(db, clubId, elementId)
  const rows = await eventRows(db, clubId, athleteId, elementId)
  return replayRecord(rows.map((r) => toDomainEvent(r, element))).timeline
}

/** Fills in the timeline of every record stored before timelines were kept; returns how many. */
export async function backfillRecordTimelines(db: DbOrTx) {
  const missing = await db
    .select({
      clubId: progressRecords.clubId,
      athleteId: progressRecords.athleteId,
      elementId: progressRecords.elementId,
    })
    .from(progressRecords)
    .where(isNull(progressRecords.timeline))
  const contexts = new Map<string, ElementContext>()
  for (const { clubId, athleteId, elementId } of missing) {
    const key = `${clubId}|${elementId}`
    let element = contexts.get(key)
    if (!element) contexts.set(key, (element = await elementContext(db, clubId, elementId)))
    await recompute(db, clubId, athleteId, element)
  }
  return missing.length
}

/** After the steps of an element change: every record on it read through the new mapping. */
export async function recomputeElementRecords(db: DbOrTx, clubId: string, elementId: string) {
  const element = await elementContext(db, clubId, elementId)
  const athleteIds = await db
    .selectDistinct({ athleteId: progressEvents.athleteId })
    .from(progressEvents)
    .where(and(eq(progressEvents.clubId, clubId), eq(progressEvents.elementId, elementId)))
  for (const { athleteId } of athleteIds) await recompute(db, clubId, athleteId, element)
}
