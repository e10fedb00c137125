import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BatchPreview } from '../../shared/schemas/progress-batch.ts'
import {
  closeBatchClub,
  newBatchSquad,
  openBatchClub,
  type BatchClub,
} from '../support/batch-club.ts'

// GET /squads/:squadId/progress-batch: the squad logging list, read-only, which the tablet's
// service worker keeps for offline use. It is the dry run's answer with no entries. The rules
// behind the expected records and checks are the product brief's (common practice, no published
// source); the step names, criteria and minimum days are the standard catalogue's.

let club: BatchClub
let director: BatchClub['director']
let coach: BatchClub['coach']
let clinician: BatchClub['clinician']
let base: BatchClub['base']
let tucks: BatchClub['tucks']

beforeAll(async () => {
  club = await openBatchClub('batchlist')
  ;({ director, coach, clinician, base, tucks } = club)
})
afterAll(() => closeBatchClub(club))

const newSquad = (size: number, coached = true) =>
  newBatchSquad(club, size, { coached, givenName: 'Lia', familyName: 'Reed' })

const list = (squadId: string) => `${base}/squads/${squadId}/progress-batch`

async function log(athleteId: string, body: Record<string, unknown>, expectedLastEventId: unknown) {
  const res = await coach
    .post(`${base}/athletes/${athleteId}/events`)
    .send({ elementId: tucks.backTuck, expectedLastEventId, ...body })
    .expect(201)
  return res.body.eventId as string
}

