import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import {
  checkEvent,
  replayRecord,
  type ProgressEvent,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { progressEvents, progressRecords } from '../db/schema-athletes.ts'
import { elements, elementSteps } from '../db/schema-catalogue.ts'
import { notFound } from '../http/errors.ts'
import {
  elementContext,
  lockElements,
  storedState,
  toDomainEvent,
  type ElementContext,
  type EventRow,
} from './progress-records.ts'

/** One event of a history loaded in bulk (the demo's past, an import of another system's log). */
export interface HistoryEvent {
  athleteId: string
  elementId: string
  coachId: string
  change: ProposedEvent & { plannedStepIndex?: number }
  note?: string
}

/**
 * Appends a whole history at once, in the caller's transaction: each record's events are checked
 * in date order by the same rules as a single event (prerequisites aside: they depend on the
 * order records are loaded in), after any events the record already has, then inserted and the
 * records rebuilt, in a few bulk statements.
 */
export async function appendHistory(db: DbOrTx, clubId: string, history: HistoryEvent[]) {
  // Before the steps are read: a steps change to any of these elements waits, or is waited for.
  await lockElements(
    db,
    clubId,
    history.map((e) => e.elementId),
  )
  const elementRows = await db
    .select({ id: elements.id, stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(eq(elements.clubId, clubId))
  const version = new Map(elementRows.map((e) => [e.id, e.stepsVersion]))
  const stepRows = await db
    .select({
      elementId: elementSteps.elementId,
      name: elementSteps.name,
      minDays: elementSteps.minDays,
      position: elementSteps.position,
    })
    .from(elementSteps)
    .where(eq(elementSteps.clubId, clubId))
    .orderBy(asc(elementSteps.position))
  const steps = new Map<string, { name: string; minDays?: number }[]>()
  for (const s of stepRows) {
    const list = steps.get(s.elementId) ?? []
    list.push({ name: s.name, ...(s.minDays === null ? {} : { minDays: s.minDays }) })
    steps.set(s.elementId, list)
  }
  const [club] = await db
    .select({ stepDown: clubs.lostSkillStepDown })
    .from(clubs)
    .where(eq(clubs.id, clubId))

  const byRecord = new Map<string, HistoryEvent[]>()
  for (const event of history) {
    if (!version.has(event.elementId))
      throw notFound('An event names an element that is not in the catalogue.')
    const key = `${event.athleteId}|${event.elementId}`
    let list = byRecord.get(key)
    if (!list) byRecord.set(key, (list = []))
    list.push(event)
  }
  // Records that already have events carry on from them: the checks see the record as it
  // stands, and the stored record is rebuilt from the old events and the new ones together.
  const athleteIds = [...new Set(history.map((e) => e.athleteId))]
  const earlier = new Map<string, EventRow[]>()
  if (athleteIds.length > 0) {
    const existing = await db
      .select()
      .from(progressEvents)
      .where(and(eq(progressEvents.clubId, clubId), inArray(progressEvents.athleteId, athleteIds)))
    for (const row of existing) {
      const key = `${row.athleteId}|${row.elementId}`
      if (!byRecord.has(key)) continue
      let list = earlier.get(key)
      if (!list) earlier.set(key, (list = []))
      list.push(row)
    }
  }
  const contexts = new Map<string, ElementContext>()
  const contextOf = async (elementId: string) => {
    let element = contexts.get(elementId)
    if (!element) contexts.set(elementId, (element = await elementContext(db, clubId, elementId)))
    return element
  }

  const rows: (typeof progressEvents.$inferInsert)[] = []
  const records: (typeof progressRecords.$inferInsert)[] = []
  let sequence = 0
  const base = Date.now() - history.length * 1000
  for (const [key, events] of byRecord) {
    events.sort((a, b) => a.change.occurredOn.localeCompare(b.change.occurredOn))
    const before = earlier.get(key) ?? []
    const element = before.length > 0 ? await contextOf(events[0]!.elementId) : null
    const domain: ProgressEvent[] = before.map((r) => toDomainEvent(r, element!))
    const flaggedIds = new Set(before.filter((r) => r.flagged).map((r) => r.id))
    // Entered after everything the record already holds, in the order given.
    let enteredAt = before.reduce((latest, r) => Math.max(latest, r.recordedAt.getTime()), 0)
    for (const event of events) {
      const { change } = event
      const id = crypto.randomUUID()
      enteredAt = Math.max(base + sequence++ * 1000, enteredAt + 1)
      const recordedAt = new Date(enteredAt)
      const current = replayRecord(domain)
      const checks = checkEvent(current, change, {
        steps: steps.get(event.elementId) ?? [],
        reachedCurrentStepOn: current.stepReachedOn,
        lostSkillStepDown: club?.stepDown,
      })
      const planned =
        change.kind === 'pause'
          ? (change.plannedStepIndex ??
            checks.find((c) => c.proposedStepIndex !== undefined)?.proposedStepIndex)
          : undefined
      const meta = {
        id,
        occurredOn: change.occurredOn,
        recordedAt: recordedAt.toISOString(),
        coachId: event.coachId,
      }
      domain.push(
        change.kind === 'step'
          ? { ...meta, kind: 'step', stepIndex: change.stepIndex }
          : change.kind === 'pause'
            ? {
                ...meta,
                kind: 'pause',
                reason: change.reason,
                ...(planned === undefined ? {} : { plannedStepIndex: planned }),
              }
            : { ...meta, kind: 'resume' },
      )
      const flagged = checks.some((c) => c.code !== 'lost-skill-step-down')
      if (flagged) flaggedIds.add(id)
      rows.push({
        clubId,
        id,
        athleteId: event.athleteId,
        elementId: event.elementId,
        kind: change.kind,
        stepIndex: change.kind === 'step' ? change.stepIndex : null,
        stepsVersion: version.get(event.elementId)!,
        pauseReason: change.kind === 'pause' ? change.reason : null,
        plannedStepIndex: planned ?? null,
        occurredOn: change.occurredOn,
        recordedAt,
        coachId: event.coachId,
        note: event.note ?? null,
        skipReason: change.skipReason ?? null,
        checks,
        flagged,
      })
    }
    const record = replayRecord(domain)
    const first = events[0]!
    records.push({
      clubId,
      athleteId: first.athleteId,
      elementId: first.elementId,
      ...storedState(record),
      lastEventId: domain.at(-1)!.id,
      flagged: record.history.some((e) => flaggedIds.has(e.id)),
    })
  }
  for (let i = 0; i < rows.length; i += 1000)
    await db.insert(progressEvents).values(rows.slice(i, i + 1000))
  // A record that existed takes the rebuilt state: every column the insert names but its key.
  const rebuilt = Object.keys(records[0] ?? {}).filter(
    (key) => !['clubId', 'athleteId', 'elementId'].includes(key),
  )
  const excluded = (key: string) =>
    sql.raw(`excluded.${key.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`)}`)
  for (let i = 0; i < records.length; i += 1000) {
    await db
      .insert(progressRecords)
      .values(records.slice(i, i + 1000))
      .onConflictDoUpdate({
        target: [progressRecords.clubId, progressRecords.athleteId, progressRecords.elementId],
        set: {
          ...Object.fromEntries(rebuilt.map((key) => [key, excluded(key)])),
          updatedAt: new Date(),
        },
      })
  }
  return { events: rows.length, records: records.length }
}
