import { describe, expect, it } from 'vitest'
import type { BatchPreview, BatchRow } from '@shared/schemas/progress-batch'
import type { OutboxEntry } from '@/offline/outbox-db'
import { batchOutboxEntry, rowAt, rowRecord, shownRows, type ShownRow } from '@/offline/batchRows'
import { athletes, batchSteps, row as batchRow } from './batch-helpers'
import { clubId, elementId, eventIds, steps } from './progress-helpers'

// The squad logging list as the tablet shows it with entries kept on it. The progression is the
// helpers' back tuck (6 steps; common practice, no published source); every expected row below
// is worked out by hand from the replay rules of the product brief (a step moves the step and
// its date, raises the highest step, keeps a pause and drops its planned step).

const [athlete, other] = athletes as [string, string]
const tabletIds = ['77777777-7777-4777-8777-777777777701', '77777777-7777-4777-8777-777777777702']

// The helpers' athlete 0, named Ada Quill, with a warning the server worked out for its state.
const row = (partial: Partial<BatchRow> = {}): BatchRow =>
  batchRow(0, {
    givenName: 'Ada',
    checks: [{ code: 'min-days', severity: 'warning', message: 'Step 1 is held at least 7 days.' }],
    ...partial,
  })
const shown = (r: BatchRow): ShownRow => ({ ...r, kept: false })
const given = (n: number, occurredOn = '2026-11-04') => ({
  clubId,
  occurredOn,
  clientEventId: tabletIds[n]!,
  skipReason: null,
  elementName: 'Back tuck',
})
const kept = (entry: ReturnType<typeof batchOutboxEntry>, seq: number): OutboxEntry => ({
  ...entry,
  seq,
  madeAt: '2026-11-04T10:00:00Z',
  status: 'waiting',
  refusal: null,
  current: null,
})

describe('batchOutboxEntry', () => {
  it('keeps the next step, expecting the newest event the row shows, with the record it gives', () => {
    const entry = batchOutboxEntry(shown(row()), given(0))
    expect(entry).toEqual({
      clientEventId: tabletIds[0],
      clubId,
      athleteId: athlete,
      athleteName: 'Ada Quill',
      elementName: 'Back tuck',
      input: {
        elementId,
        kind: 'step',
        stepIndex: 1,
        occurredOn: '2026-11-04',
        skipReason: null,
        clientEventId: tabletIds[0],
        expectedLastEventId: eventIds[0],
      },
      // Step 1 (index 0) reached 1 Nov; step 2 passed 4 Nov.
      predicted: {
        athleteId: athlete,
        elementId,
        stepIndex: 1,
        highestStepIndex: 1,
        stepReachedOn: '2026-11-04',
        paused: false,
        pauseReason: null,
        plannedStepIndex: null,
        lastEventOn: '2026-11-04',
        lastEventId: tabletIds[0],
        flagged: false,
      },
    })
  })

  it('gives a first step to an athlete who has not started, and keeps a skip reason', () => {
    const fresh = row({
      stepIndex: null,
      highestStepIndex: null,
      stepReachedOn: null,
      lastEventOn: null,
      lastEventId: null,
      nextStep: { index: 0, name: steps[0]!.name, criterion: steps[0]!.criterion },
    })
    const entry = batchOutboxEntry(shown(fresh), { ...given(0), skipReason: 'Assessed' })
    expect(entry.input).toMatchObject({ stepIndex: 0, expectedLastEventId: null })
    expect(entry.input.skipReason).toBe('Assessed')
    expect(entry.predicted).toMatchObject({
      stepIndex: 0,
      highestStepIndex: 0,
      stepReachedOn: '2026-11-04',
      lastEventOn: '2026-11-04',
    })
  })

  it('refuses a row on the last step', () => {
    expect(() => batchOutboxEntry(shown(row({ stepIndex: 5, nextStep: null })), given(0))).toThrow(
      /last step/,
    )
  })
})

