import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import type { CheckResult, PrerequisiteStatus } from '../../shared/domain/progress.ts'
import type {
  BatchEntry,
  BatchPreview,
  BatchResult,
  BatchRow,
  batchInputSchema,
} from '../../shared/schemas/progress-batch.ts'
import type { z } from 'zod'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { progressEvents, progressRecords } from '../db/schema-athletes.ts'
import { elements } from '../db/schema-catalogue.ts'
import { AppError } from '../http/errors.ts'
import {
  assertReasonGiven,
  assertSameEntry,
  clubStepDown,
  entryChecks,
  isClientIdRace,
  isFlagged,
  prerequisiteStatuses,
  storedByClientId,
} from './progress-checks.ts'
import {
  elementContext,
  lockElements,
  rebuiltRecord,
  recordView,
  type ElementContext,
  type EventRow,
  type RecordRow,
} from './progress-records.ts'
import { squadRoster } from './athletes.ts'
import { assertCanWriteSquad } from './scope.ts'

// A squad's "passed the next step" entries on one element or a pair, checked by the same rules
// as a single entry (progress-checks.ts) and saved in one transaction, all or nothing, in a
// fixed number of statements whatever the squad's size.

type Input = z.output<typeof batchInputSchema>

const invalid = (path: string, message: string) =>
  new AppError(400, 'invalid_input', message, [{ path, message }])

interface Loaded {
  squad: { id: string; name: string }
  elements: (ElementContext & { direction: 'forward' | 'backward' | 'sideward' })[]
  roster: { id: string; givenName: string; familyName: string }[]
  records: Map<string, RecordRow>
  stepDown: number | undefined
  prerequisites: Map<string, Map<string, PrerequisiteStatus[]>>
}

type NewEvent = typeof progressEvents.$inferInsert & { id: string }

const key = (athleteId: string, elementId: string) => `${athleteId}|${elementId}`

/** The squad, the element (and its mirror), the roster and their records (locked to save). */
async function load(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  input: Input,
  lock: boolean,
): Promise<Loaded> {
  const squad = await assertCanWriteSquad(db, access, squadId)
  const ids = [input.elementId, ...(input.counterpartId ? [input.counterpartId] : [])]
  const described = await db
    .select({
      id: elements.id,
      direction: elements.direction,
      descriptionKey: elements.descriptionKey,
      counterpartKey: elements.counterpartKey,
    })
    .from(elements)
    .where(and(eq(elements.clubId, access.clubId), inArray(elements.id, ids)))
  const [first, second] = ids.map((id) => described.find((e) => e.id === id))
  if (!first) throw invalid('elementId', 'No such element in this club’s catalogue.')
  if (input.counterpartId && (!second || second.descriptionKey !== first.counterpartKey))
    throw invalid('counterpartId', 'Choose the element’s own mirror to log the pair.')
  const contexts = await Promise.all(ids.map((id) => elementContext(db, access.clubId, id)))
  const withDirection = contexts.map((c, i) => ({ ...c, direction: [first, second][i]!.direction }))
  input.entries.forEach((entry, i) => {
    const element = contexts.find((c) => c.id === entry.elementId)
    const count = element?.steps.length ?? 0
    if (
      element &&
      entry.stepIndex !== null &&
      entry.stepIndex !== undefined &&
      entry.stepIndex >= count
    )
      throw new AppError(400, 'invalid_input', `${element.name} has ${count} steps.`, [
        { path: `entries.${i}.stepIndex`, message: `Choose one of the ${count} steps.` },
      ])
  })

  const roster = await squadRoster(db, access.clubId, squadId)
  const inSquad = new Set(roster.map((a) => a.id))
  input.entries.forEach((entry, i) => {
    if (!inSquad.has(entry.athleteId))
      throw invalid(`entries.${i}.athleteId`, 'This athlete is not in the squad.')
    if (!ids.includes(entry.elementId))
      throw invalid(`entries.${i}.elementId`, 'This element is not the one being logged.')
  })

  const athleteIds = lock ? [...new Set(input.entries.map((e) => e.athleteId))] : [...inSquad]
  let rows: RecordRow[] = []
  if (athleteIds.length > 0) {
    if (lock) {
      // In the one order every writer uses, so that two batches never wait on each other's
      // new rows in a circle.
      const placeholders = input.entries
        .map((e) => ({ clubId: access.clubId, athleteId: e.athleteId, elementId: e.elementId }))
        .sort(
          (a, b) =>
            a.athleteId.localeCompare(b.athleteId) || a.elementId.localeCompare(b.elementId),
        )
      await db.insert(progressRecords).values(placeholders).onConflictDoNothing()
    }
    const query = db
      .select()
      .from(progressRecords)
      .where(
        and(
          eq(progressRecords.clubId, access.clubId),
          inArray(progressRecords.athleteId, athleteIds),
          inArray(progressRecords.elementId, ids),
        ),
      )
      // One order for every writer, so that two batches never wait on each other in a circle.
      .orderBy(asc(progressRecords.athleteId), asc(progressRecords.elementId))
    rows = lock ? await query.for('update') : await query
  }
  const prerequisites = new Map(
    await Promise.all(
      ids.map(
        async (id) => [id, await prerequisiteStatuses(db, access.clubId, athleteIds, id)] as const,
      ),
    ),
  )
  return {
    squad,
    elements: withDirection,
    roster,
    records: new Map(rows.map((r) => [key(r.athleteId, r.elementId), r])),
    stepDown: await clubStepDown(db, access.clubId),
    prerequisites,
  }
}

