import { and, eq, inArray } from 'drizzle-orm'
import {
  checkEvent,
  type CheckResult,
  type PrerequisiteStatus,
  type ProgressRecord,
  type ProposedEvent,
} from '../../shared/domain/progress.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { progressEvents, progressRecords } from '../db/schema-athletes.ts'
import { elementPrerequisites, elements } from '../db/schema-catalogue.ts'
import { AppError } from '../http/errors.ts'
import type { ElementContext, EventRow } from './progress-records.ts'

// What every new event goes through, one entry or a squad's batch: the checks before saving,
// the reason a skip needs, and the tablet's entry id that makes a retry harmless.

/** Each athlete's standing on the element's prerequisites, by athlete id. */
export async function prerequisiteStatuses(
  db: DbOrTx,
  clubId: string,
  athleteIds: string[],
  elementId: string,
): Promise<Map<string, PrerequisiteStatus[]>> {
  const result = new Map<string, PrerequisiteStatus[]>(athleteIds.map((id) => [id, []]))
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
  if (rows.length === 0 || athleteIds.length === 0) return result
  const records = await db
    .select({
      athleteId: progressRecords.athleteId,
      elementId: progressRecords.elementId,
      stepIndex: progressRecords.stepIndex,
    })
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, clubId),
        inArray(progressRecords.athleteId, athleteIds),
        inArray(
          progressRecords.elementId,
          rows.map((r) => r.requiresElementId),
        ),
      ),
    )
  for (const athleteId of athleteIds) {
    result.set(
      athleteId,
      rows.map((r) => ({
        elementName: r.elementName,
        requiredStepIndex: r.requiredStepIndex,
        athleteStepIndex:
          records.find((x) => x.athleteId === athleteId && x.elementId === r.requiresElementId)
            ?.stepIndex ?? null,
      })),
    )
  }
  return result
}

/** How many steps a lost skill steps down in this club. */
export async function clubStepDown(db: DbOrTx, clubId: string) {
  const [club] = await db
    .select({ stepDown: clubs.lostSkillStepDown })
    .from(clubs)
    .where(eq(clubs.id, clubId))
  return club?.stepDown
}

/** The checks of a proposed event against the record as it stands. */
export function entryChecks(
  current: Pick<ProgressRecord, 'stepIndex' | 'stepReachedOn'>,
  proposed: ProposedEvent,
  element: ElementContext,
  prerequisites: PrerequisiteStatus[],
  lostSkillStepDown: number | undefined,
): CheckResult[] {
  return checkEvent(current, proposed, {
    steps: element.steps.map((s) => ({
      name: s.name,
      ...(s.minDays === null ? {} : { minDays: s.minDays }),
    })),
    reachedCurrentStepOn: current.stepReachedOn,
    prerequisites,
    lostSkillStepDown,
  })
}

/** A skip without a reason is refused, naming the field (`skipReason`, `entries.3.skipReason`). */
export function assertReasonGiven(checks: CheckResult[], path: string) {
  const needsReason = checks.find((c) => c.severity === 'requires-reason')
  if (needsReason) {
    throw new AppError(400, 'reason_required', needsReason.message, [
      { path, message: needsReason.message },
    ])
  }
}

/** Skips, early passes and unmet prerequisites stay visible on the record. */
export const isFlagged = (checks: CheckResult[]) =>
  checks.some((c) => c.code !== 'lost-skill-step-down')

/** Events already stored under these client ids, by client id. */
export async function storedByClientId(db: DbOrTx, clubId: string, clientIds: string[]) {
  if (clientIds.length === 0) return new Map<string, EventRow>()
  const rows = await db
    .select()
    .from(progressEvents)
    .where(and(eq(progressEvents.clubId, clubId), inArray(progressEvents.clientEventId, clientIds)))
  return new Map(rows.map((r) => [r.clientEventId!, r]))
}

/** What a repeat of an entry must name again for its client id to stand for the same entry. */
export interface EntryIdentity {
  athleteId: string
  elementId: string
  kind: 'step' | 'pause' | 'resume'
  stepIndex?: number | null
  pauseReason?: string | null
  occurredOn: string
  note?: string | null
  skipReason?: string | null
  correctsEventId?: string | null
}

/**
 * A client id already stored with another entry is refused (409): the tablet made the same id
 * twice, or someone reused it. `stepIndex` is compared when the repeat names one.
 */
export function assertSameEntry(row: EventRow, entry: EntryIdentity, path: string) {
  const same =
    row.athleteId === entry.athleteId &&
    row.elementId === entry.elementId &&
    row.kind === entry.kind &&
    (entry.stepIndex === undefined || entry.stepIndex === null
      ? true
      : row.stepIndex === entry.stepIndex) &&
    (row.pauseReason ?? null) === (entry.pauseReason ?? null) &&
    row.occurredOn === entry.occurredOn &&
    (row.note ?? null) === (entry.note ?? null) &&
    (row.skipReason ?? null) === (entry.skipReason ?? null) &&
    (row.correctsEventId ?? null) === (entry.correctsEventId ?? null)
  if (!same) {
    throw new AppError(
      409,
      'client_event_reused',
      'This entry’s id was already used for a different entry (another athlete, element or change). Make a new entry.',
      [{ path, message: 'Already used for a different entry.' }],
    )
  }
}

/** True for the unique violation of a client id stored twice at once. */
export function isClientIdRace(err: unknown): boolean {
  for (let e = err; e instanceof Error; e = e.cause) {
    const pgError = e as Error & { code?: string; constraint?: string }
    if (pgError.code === '23505' && pgError.constraint === 'progress_events_client_event_idx')
      return true
  }
  return false
}
