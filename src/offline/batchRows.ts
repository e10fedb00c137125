import { checkEvent, type CheckResult } from '@shared/domain/progress'
import type { BatchPreview, BatchRow } from '@shared/schemas/progress-batch'
import type { ProgressEventInput, RecordView } from '@shared/schemas/progress'
import type { OutboxEntry } from './outbox-db'
import { predictRecord } from './predict'

// The squad logging list as the tablet shows it: the server's rows, moved on by the entries
// still kept on the tablet, and the entries a batch keeps there when it cannot be sent at once.

export type BatchStep = BatchPreview['elements'][number]['steps'][number]

/** A row of the list as shown: `kept` when an entry still on the tablet decides its state. */
export type ShownRow = BatchRow & { kept: boolean }

/** The record a row carries (RecordView), to foresee what an entry will make of it. */
export function rowRecord(row: BatchRow): RecordView {
  return {
    athleteId: row.athleteId,
    elementId: row.elementId,
    stepIndex: row.stepIndex,
    highestStepIndex: row.highestStepIndex,
    stepReachedOn: row.stepReachedOn,
    paused: row.paused,
    pauseReason: row.pauseReason,
    plannedStepIndex: row.plannedStepIndex,
    lastEventOn: row.lastEventOn,
    lastEventId: row.lastEventId,
    flagged: row.flagged,
  }
}

/**
 * The checks passing `next` on `occurredOn` will run, as far as the tablet can tell: those of
 * the step (the same rules the server runs, shared/domain/progress.ts), and the server's
 * prerequisite warnings for the row, which are about the element, not the step, and stand until
 * the list is read again. The server runs them all again when the entry is sent.
 */
function checksAt(
  row: BatchRow,
  steps: BatchStep[],
  record: RecordView,
  next: BatchStep,
  occurredOn: string,
): CheckResult[] {
  const ofStep = checkEvent(
    { stepIndex: record.stepIndex },
    { kind: 'step', stepIndex: next.index, occurredOn },
    {
      steps: steps.map((s) => ({
        name: s.name,
        ...(s.minDays == null ? {} : { minDays: s.minDays }),
      })),
      reachedCurrentStepOn: record.stepReachedOn,
    },
  )
  return [...ofStep, ...row.checks.filter((c) => c.code === 'prerequisite')]
}

/**
 * The row once its record stands at `record`: the step after the record's (the first when it
 * has none) becomes the next step, none at the top, with the checks passing it on `occurredOn`
 * will run (none without a day).
 */
export function rowAt(
  row: BatchRow,
  steps: BatchStep[],
  record: RecordView,
  occurredOn?: string,
): BatchRow {
  const next = steps[(record.stepIndex ?? -1) + 1]
  const { athleteId: _a, elementId: _e, ...state } = record
  return {
    ...row,
    ...state,
    nextStep: next ? { index: next.index, name: next.name, criterion: next.criterion } : null,
    checks: next && occurredOn ? checksAt(row, steps, record, next, occurredOn) : [],
  }
}

/**
 * Every row as the tablet shows it, given the newest kept entry on each record, with the checks
 * of passing the next step on `occurredOn`.
 */
export function shownRows(
  preview: BatchPreview,
  latestFor: (athleteId: string, elementId: string) => OutboxEntry | undefined,
  occurredOn: string,
): ShownRow[] {
  const steps = new Map(preview.elements.map((e) => [e.id, e.steps]))
  return preview.rows.map((row) => {
    const kept = latestFor(row.athleteId, row.elementId)
    if (!kept) return { ...row, kept: false }
    // A correction leaves the record as it was until the server replays it, and a refused entry
    // waits for the coach: the state shown is a guess, so no check is worked out on it.
    const guess = kept.status === 'refused' || Boolean(kept.input.correctsEventId)
    const day = guess ? undefined : occurredOn
    return { ...rowAt(row, steps.get(row.elementId) ?? [], kept.predicted, day), kept: true }
  })
}

/**
 * The outbox entry of a ticked row: its next step, expecting the newest event the row shows
 * (a kept entry's tablet id while one is kept, rewritten to the server's when that is sent),
 * with the record it will give.
 */
export function batchOutboxEntry(
  row: ShownRow,
  given: {
    clubId: string
    occurredOn: string
    clientEventId: string
    skipReason: string | null
    elementName: string
  },
): Omit<OutboxEntry, 'seq' | 'status' | 'refusal' | 'current' | 'madeAt'> {
  if (!row.nextStep) throw new Error('This athlete is on the last step already.')
  const input: ProgressEventInput & { clientEventId: string } = {
    elementId: row.elementId,
    kind: 'step',
    stepIndex: row.nextStep.index,
    occurredOn: given.occurredOn,
    skipReason: given.skipReason,
    clientEventId: given.clientEventId,
    expectedLastEventId: row.lastEventId,
  }
  return {
    clientEventId: given.clientEventId,
    clubId: given.clubId,
    athleteId: row.athleteId,
    athleteName: `${row.givenName} ${row.familyName}`,
    elementName: given.elementName,
    input,
    predicted: predictRecord(rowRecord(row), input),
  }
}
