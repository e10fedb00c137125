import { flushPromises, type VueWrapper } from '@vue/test-utils'
import { NCheckbox } from 'naive-ui'
import type { BatchPreview, BatchRow } from '@shared/schemas/progress-batch'
import { elementId, eventIds, steps, wait } from './progress-helpers'

// The squad batch panel's tests: a squad of three and rows on the helpers' back tuck progression
// (6 steps; common practice, no published source).

export const squadId = '55555555-5555-4555-8555-555555555555'
export const athletes = [
  '66666666-6666-4666-8666-666666666601',
  '66666666-6666-4666-8666-666666666602',
  '66666666-6666-4666-8666-666666666603',
]
export const batchSteps = steps.map((s, index) => ({
  index,
  name: s.name,
  criterion: s.criterion,
  minDays: s.minDays,
}))

/** Athlete `i` at the first step since 1 November, next the second. */
export const row = (i: number, partial: Partial<BatchRow> = {}): BatchRow => ({
  athleteId: athletes[i]!,
  givenName: `Ada ${i}`,
  familyName: 'Quill',
  elementId,
  stepIndex: 0,
  highestStepIndex: 0,
  stepReachedOn: '2026-11-01',
  paused: false,
  pauseReason: null,
  plannedStepIndex: null,
  lastEventOn: '2026-11-01',
  lastEventId: eventIds[0]!,
  flagged: false,
  nextStep: { index: 1, name: steps[1]!.name, criterion: steps[1]!.criterion },
  checks: [],
  entryIndex: null,
  ...partial,
})

export const preview = (rows: BatchRow[]): BatchPreview => ({
  squad: { id: squadId, name: 'Kites' },
  elements: [
    { id: elementId, name: 'Back tuck', direction: 'backward', stepCount: 6, steps: batchSteps },
  ],
  rows,
})

export const byTest = (name: string) => [
  ...document.querySelectorAll<HTMLElement>(`[data-test="${name}"]`),
]
export async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}
export const checkbox = (wrapper: VueWrapper, i: number) => wrapper.findAllComponents(NCheckbox)[i]!
export const save = () => byTest('batch-save')[0] as HTMLButtonElement
