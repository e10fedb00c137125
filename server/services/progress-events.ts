import { and, eq } from 'drizzle-orm'
import { replayRecord, type CheckResult, type ProposedEvent } from '../../shared/domain/progress.ts'
import type { EventResult, ProgressEventInput } from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { progressEvents, progressRecords } from '../db/schema-athletes.ts'
import { AppError, conflict } from '../http/errors.ts'
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
  eventRows,
  lockElements,
  recompute,
  recordView,
  toDomainEvent,
  type ElementContext,
  type EventRow,
} from './progress-records.ts'
import { athleteInScope } from './scope.ts'

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
  const prerequisites = await prerequisiteStatuses(db, access.clubId, [athleteId], input.elementId)
  const checks = entryChecks(
    current,
    proposed,
    element,
    prerequisites.get(athleteId) ?? [],
    await clubStepDown(db, access.clubId),
  )
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
 * The answer for an entry whose client id is already stored: the same entry gets the stored
 * event and the record as it stands now; another entry under that id gets 409.
 */
async function replayed(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
  stored: EventRow,
): Promise<EventResult> {
  assertSameEntry(stored, { ...input, athleteId }, 'clientEventId')
  const [record] = await db
    .select()
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, access.clubId),
        eq(progressRecords.athleteId, athleteId),
        eq(progressRecords.elementId, input.elementId),
      ),
    )
  return {
    eventId: stored.id,
    record: recordView(record, athleteId, input.elementId),
    checks: stored.checks as CheckResult[],
    replayed: true,
  }
}

/**
 * Appends one event to an athlete's record, with its checks, and rebuilds the record, in one
 * transaction holding the record's row lock. A writer who saw an older state gets 409 with the
 * current record, and nothing of theirs is written. An entry whose `clientEventId` is already
 * stored is not written again: the answer is the stored event's (`replayed`), also when two
 * copies arrive at once (the second waits for the record's lock, or meets the unique index).
 */
export async function recordEvent(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
): Promise<EventResult> {
  try {
    return await appendEvent(db, access, athleteId, input)
  } catch (err) {
    if (!input.clientEventId || !isClientIdRace(err)) throw err
    const stored = await storedByClientId(db, access.clubId, [input.clientEventId])
    return replayed(db, access, athleteId, input, stored.get(input.clientEventId)!)
  }
}

async function appendEvent(
  db: DbOrTx,
  access: ClubAccess,
  athleteId: string,
  input: ProgressEventInput,
): Promise<EventResult> {
  return db.transaction(async (tx) => {
    await athleteInScope(tx, access, athleteId, 'write')
    // Before anything of the element is read: a steps change waits, or is waited for.
    await lockElements(tx, access.clubId, [input.elementId])
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
    // Read after the lock: a copy that held it has committed by now.
    if (input.clientEventId) {
      const stored = await storedByClientId(tx, access.clubId, [input.clientEventId])
      const row = stored.get(input.clientEventId)
      if (row) return replayed(tx, access, athleteId, input, row)
    }
    if ((locked?.lastEventId ?? null) !== input.expectedLastEventId) {
      throw conflict(
        'Someone else has just changed this record. Here is where it stands now; check it and try again.',
        {
          record: recordView(locked, athleteId, input.elementId),
        },
      )
    }
    const { element, checks, plannedStepIndex } = await evaluate(tx, access, athleteId, input)
    assertReasonGiven(checks, 'skipReason')
    const [event] = await tx
      .insert(progressEvents)
      .values({
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
        flagged: isFlagged(checks),
        clientEventId: input.clientEventId ?? null,
      })
      .returning({ id: progressEvents.id })
    const record = await recompute(tx, access.clubId, athleteId, element)
    return { eventId: event!.id, record, checks, replayed: false }
  })
}