/** The step an entry records and its checks, or null when the athlete is at the top already. */
function planEntry(
  loaded: Loaded,
  element: Loaded['elements'][number],
  athleteId: string,
  entry: Pick<BatchEntry, 'stepIndex' | 'skipReason'> | undefined,
  occurredOn: string,
) {
  const record = loaded.records.get(key(athleteId, element.id))
  const current = {
    stepIndex: record?.stepIndex ?? null,
    stepReachedOn: record?.stepReachedOn ?? null,
  }
  const stepIndex = entry?.stepIndex ?? (current.stepIndex ?? -1) + 1
  if (stepIndex >= element.steps.length) return null
  const checks = entryChecks(
    current,
    { kind: 'step', stepIndex, occurredOn, skipReason: entry?.skipReason ?? undefined },
    element,
    loaded.prerequisites.get(element.id)?.get(athleteId) ?? [],
    loaded.stepDown,
  )
  return { record, stepIndex, checks }
}

/** Every athlete of the squad on the element(s): where they stand, the next step and its checks. */
export async function previewBatch(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  input: Input,
): Promise<BatchPreview> {
  const loaded = await load(db, access, squadId, input, false)
  const rows: BatchRow[] = []
  for (const athlete of loaded.roster) {
    for (const element of loaded.elements) {
      const entryIndex = input.entries.findIndex(
        (e) => e.athleteId === athlete.id && e.elementId === element.id,
      )
      const entry = entryIndex >= 0 ? input.entries[entryIndex] : undefined
      const plan = planEntry(loaded, element, athlete.id, entry, input.occurredOn)
      const record = loaded.records.get(key(athlete.id, element.id))
      const step = plan ? element.steps[plan.stepIndex]! : null
      rows.push({
        ...recordView(record, athlete.id, element.id),
        givenName: athlete.givenName,
        familyName: athlete.familyName,
        nextStep: step && { index: plan!.stepIndex, name: step.name, criterion: step.criterion },
        checks: plan?.checks ?? [],
        entryIndex: entry ? entryIndex : null,
      })
    }
  }
  return {
    squad: { id: loaded.squad.id, name: loaded.squad.name },
    elements: loaded.elements.map((e) => ({
      id: e.id,
      name: e.name,
      direction: e.direction,
      stepCount: e.steps.length,
      steps: e.steps.map((step, index) => ({
        index,
        name: step.name,
        criterion: step.criterion,
        minDays: step.minDays,
      })),
    })),
    rows,
  }
}

/**
 * Saves every entry in one transaction: all of them or none. An entry whose client id is
 * already stored is answered with the stored event (`replayed`) and not written again; a stale
 * `expectedLastEventId` is 409 and a skip without a reason 400, each naming its entry.
 */
export async function saveBatch(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  input: Input,
): Promise<BatchResult> {
  try {
    return await db.transaction((tx) => writeBatch(tx, access, squadId, input))
  } catch (err) {
    // Another copy stored one of these ids meanwhile: once more, it is read back this time.
    if (!isClientIdRace(err)) throw err
    return db.transaction((tx) => writeBatch(tx, access, squadId, input))
  }
}

