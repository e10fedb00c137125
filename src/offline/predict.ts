import type { ProgressEventInput, RecordView } from '@shared/schemas/progress'

/**
 * The record as it will stand once an entry kept on the tablet is stored, following the replay
 * rules of `replayRecord` (shared/domain/progress.ts) for one event added after the others: a
 * step moves the step (keeping a pause, dropping its planned step-down), a pause records its
 * reason and planned step, a resume applies a planned step-down below the current step. The
 * newest event is the entry itself, by its tablet id, until the server names it. A correction
 * cannot be foreseen without the history, so it leaves the record as it is. The flag is the
 * server's to raise.
 */
export function predictRecord(
  before: RecordView,
  entry: ProgressEventInput & { clientEventId: string },
): RecordView {
  const next: RecordView = {
    ...before,
    lastEventId: entry.clientEventId,
    lastEventOn:
      before.lastEventOn && before.lastEventOn > entry.occurredOn
        ? before.lastEventOn
        : entry.occurredOn,
  }
  if (entry.correctsEventId) return next
  const moveTo = (stepIndex: number) => {
    if (next.stepIndex === stepIndex) return
    next.stepIndex = stepIndex
    next.stepReachedOn = entry.occurredOn
    next.highestStepIndex = Math.max(next.highestStepIndex ?? stepIndex, stepIndex)
  }
  if (entry.kind === 'step' && entry.stepIndex !== null && entry.stepIndex !== undefined) {
    moveTo(entry.stepIndex)
    next.plannedStepIndex = null
  } else if (entry.kind === 'pause') {
    next.paused = true
    next.pauseReason = entry.pauseReason ?? null
    next.plannedStepIndex = entry.plannedStepIndex ?? null
  } else if (entry.kind === 'resume' && before.paused) {
    if (
      next.plannedStepIndex !== null &&
      next.stepIndex !== null &&
      next.plannedStepIndex < next.stepIndex
    )
      moveTo(next.plannedStepIndex)
    next.paused = false
    next.pauseReason = null
    next.plannedStepIndex = null
  }
  return next
}

/** A new id for an entry, made on the tablet (a version 4 UUID). */
export function newEntryId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID()
  const b = crypto.getRandomValues(new Uint8Array(16))
  b[6] = (b[6]! & 0x0f) | 0x40
  b[8] = (b[8]! & 0x3f) | 0x80
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('')
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`
}
