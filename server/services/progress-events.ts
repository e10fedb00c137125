import { and, eq, inArray } from 'drizzle-orm'
import {
  checkEvent,
  replayRecord,
  type CheckResult,
  type PrerequisiteStatus,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'
import type { EventResult, ProgressEventInput } from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import {
  clubs,
  elementPrerequisites,
  elements,
  progressEvents,
  progressRecords,
} from '../db/schema.ts'
import { AppError, conflict } from '../http/errors.ts'
import {
  elementContext,
  eventRows,
  recompute,
  recordView,
  toDomainEvent,
  type ElementContext,
  type EventRow,
} from './progress-records.ts'
import { athleteInScope } from './scope.ts'

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