async function writeBatch(
  tx: DbOrTx,
  access: ClubAccess,
  squadId: string,
  input: Input,
): Promise<BatchResult> {
  // Before the element is read: a steps change commits first or waits for this batch.
  await lockElements(tx, access.clubId, [input.elementId, input.counterpartId ?? input.elementId])
  const loaded = await load(tx, access, squadId, input, true)
  const clientIds = input.entries.flatMap((e) => (e.clientEventId ? [e.clientEventId] : []))
  const stored = await storedByClientId(tx, access.clubId, clientIds)
  const results: BatchResult['results'] = []
  // recorded_at is left to the database (its time, as for a single entry).
  const fresh: { index: number; row: NewEvent; element: ElementContext }[] = []
  input.entries.forEach((entry, i) => {
    const element = loaded.elements.find((e) => e.id === entry.elementId)!
    const before = stored.get(entry.clientEventId ?? '')
    if (before) {
      assertSameEntry(
        before,
        { ...entry, kind: 'step', occurredOn: input.occurredOn },
        `entries.${i}.clientEventId`,
      )
      const record = loaded.records.get(key(entry.athleteId, entry.elementId))
      results.push({
        entryIndex: i,
        athleteId: entry.athleteId,
        elementId: entry.elementId,
        eventId: before.id,
        record: recordView(record, entry.athleteId, entry.elementId),
        checks: before.checks as CheckResult[],
        replayed: true,
      })
      return
    }
    const record = loaded.records.get(key(entry.athleteId, entry.elementId))
    if (entry.expectedLastEventId !== (record?.lastEventId ?? null)) {
      const path = `entries.${i}.expectedLastEventId`
      throw new AppError(
        409,
        'conflict',
        'Someone else has just changed this athlete’s record. Look again at where they stand, then save.',
        [{ path, message: 'Changed by someone else since the list was shown.' }],
        { path, record: recordView(record, entry.athleteId, entry.elementId) },
      )
    }
    const plan = planEntry(loaded, element, entry.athleteId, entry, input.occurredOn)
    if (!plan)
      throw invalid(`entries.${i}.stepIndex`, `Already on the last step of ${element.name}.`)
    assertReasonGiven(plan.checks, `entries.${i}.skipReason`)
    fresh.push({
      index: i,
      element,
      row: {
        clubId: access.clubId,
        id: crypto.randomUUID(),
        athleteId: entry.athleteId,
        elementId: entry.elementId,
        kind: 'step',
        stepIndex: plan.stepIndex,
        stepsVersion: element.stepsVersion,
        pauseReason: null,
        plannedStepIndex: null,
        occurredOn: input.occurredOn,
        coachId: access.userId,
        note: null,
        skipReason: entry.skipReason ?? null,
        correctsEventId: null,
        checks: plan.checks,
        flagged: isFlagged(plan.checks),
        clientEventId: entry.clientEventId ?? null,
      },
    })
  })
  if (fresh.length === 0) return { results }

  await tx.insert(progressEvents).values(fresh.map((f) => f.row))
  const earlier = await tx
    .select()
    .from(progressEvents)
    .where(
      and(
        eq(progressEvents.clubId, access.clubId),
        inArray(
          progressEvents.athleteId,
          fresh.map((f) => f.row.athleteId),
        ),
        inArray(
          progressEvents.elementId,
          loaded.elements.map((e) => e.id),
        ),
      ),
    )
  const eventsOf = new Map<string, EventRow[]>()
  for (const row of earlier) {
    const k = key(row.athleteId, row.elementId)
    eventsOf.set(k, [...(eventsOf.get(k) ?? []), row])
  }
  const rebuilt = fresh.map((f) => ({
    clubId: access.clubId,
    athleteId: f.row.athleteId,
    elementId: f.row.elementId,
    ...rebuiltRecord(eventsOf.get(key(f.row.athleteId, f.row.elementId)) ?? [], f.element),
  }))
  const saved = await tx
    .insert(progressRecords)
    .values(rebuilt)
    .onConflictDoUpdate({
      target: [progressRecords.clubId, progressRecords.athleteId, progressRecords.elementId],
      set: Object.fromEntries(
        Object.keys(rebuilt[0]!)
          .filter((k) => !['clubId', 'athleteId', 'elementId'].includes(k))
          .map((k) => [
            k,
            sql.raw(`excluded.${k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`)}`),
          ]),
      ),
    })
    .returning()
  const savedOf = new Map(saved.map((r) => [key(r.athleteId, r.elementId), r]))
  for (const f of fresh) {
    results.push({
      entryIndex: f.index,
      athleteId: f.row.athleteId,
      elementId: f.row.elementId,
      eventId: f.row.id,
      record: recordView(
        savedOf.get(key(f.row.athleteId, f.row.elementId)),
        f.row.athleteId,
        f.row.elementId,
      ),
      checks: f.row.checks as CheckResult[],
      replayed: false,
    })
  }
  return { results: results.sort((a, b) => a.entryIndex - b.entryIndex) }
}
