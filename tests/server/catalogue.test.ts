import { and, count, eq } from 'drizzle-orm'
import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { progressEvents } from '../../server/db/schema-athletes.ts'
import { elements, elementStepMaps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import type { CatalogueElement } from '../../shared/schemas/elements.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let base: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'catalogue')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  base = `/api/clubs/${fx.club.id}`
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const list = async (query = '') =>
  (await coach.get(`${base}/elements${query}`).expect(200)).body as CatalogueElement[]
const find = (
  all: CatalogueElement[],
  apparatus: string,
  direction: string,
  q: number,
  twists: number[],
  shape: string,
) =>
  all.find(
    (e) =>
      e.apparatus === apparatus &&
      e.direction === direction &&
      e.quarterRotations === q &&
      e.twists.join() === twists.join() &&
      e.shape === shape,
  )

describe('the standard catalogue of a new club', () => {
  it('holds at least 80 elements in both directions on floor, tumbling and trampoline, with the derived fields', async () => {
    const all = await list()
    expect(all.length).toBeGreaterThanOrEqual(80)
    expect(new Set(all.map((e) => e.apparatus))).toEqual(
      new Set(['floor', 'tumbling', 'trampoline']),
    )
    const backTuck = find(all, 'trampoline', 'backward', 4, [0], 'tuck')!
    // FIG Trampoline Code of Points 2005: back somersault tuck 0.5, notation 40o
    expect(backTuck).toMatchObject({
      notation: '40o',
      trampolineDifficulty: 0.5,
      rotationClass: 'single',
      twistBand: 'none',
    })
    for (const key of [
      'direction',
      'quarterRotations',
      'twists',
      'shape',
      'notation',
      'trampolineDifficulty',
      'rotationClass',
      'twistBand',
      'counterpartId',
    ]) {
      expect(backTuck).toHaveProperty(key)
    }
  })

  it('finds counterparts: double back tuck ↔ double front tuck, full-in ↔ the forward [2, 0], none for sideward', async () => {
    const all = await list()
    const doubleBack = find(all, 'floor', 'backward', 8, [0, 0], 'tuck')!
    const doubleFront = find(all, 'floor', 'forward', 8, [0, 0], 'tuck')!
    expect(doubleBack.counterpartId).toBe(doubleFront.id)
    expect(doubleFront.counterpartId).toBe(doubleBack.id)
    const fullInBack = find(all, 'floor', 'backward', 8, [2, 0], 'tuck')!
    const fullInFront = find(all, 'floor', 'forward', 8, [2, 0], 'tuck')!
    expect(fullInBack.counterpartId).toBe(fullInFront.id)
    const sideward = all.filter((e) => e.direction === 'sideward')
    expect(sideward.length).toBeGreaterThan(0)
    for (const e of sideward) expect(e.counterpartId).toBeNull()
  })

  it('filters by apparatus, direction, rotation class, twist band and shape, and searches', async () => {
    const doubles = await list(
      '?apparatus=floor&direction=backward&rotationClass=double&twistBand=none&shape=pike',
    )
    expect(doubles.map((e) => [e.quarterRotations, e.twists, e.shape])).toEqual([
      [8, [0, 0], 'pike'],
    ])
    const byNotation = await list('?q=801o')
    expect(byNotation.length).toBeGreaterThan(0)
    expect(byNotation.every((e) => e.notation === '801o')).toBe(true)
  })
})

describe('creating elements', () => {
  const sideSalto = {
    name: 'Side salto tuck',
    apparatus: 'floor',
    direction: 'sideward',
    quarterRotations: 4,
    twists: [0],
    shape: 'tuck',
    takeOff: 'standing',
  }

  it('names the field of every refusal', async () => {
    const res = await director
      .post(`${base}/elements`)
      .send({ ...sideSalto, name: 'Bad', quarterRotations: 8, twists: [0] })
    expect(res.status).toBe(400)
    expect(res.body.error.issues).toEqual([
      { path: 'twists', message: 'A double salto needs 2 twist entries, one per salto (got 1).' },
    ])
    const letter = await director
      .post(`${base}/elements`)
      .send({ ...sideSalto, name: 'Letter', apparatus: 'trampoline', difficultyLetter: 'C' })
    expect(letter.body.error.issues[0].path).toBe('difficultyLetter')
    const range = await director
      .post(`${base}/elements`)
      .send({ ...sideSalto, name: 'Range', quarterRotations: 40 })
    expect(range.body.error.issues[0].path).toBe('quarterRotations')
  })

  it('refuses a second element with the same description, pointing at the existing one', async () => {
    const all = await list()
    const existing = find(all, 'floor', 'backward', 4, [0], 'tuck')!
    const res = await director.post(`${base}/elements`).send({
      name: 'Another back tuck',
      apparatus: 'floor',
      direction: 'backward',
      quarterRotations: 4,
      twists: [0],
      shape: 'tuck',
      takeOff: 'round-off',
    })
    expect(res.status).toBe(409)
    expect(res.body.error.code).toBe('duplicate_description')
    expect(res.body.error.existingId).toBe(existing.id)
  })

  it('refuses a name already used on the apparatus', async () => {
    const all = await list()
    const taken = all.find((e) => e.apparatus === 'floor')!
    const res = await director.post(`${base}/elements`).send({
      ...sideSalto,
      name: taken.name.toUpperCase(),
      quarterRotations: 12,
      twists: [0, 0, 0],
    })
    expect(res.status).toBe(409)
    expect(res.body.error.issues[0]).toMatchObject({ path: 'name' })
  })

  it('creates an element with its progression from the template, and shows it as a gap until its mirror exists', async () => {
    const created = await director.post(`${base}/elements`).send({
      name: 'Double back layout, 1½ out',
      apparatus: 'floor',
      direction: 'backward',
      quarterRotations: 8,
      twists: [0, 3],
      shape: 'straight',
      takeOff: 'round-off',
    })
    expect(created.status).toBe(201)
    // FIG Trampoline Code of Points 2005 formula: 8 quarters 0.8 + 2 saltos 0.2 + 3 half twists 0.3 + 0.2 straight double = 1.5
    expect(created.body).toMatchObject({
      notation: '803/',
      trampolineDifficulty: 1.5,
      counterpartId: null,
      twistBand: 'more',
    })
    const detail = (await coach.get(`${base}/elements/${created.body.id}`).expect(200)).body
    expect(detail.steps.length).toBeGreaterThan(2)
    expect(detail.steps.at(-1).modality).toBe('routine')

    const mirror = await director.post(`${base}/elements`).send({
      name: 'Double front layout, 1½ out',
      apparatus: 'floor',
      direction: 'forward',
      quarterRotations: 8,
      twists: [0, 3],
      shape: 'straight',
      takeOff: 'punch',
    })
    expect(mirror.body.counterpartId).toBe(created.body.id)
    const again = (await coach.get(`${base}/elements/${created.body.id}`).expect(200)).body
    expect(again.counterpartId).toBe(mirror.body.id)

    // Deleting the mirror turns the element back into a catalogue gap.
    await director.delete(`${base}/elements/${mirror.body.id}`).expect(204)
    const after = (await coach.get(`${base}/elements/${created.body.id}`).expect(200)).body
    expect(after.counterpartId).toBeNull()
  })

  it('lets only directors write', async () => {
    await coach.post(`${base}/elements`).send(sideSalto).expect(403)
  })
})

describe('prerequisites', () => {
  it('stores them and refuses a cycle, naming it', async () => {
    const all = await list('?apparatus=trampoline&direction=backward')
    const single = find(all, 'trampoline', 'backward', 4, [0], 'tuck')!
    const double = find(all, 'trampoline', 'backward', 8, [0, 0], 'tuck')!
    const triple = find(all, 'trampoline', 'backward', 12, [0, 0, 0], 'tuck')!
    await director
      .put(`${base}/elements/${double.id}/prerequisites`)
      .send({ prerequisites: [{ elementId: single.id, stepIndex: 2 }] })
      .expect(200)
    const detail = (
      await director
        .put(`${base}/elements/${triple.id}/prerequisites`)
        .send({ prerequisites: [{ elementId: double.id, stepIndex: 1 }] })
        .expect(200)
    ).body
    expect(detail.prerequisites).toEqual([
      expect.objectContaining({ elementId: double.id, stepIndex: 1, name: double.name }),
    ])

    const cycle = await director
      .put(`${base}/elements/${single.id}/prerequisites`)
      .send({ prerequisites: [{ elementId: triple.id, stepIndex: 0 }] })
    expect(cycle.status).toBe(400)
    expect(cycle.body.error.code).toBe('prerequisite_cycle')
    expect(cycle.body.error.message).toBe(
      `These prerequisites would go round in a circle: ${single.name} → ${triple.name} → ${double.name} → ${single.name}.`,
    )
  })

  it('refuses a step the required element does not have', async () => {
    const [a, b] = await list('?apparatus=tumbling')
    const res = await director
      .put(`${base}/elements/${a!.id}/prerequisites`)
      .send({ prerequisites: [{ elementId: b!.id, stepIndex: 99 }] })
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('prerequisites.0.stepIndex')
  })
})

describe('records on an element', () => {
  async function withRecord() {
    const element = (
      await director
        .post(`${base}/elements`)
        .send({
          name: `Tested ${Math.random()}`,
          apparatus: `tested-${Date.now()}`,
          direction: 'backward',
          quarterRotations: 4,
          twists: [0],
          shape: 'pike',
          takeOff: 'standing',
        })
        .expect(201)
    ).body as CatalogueElement
    const athlete = await createAthlete(database.db, fx.club.id, {
      givenName: 'Ada',
      familyName: 'Ashcombe',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    await database.db.insert(progressEvents).values({
      clubId: fx.club.id,
      athleteId: athlete.id,
      elementId: element.id,
      kind: 'step',
      stepIndex: 1,
      stepsVersion: 1,
      occurredOn: '2026-10-01',
      coachId: fx.people.coach.id,
    })
    return element
  }

  it('refuses to delete an element while athletes have records on it', async () => {
    const element = await withRecord()
    const res = await director.delete(`${base}/elements/${element.id}`)
    expect(res.status).toBe(409)
    expect(res.body.error.code).toBe('has_records')
    expect(res.body.error.message).toMatch(/1 athlete has records/)
    const [row] = await database.db
      .select({ n: count() })
      .from(elements)
      .where(eq(elements.id, element.id))
    expect(row!.n).toBe(1)
  })

  it('asks where each old step goes before changing a progression athletes are on, and keeps the mapping', async () => {
    const element = await withRecord()
    const detail = (await director.get(`${base}/elements/${element.id}`).expect(200)).body
    const steps = [
      { name: 'Drills', modality: 'floor-drill', criterion: 'Shapes held for 5 s.' },
      { name: 'In a routine', modality: 'routine', criterion: 'Twice in a routine.' },
    ]
    const { stepsVersion } = detail
    const refused = await director
      .put(`${base}/elements/${element.id}/steps`)
      .send({ steps, stepsVersion })
    expect(refused.status).toBe(409)
    expect(refused.body.error.code).toBe('steps_need_mapping')
    expect(refused.body.error.currentSteps).toHaveLength(detail.steps.length)

    const short = await director
      .put(`${base}/elements/${element.id}/steps`)
      .send({ steps, mapping: [0], stepsVersion })
    expect(short.status).toBe(400)

    const mapping = detail.steps.map((_: unknown, i: number) => (i < 2 ? 0 : 1))
    const saved = await director
      .put(`${base}/elements/${element.id}/steps`)
      .send({ steps, mapping, stepsVersion })
      .expect(200)
    expect(saved.body.stepsVersion).toBe(stepsVersion + 1)
    expect(saved.body.steps.map((s: { name: string }) => s.name)).toEqual([
      'Drills',
      'In a routine',
    ])
    const maps = await database.db
      .select()
      .from(elementStepMaps)
      .where(and(eq(elementStepMaps.clubId, fx.club.id), eq(elementStepMaps.elementId, element.id)))
    expect(maps).toEqual([expect.objectContaining({ fromVersion: 1, mapping })])
    // the recorded event itself is untouched
    const events = await database.db
      .select()
      .from(progressEvents)
      .where(eq(progressEvents.elementId, element.id))
    expect(events[0]).toMatchObject({ stepIndex: 1, stepsVersion: 1 })
  })
})

describe('CSV import and export', () => {
  const header =
    'name,apparatus,direction,quarterRotations,twists,shape,takeOff,difficultyLetter,notes'

  const rowsOf = (csv: string) =>
    Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true }).data

  it('saves nothing when one row is bad, and names the row and field', async () => {
    const before = (await list()).length
    const csv = [
      header,
      'Back tuck,double-mini,backward,4,0,tuck,punch,,',
      'Broken,floor,backward,8,0,tuck,standing,,',
    ].join('\n')
    const dry = await director
      .post(`${base}/elements/import`)
      .send({ rows: rowsOf(csv), dryRun: true })
      .expect(200)
    expect(dry.body).toEqual({
      valid: false,
      created: 0,
      errors: [
        {
          row: 2,
          field: 'twists',
          message: 'A double salto needs 2 twist entries, one per salto (got 1).',
        },
      ],
    })
    const real = await director
      .post(`${base}/elements/import`)
      .send({ rows: rowsOf(csv), dryRun: false })
    expect(real.status).toBe(422)
    expect(real.body.error.code).toBe('invalid_rows')
    expect((await list()).length).toBe(before)
  })

  it('refuses rows that repeat the catalogue or each other', async () => {
    const csv = [
      header,
      'Copy of back tuck,floor,backward,4,0,tuck,standing,,',
      'New A,floor,sideward,12,0 0 0,pike,standing,,',
      'New B,floor,sideward,12,0 0 0,pike,standing,,',
    ].join('\n')
    const dry = await director
      .post(`${base}/elements/import`)
      .send({ rows: rowsOf(csv), dryRun: true })
      .expect(200)
    expect(dry.body.errors.map((e: { row: number }) => e.row)).toEqual([1, 3])
  })

  it('imports a valid file in one go and exports the catalogue in the same columns', async () => {
    const before = (await list()).length
    const csv = [
      header,
      'Cody tuck,trampoline,backward,4,0,tuck,trampoline-bounce,,from the front drop',
      'Cody pike,trampoline,backward,4,0,pike,trampoline-bounce,,',
    ].join('\n')
    // both rows share a description with the standard back tuck/pike: refused
    const clash = await director
      .post(`${base}/elements/import`)
      .send({ rows: rowsOf(csv), dryRun: true })
      .expect(200)
    expect(clash.body.valid).toBe(false)
    const fresh = [
      header,
      'Side salto 1¾,tumbling,sideward,7,0 0,tuck,standing,,',
      'Wide side salto,tumbling,sideward,4,0,straight,punch,,',
    ].join('\n')
    const res = await director
      .post(`${base}/elements/import`)
      .send({ rows: rowsOf(fresh), dryRun: false })
      .expect(201)
    expect(res.body).toEqual({ valid: true, errors: [], created: 2 })
    expect((await list()).length).toBe(before + 2)

    const exported = await coach.get(`${base}/elements/export`).expect(200)
    expect(exported.headers['content-type']).toMatch(/text\/csv/)
    const parsed = rowsOf(exported.text)
    expect(Object.keys(parsed[0]!)).toEqual(header.split(','))
    expect(parsed.find((r) => r.name === 'Side salto 1¾')).toMatchObject({
      quarterRotations: '7',
      twists: '0 0',
    })
  })
})

describe('progression templates', () => {
  it('lists the club’s templates and lets the director edit one', async () => {
    const templates = (await coach.get(`${base}/progression-templates`).expect(200)).body as {
      family: string
      steps: unknown[]
    }[]
    expect(templates.map((x) => x.family)).toContain('double-salto')
    const steps = [
      {
        name: 'Timers',
        modality: 'floor-drill',
        criterion: 'Ten timers with a tight set.',
        minDays: 3,
      },
      { name: 'In a routine', modality: 'routine', criterion: 'Twice in a routine.' },
    ]
    await coach.put(`${base}/progression-templates/double-salto`).send({ steps }).expect(403)
    const saved = await director
      .put(`${base}/progression-templates/double-salto`)
      .send({ steps })
      .expect(200)
    expect(saved.body.steps).toHaveLength(2)
    const created = await director
      .post(`${base}/elements`)
      .send({
        name: 'Double side salto',
        apparatus: 'floor',
        direction: 'sideward',
        quarterRotations: 8,
        twists: [0, 0],
        shape: 'tuck',
        takeOff: 'round-off',
      })
      .expect(201)
    const detail = (await director.get(`${base}/elements/${created.body.id}`).expect(200)).body
    expect(detail.steps.map((s: { name: string }) => s.name)).toEqual(['Timers', 'In a routine'])
  })
})

describe('tenant isolation', () => {
  it('another club’s element ids answer 404', async () => {
    const other = await clubWithPeople(database.db, 'cat-other')
    const theirs = (
      await (
        await signedIn(t, other.people.director.email)
      ).get(`/api/clubs/${other.club.id}/elements`)
    ).body as CatalogueElement[]
    await director.get(`${base}/elements/${theirs[0]!.id}`).expect(404)
    await director.delete(`${base}/elements/${theirs[0]!.id}`).expect(404)
    const [stillThere] = await database.db
      .select({ n: count() })
      .from(elements)
      .where(eq(elements.id, theirs[0]!.id))
    expect(stillThere!.n).toBe(1)
  })
})
