import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm'
import { gapDeficit } from '../../shared/domain/audit/formulas.ts'
import { displayNames } from '../../shared/domain/element-names.ts'
import {
  checkEvent,
  replayRecord,
  type CheckResult,
  type PrerequisiteStatus,
  type ProgressEvent,
  type ProgressRecord,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'
import { translateStepIndex } from '../../shared/domain/step-versions.ts'
import type {
  EventResult,
  Grid,
  MissingSkill,
  ProgressEventInput,
  RecordDetail,
  RecordView,
} from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import {
  athletes,
  clubs,
  elementPrerequisites,
  elements,
  elementStepMaps,
  elementSteps,
  progressEvents,
  progressRecords,
  squads,
  users,
} from '../db/schema.ts'
import { AppError, conflict, notFound } from '../http/errors.ts'
import { listElements } from './catalogue.ts'
import { assertCanReadSquad, athleteInScope, readableSquadIds } from './scope.ts'

type EventRow = typeof progressEvents.$inferSelect
type RecordRow = typeof progressRecords.$inferSelect

interface ElementContext {
  id: string
  name: string
  stepsVersion: number
  steps: { name: string; modality: string; minDays: number | null }[]
  maps: Map<number, number[]>
}

async function elementContext(
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

async function eventRows(db: DbOrTx, clubId: string, athleteId: string, elementId: string) {
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

function recordView(row: RecordRow | undefined, athleteId: string, elementId: string): RecordView {
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
function storedState(record: ProgressRecord) {
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

/** Rebuilds the stored state of one record from its events. */
async function recompute(db: DbOrTx, clubId: string, athleteId: string, element: ElementContext) {
  const rows = await eventRows(db, clubId, athleteId, element.id)
  const record = replayRecord(rows.map((r) => toDomainEvent(r, element)))
  const newest = [...rows].sort(
    (a, b) => b.recordedAt.getTime() - a.recordedAt.getTime() || b.id.localeCompare(a.id),
  )[0]
  const effective = new Set(record.history.map((e) => e.id))
  const values = {
    ...storedState(record),
    lastEventId: newest?.id ?? null,
    flagged: rows.some((r) => r.flagged && effective.has(r.id)),
    updatedAt: new Date(),
  }
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

async function prerequisiteStatuses(
  db: DbOrTx,
  clubId: string,
  athleteId: string,
  elementId: string,
): Promise<PrerequisiteStatus[]> {
  const rows = await db
    .select({
      requiresElementId: elementPrerequisites.requiresElementId,
      requiredStepIndex: elementPrerequisites.stepIndex,
      elementName: elements.name,
    })
    .from(elementPrerequisites)
    .innerJoin(
      elements,
      and(
        eq(elements.clubId, elementPrerequisites.clubId),
        eq(elements.id, elementPrerequisites.requiresElementId),
      ),
    )
    .where(
      and(eq(elementPrerequisites.clubId, clubId), eq(elementPrerequisites.elementId, elementId)),
    )
  if (rows.length === 0) return []
  const records = await db
    .select({ elementId: progressRecords.elementId, stepIndex: progressRecords.stepIndex })
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, clubId),
        eq(progressRecords.athleteId, athleteId),
        inArray(
          progressRecords.elementId,
          rows.map((r) => r.requiresElementId),
        ),
      ),
    )
  return rows.map((r) => ({
    elementName: r.elementName,
    requiredStepIndex: r.requiredStepIndex,
    athleteStepIndex: records.find((x) => x.elementId === r.requiresElementId)?.stepIndex ?? null,
  }))
}

interface Evaluation {
  element: ElementContext
  rows: EventRow[]
  checks: CheckResult[]
  plannedStepIndex: number | null
}

/** The checks of a proposed event against the record as it stands (or without the corrected event). */
async function evaluate(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
): Promise<Evaluation> {
  const element = await elementContext(db, access.clubId, input.elementId)
  const last = element.steps.length - 1
  for (const field of ['stepIndex', 'plannedStepIndex'] as const) {
    const value = input[field]
    if (value !== null && value !== undefined && value > last) {
      throw new AppError(
        400,
        'invalid_input',
        `${element.name} has ${element.steps.length} steps.`,
        [{ path: field, message: `Choose one of the ${element.steps.length} steps.` }],
      )
    }
  }
  const rows = await eventRows(db, access.clubId, athleteId, input.elementId)
  const events = rows.map((r) => toDomainEvent(r, element))
  if (input.correctsEventId && !rows.some((r) => r.id === input.correctsEventId)) {
    throw new AppError(400, 'invalid_input', 'The event to correct is not in this record.', [
      { path: 'correctsEventId', message: 'Not an event of this record.' },
    ])
  }
  const current = replayRecord(
    input.correctsEventId ? events.filter((e) => e.id !== input.correctsEventId) : events,
  )
  const [club] = await db
    .select({ stepDown: clubs.lostSkillStepDown })
    .from(clubs)
    .where(eq(clubs.id, access.clubId))
  const proposed: ProposedEvent =
    input.kind === 'step'
      ? {
          kind: 'step',
          stepIndex: input.stepIndex!,
          occurredOn: input.occurredOn,
          skipReason: input.skipReason ?? undefined,
        }
      : input.kind === 'pause'
        ? { kind: 'pause', reason: input.pauseReason!, occurredOn: input.occurredOn }
        : { kind: 'resume', occurredOn: input.occurredOn }
  const checks = checkEvent(current, proposed, {
    steps: element.steps.map((s) => ({
      name: s.name,
      ...(s.minDays === null ? {} : { minDays: s.minDays }),
    })),
    reachedCurrentStepOn: current.stepReachedOn,
    prerequisites: await prerequisiteStatuses(db, access.clubId, athleteId, input.elementId),
    lostSkillStepDown: club?.stepDown,
  })
  const proposal = checks.find((c) => c.code === 'lost-skill-step-down')?.proposedStepIndex
  return {
    element,
    rows,
    checks,
    plannedStepIndex: input.kind === 'pause' ? (input.plannedStepIndex ?? proposal ?? null) : null,
  }
}

/** The checks a coach sees before saving; nothing is written. */
export async function previewEvent(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
) {
  await athleteInScope(db, access, athleteId, 'write')
  const { checks, plannedStepIndex } = await evaluate(db, access, athleteId, input)
  return { checks, plannedStepIndex }
}

/**
 * Appends one event to an athlete's record, with its checks, and rebuilds the record, in one
 * transaction holding the record's row lock. A writer who saw an older state gets 409 with the
 * current record, and nothing of theirs is written.
 */
export async function recordEvent(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
): Promise<EventResult> {
  return db.transaction(async (tx) => {
    await athleteInScope(tx, access, athleteId, 'write')
    await elementContext(tx, access.clubId, input.elementId)
    await tx
      .insert(progressRecords)
      .values({ clubId: access.clubId, athleteId, elementId: input.elementId })
      .onConflictDoNothing()
    const [locked] = await tx
      .select()
      .from(progressRecords)
      .where(
        and(
          eq(progressRecords.clubId, access.clubId),
          eq(progressRecords.athleteId, athleteId),
          eq(progressRecords.elementId, input.elementId),
        ),
      )
      .for('update')
    if ((locked?.lastEventId ?? null) !== input.expectedLastEventId) {
      throw conflict(
        'Someone else has just changed this record. Here is where it stands now; check it and try again.',
        {
          record: recordView(locked, athleteId, input.elementId),
        },
      )
    }
    const { element, checks, plannedStepIndex } = await evaluate(tx, access, athleteId, input)
    const needsReason = checks.find((c) => c.severity === 'requires-reason')
    if (needsReason) {
      throw new AppError(400, 'reason_required', needsReason.message, [
        { path: 'skipReason', message: needsReason.message },
      ])
    }
    await tx.insert(progressEvents).values({
      clubId: access.clubId,
      athleteId,
      elementId: input.elementId,
      kind: input.kind,
      stepIndex: input.kind === 'step' ? input.stepIndex! : null,
      stepsVersion: element.stepsVersion,
      pauseReason: input.kind === 'pause' ? input.pauseReason! : null,
      plannedStepIndex,
      occurredOn: input.occurredOn,
      coachId: access.userId,
      note: input.note ?? null,
      skipReason: input.skipReason ?? null,
      correctsEventId: input.correctsEventId ?? null,
      checks,
      // Skips, early passes and unmet prerequisites stay visible on the record.
      flagged: checks.some((c) => c.code !== 'lost-skill-step-down'),
    })
    const record = await recompute(tx, access.clubId, athleteId, element)
    return { record, checks }
  })
}

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
 * The squad grid: athletes × elements, each cell the step reached. Backward elements stand next
 * to their forward mirror so that a trailing counterpart shows at a glance.
 */
export async function squadGrid(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  query: { apparatus?: string; rotationClass?: 'none' | 'single' | 'double' | 'triple' } = {},
): Promise<Grid> {
  const squad = await assertCanReadSquad(db, access, squadId)
  const [list, counts, roster] = await Promise.all([
    listElements(db, access.clubId, {
      apparatus: query.apparatus,
      rotationClass: query.rotationClass,
    }),
    stepCounts(db, access.clubId),
    db
      .select({ id: athletes.id, givenName: athletes.givenName, familyName: athletes.familyName })
      .from(athletes)
      .where(
        and(
          eq(athletes.clubId, access.clubId),
          eq(athletes.squadId, squadId),
          isNull(athletes.archivedAt),
        ),
      )
      .orderBy(asc(athletes.familyName), asc(athletes.givenName)),
  ])
  const byId = new Map(list.map((e) => [e.id, e]))
  const placed = new Set<string>()
  const columns: Grid['columns'] = []
  const push = (id: string, pairKey: string) => {
    const e = byId.get(id)!
    placed.add(id)
    columns.push({
      elementId: e.id,
      name: e.name,
      apparatus: e.apparatus,
      direction: e.direction,
      rotationClass: e.rotationClass,
      notation: e.notation,
      stepCount: counts.get(e.id) ?? 0,
      counterpartId: e.counterpartId && byId.has(e.counterpartId) ? e.counterpartId : null,
      pairKey,
    })
  }
  for (const e of list) {
    if (placed.has(e.id) || e.direction !== 'backward') continue
    push(e.id, e.id)
    if (e.counterpartId && byId.has(e.counterpartId) && !placed.has(e.counterpartId))
      push(e.counterpartId, e.id)
  }
  for (const e of list) if (!placed.has(e.id)) push(e.id, e.id)

  const records =
    roster.length === 0
      ? []
      : await db
          .select({
            athleteId: progressRecords.athleteId,
            elementId: progressRecords.elementId,
            stepIndex: progressRecords.stepIndex,
            paused: progressRecords.paused,
            flagged: progressRecords.flagged,
          })
          .from(progressRecords)
          .innerJoin(
            athletes,
            and(
              eq(athletes.clubId, progressRecords.clubId),
              eq(athletes.id, progressRecords.athleteId),
            ),
          )
          .where(and(eq(progressRecords.clubId, access.clubId), eq(athletes.squadId, squadId)))
  const column = new Map(columns.map((c, i) => [c.elementId, i]))
  const row = new Map(roster.map((a, i) => [a.id, i]))
  const cells: Grid['cells'] = roster.map(() =>
    columns.map(() => ({ step: null, paused: false, flagged: false })),
  )
  for (const r of records) {
    const i = row.get(r.athleteId)
    const j = column.get(r.elementId)
    if (i === undefined || j === undefined) continue
    cells[i]![j] = { step: r.stepIndex, paused: r.paused, flagged: r.flagged }
  }
  return { squad: { id: squad.id, name: squad.name }, athletes: roster, columns, cells }
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
      .innerJoin(
        athletes,
        and(
          eq(athletes.clubId, progressRecords.clubId),
          eq(athletes.id, progressRecords.athleteId),
        ),
      )
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