describe('shownRows', () => {
  const preview = (rows: BatchRow[]): BatchPreview => ({
    squad: { id: '55555555-5555-4555-8555-555555555555', name: 'Kites' },
    elements: [
      { id: elementId, name: 'Back tuck', direction: 'backward', stepCount: 6, steps: batchSteps },
    ],
    rows,
  })

  it('leaves a row with nothing kept as the server sent it', () => {
    const list = preview([row()])
    expect(shownRows(list, () => undefined, '2026-11-04')).toEqual([{ ...row(), kept: false }])
  })

  it('moves a row to the state its kept entry gives, naming the step after it', () => {
    const first = kept(batchOutboxEntry(shown(row()), given(0)), 1)
    const [moved, untouched] = shownRows(
      preview([row(), row({ athleteId: other })]),
      (a, e) => (a === athlete && e === elementId ? first : undefined),
      '2026-11-04',
    )
    // Now on step 2 (index 1): step 3, "Hand spot by a coach", is next. The server's check was
    // for step 2 and goes; passing step 3 the same day is worked out here: step 2 is held at
    // least 7 days (the helpers' progression) and was reached today, 0 days ago.
    expect(moved).toMatchObject({
      stepIndex: 1,
      highestStepIndex: 1,
      stepReachedOn: '2026-11-04',
      lastEventId: tabletIds[0],
      nextStep: {
        index: 2,
        name: 'Hand spot by a coach',
        criterion: 'Three in a row with a light spot',
      },
      checks: [
        {
          code: 'min-days',
          severity: 'warning',
          message:
            'Step 2 (Rotation in the spotting rig) is passed after 0 days; its minimum is 7 days.',
        },
      ],
      kept: true,
    })
    expect(untouched).toMatchObject({ athleteId: other, stepIndex: 0, kept: false })
    expect(untouched!.checks).toHaveLength(1)

    // A second entry on the same record expects the first's tablet id and moves one further.
    const second = batchOutboxEntry(moved!, given(1, '2026-11-05'))
    expect(second.input).toMatchObject({ stepIndex: 2, expectedLastEventId: tabletIds[0] })
    const [again] = shownRows(preview([row()]), () => kept(second, 2), '2026-11-05')
    expect(again).toMatchObject({
      stepIndex: 2,
      highestStepIndex: 2,
      stepReachedOn: '2026-11-05',
      lastEventOn: '2026-11-05',
      lastEventId: tabletIds[1],
      nextStep: { index: 3, name: 'Into the foam pit' },
    })
  })

  it('keeps a pause through a kept step and drops its planned step-down', () => {
    const paused = row({
      stepIndex: 3,
      highestStepIndex: 3,
      paused: true,
      pauseReason: 'lost-skill',
      plannedStepIndex: 1,
      nextStep: { index: 4, name: steps[4]!.name, criterion: steps[4]!.criterion },
    })
    const entry = kept(batchOutboxEntry(shown(paused), given(0)), 1)
    const [moved] = shownRows(preview([paused]), () => entry, '2026-11-04')
    expect(moved).toMatchObject({
      stepIndex: 4,
      highestStepIndex: 4,
      paused: true,
      pauseReason: 'lost-skill',
      plannedStepIndex: null,
      nextStep: { index: 5, name: 'In a competition routine' },
    })
  })

  it('shows nothing further to pass once a kept entry reaches the last step', () => {
    const nearTop = row({
      stepIndex: 4,
      highestStepIndex: 4,
      nextStep: { index: 5, name: steps[5]!.name, criterion: steps[5]!.criterion },
    })
    const entry = kept(batchOutboxEntry(shown(nearTop), given(0)), 1)
    const [top] = shownRows(preview([nearTop]), () => entry, '2026-11-04')
    expect(top).toMatchObject({ stepIndex: 5, nextStep: null, kept: true })
  })
})

describe('the checks of a row an entry kept on the tablet decides', () => {
  const list = (rows: BatchRow[]): BatchPreview => ({
    squad: { id: '55555555-5555-4555-8555-555555555555', name: 'Kites' },
    elements: [
      { id: elementId, name: 'Back tuck', direction: 'backward', stepCount: 6, steps: batchSteps },
    ],
    rows,
  })
  const prerequisite = {
    code: 'prerequisite' as const,
    severity: 'warning' as const,
    message: 'Prerequisite not met: Back walkover should be at step 3 or higher (now at step 1).',
  }

  it('warns of an early pass only before the step has been held its least days', () => {
    // Step 2 (held at least 7 days) reached on 4 November by the kept entry: passing step 3 on
    // 10 November is 6 days on, early; on 11 November, 7 days on, it is not.
    const entry = kept(batchOutboxEntry(shown(row()), given(0)), 1)
    const [early] = shownRows(list([row()]), () => entry, '2026-11-10')
    expect(early!.checks).toEqual([
      {
        code: 'min-days',
        severity: 'warning',
        message:
          'Step 2 (Rotation in the spotting rig) is passed after 6 days; its minimum is 7 days.',
      },
    ])
    const [onTime] = shownRows(list([row()]), () => entry, '2026-11-11')
    expect(onTime!.checks).toEqual([])
  })

  it('keeps the server’s prerequisite warning, which is about the element, not the step', () => {
    const withPrerequisite = row({ checks: [prerequisite] })
    const entry = kept(batchOutboxEntry(shown(withPrerequisite), given(0)), 1)
    const [moved] = shownRows(list([withPrerequisite]), () => entry, '2026-11-20')
    expect(moved!.checks).toEqual([prerequisite])
  })

  it('works out nothing on a state the tablet only guesses: a correction, a refused entry', () => {
    const entry = kept(batchOutboxEntry(shown(row()), given(0)), 1)
    const refused = { ...entry, status: 'refused' as const, refusal: 'Someone logged first.' }
    expect(shownRows(list([row()]), () => refused, '2026-11-04')[0]!.checks).toEqual([])
    const correction = { ...entry, input: { ...entry.input, correctsEventId: eventIds[0]! } }
    expect(shownRows(list([row()]), () => correction, '2026-11-04')[0]!.checks).toEqual([])
  })

  it('names no least days for a list kept before they were sent with it', () => {
    const older = list([row()])
    older.elements[0]!.steps = batchSteps.map(({ minDays: _m, ...step }) => step)
    const entry = kept(batchOutboxEntry(shown(row()), given(0)), 1)
    expect(shownRows(older, () => entry, '2026-11-04')[0]!.checks).toEqual([])
  })
})

describe('rowAt and rowRecord', () => {
  it('carry the record both ways: a row takes the record the server answered', () => {
    const record = {
      ...rowRecord(row()),
      stepIndex: 2,
      highestStepIndex: 2,
      lastEventId: eventIds[1]!,
    }
    const after = rowAt(row(), batchSteps, record)
    expect(rowRecord(after)).toEqual(record)
    expect(after.nextStep).toEqual({
      index: 3,
      name: 'Into the foam pit',
      criterion: steps[3]!.criterion,
    })
    expect(after).toMatchObject({ givenName: 'Ada', familyName: 'Quill', entryIndex: null })
  })
})