describe('the squad logging list (GET)', () => {
  it('answers the dry run’s list, with each element’s steps and each row’s record', async () => {
    const { squad, athletes } = await newSquad(2)
    const element = (await director.get(`${base}/elements/${tucks.backTuck}`).expect(200)).body
    // Hand-worked history: step 1 on 1 Nov, step 2 on 2 Nov (one day after step 1, whose
    // minimum is 7 days: the entry is flagged), then a lost-skill pause on 3 Nov planning a
    // return to step 1.
    const first = await log(
      athletes[0]!.id,
      { kind: 'step', stepIndex: 0, occurredOn: '2026-11-01' },
      null,
    )
    const second = await log(
      athletes[0]!.id,
      { kind: 'step', stepIndex: 1, occurredOn: '2026-11-02' },
      first,
    )
    const paused = await log(
      athletes[0]!.id,
      { kind: 'pause', pauseReason: 'lost-skill', plannedStepIndex: 0, occurredOn: '2026-11-03' },
      second,
    )

    const got: BatchPreview = (
      await coach
        .get(list(squad.id))
        .query({ elementId: tucks.backTuck, occurredOn: '2026-11-04' })
        .expect(200)
    ).body
    const dryRun: BatchPreview = (
      await coach
        .post(list(squad.id))
        .send({ elementId: tucks.backTuck, occurredOn: '2026-11-04', dryRun: true })
        .expect(200)
    ).body
    expect(got).toEqual(dryRun)

    expect(got.elements).toHaveLength(1)
    expect(got.elements[0]!.steps).toEqual(
      element.steps.map(
        (s: { name: string; criterion: string; minDays: number | null }, index: number) => ({
          index,
          name: s.name,
          criterion: s.criterion,
          // The least days too, for the tablet to work out the checks after an entry kept there.
          minDays: s.minDays,
        }),
      ),
    )
    expect(got.elements[0]!.steps).toHaveLength(got.elements[0]!.stepCount)
    expect(got.rows[0]).toMatchObject({
      athleteId: athletes[0]!.id,
      elementId: tucks.backTuck,
      stepIndex: 1,
      highestStepIndex: 1,
      stepReachedOn: '2026-11-02',
      paused: true,
      pauseReason: 'lost-skill',
      plannedStepIndex: 0,
      lastEventOn: '2026-11-03',
      lastEventId: paused,
      flagged: true,
      nextStep: { index: 2, name: element.steps[2].name, criterion: element.steps[2].criterion },
    })
    expect(got.rows[1]).toMatchObject({
      athleteId: athletes[1]!.id,
      stepIndex: null,
      highestStepIndex: null,
      stepReachedOn: null,
      paused: false,
      pauseReason: null,
      plannedStepIndex: null,
      lastEventOn: null,
      lastEventId: null,
      flagged: false,
      nextStep: { index: 0, name: element.steps[0].name },
      entryIndex: null,
    })
    // The row carries the record as the record endpoint answers it.
    const record = (
      await coach.get(`${base}/athletes/${athletes[0]!.id}/records/${tucks.backTuck}`).expect(200)
    ).body
    for (const field of [
      'stepIndex',
      'highestStepIndex',
      'stepReachedOn',
      'paused',
      'pauseReason',
      'plannedStepIndex',
      'lastEventOn',
      'lastEventId',
      'flagged',
    ])
      expect(got.rows[0]![field as keyof (typeof got.rows)[0]], field).toEqual(record[field])
  })

  it('works out the checks for the day asked, the server’s today when none is', async () => {
    const { squad, athletes } = await newSquad(1)
    await log(athletes[0]!.id, { kind: 'step', stepIndex: 0, occurredOn: '2026-11-01' }, null)
    // Step 1's minimum is 7 days: passing on 2 Nov is early (min-days); any day from 8 Nov on
    // is not, and today is later than that.
    const on = async (query: Record<string, string>) =>
      (
        (await coach.get(list(squad.id)).query(query).expect(200)).body as BatchPreview
      ).rows[0]!.checks.map((c) => c.code)
    expect(await on({ elementId: tucks.backTuck, occurredOn: '2026-11-02' })).toEqual(['min-days'])
    expect(await on({ elementId: tucks.backTuck, occurredOn: '2026-11-08' })).toEqual([])
    expect(await on({ elementId: tucks.backTuck })).toEqual([])
  })

  it('lists the pair, each element with its own steps', async () => {
    const { squad } = await newSquad(2)
    const got: BatchPreview = (
      await coach
        .get(list(squad.id))
        .query({ elementId: tucks.backTuck, counterpartId: tucks.frontTuck })
        .expect(200)
    ).body
    expect(got.elements.map((e) => e.id)).toEqual([tucks.backTuck, tucks.frontTuck])
    const front = (await coach.get(`${base}/elements/${tucks.frontTuck}`).expect(200)).body
    expect(got.elements[1]!.steps.map((s) => s.name)).toEqual(
      front.steps.map((s: { name: string }) => s.name),
    )
    expect(got.rows).toHaveLength(4)
  })

  it('answers bad queries with 400 naming the field, and writes nothing', async () => {
    const { squad } = await newSquad(1)
    const cases: [Record<string, string>, string][] = [
      [{}, 'elementId'],
      [{ elementId: 'tuck' }, 'elementId'],
      [{ elementId: tucks.backTuck, counterpartId: 'mirror' }, 'counterpartId'],
      // Its own id is not its mirror.
      [{ elementId: tucks.backTuck, counterpartId: tucks.backTuck }, 'counterpartId'],
      [{ elementId: tucks.backTuck, occurredOn: '2 Nov' }, 'occurredOn'],
      [{ elementId: tucks.backTuck, occurredOn: '2999-01-01' }, 'occurredOn'],
      [{ elementId: crypto.randomUUID() }, 'elementId'],
    ]
    for (const [query, field] of cases) {
      const res = await coach.get(list(squad.id)).query(query).expect(400)
      expect(res.body.error.issues[0].path, JSON.stringify(query)).toBe(field)
    }
  })

  it('is for the squad’s coaches and directors only', async () => {
    const { squad } = await newSquad(1)
    const { squad: other } = await newSquad(1, false)
    const query = { elementId: tucks.backTuck }
    await director.get(list(other.id)).query(query).expect(200)
    const refused = await coach.get(list(other.id)).query(query).expect(403)
    expect(refused.body.error.message).toBe(`${other.name} is not one of your squads.`)
    await clinician.get(list(squad.id)).query(query).expect(403)
  })
})
