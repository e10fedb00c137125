import { count, eq } from 'drizzle-orm'
import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { athletes } from '../../server/db/schema-athletes.ts'
import { elements } from '../../server/db/schema-catalogue.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { createSquad } from '../../server/services/squads.ts'
import type { AuditReport } from '../../shared/schemas/audits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let base: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'csv')
  director = await signedIn(t, fx.people.director.email)
  base = `/api/clubs/${fx.club.id}`
})
afterAll(async () => {
  await t.close()
  await database.close()
})

// OWASP "CSV Injection" (https://owasp.org/www-community/attacks/CSV_Injection): a cell starting
// with =, +, -, @, tab (0x09) or carriage return (0x0D) is run as a formula by a spreadsheet.
const formulaStart = /^[=+\-@\t\r]/
const formulae = [
  '=HYPERLINK("http://x.invalid","y")',
  '+SUM(1,1)',
  '-2+3',
  '@SUM(1,1)',
  '\t=1+1',
  '\r=1+1',
  // a formula over two lines is a formula all the same
  '=1+1\nsecond line',
]
// A figure such as a change of −0.12 is a number, which a spreadsheet must still read as one.
const plainNumber = /^-?\d+(\.\d+)?(e[+-]?\d+)?$/i

/** Every cell of the file, header included, read back as a spreadsheet would split it. */
function cellsOf(csv: string) {
  const parsed = Papa.parse<string[]>(csv, { skipEmptyLines: true })
  expect(parsed.errors).toEqual([])
  return parsed.data
}

/** No cell can start a formula: each text starting with a formula character is escaped by a `'`. */
function expectNoFormulae(rows: string[][]) {
  const live = rows.flat().filter((cell) => formulaStart.test(cell) && !plainNumber.test(cell))
  expect(live).toEqual([])
}

/** The escaped form keeps the whole original text after the quote. */
const escaped = (text: string) => `'${text}`

async function formulaSquad(name: string) {
  return createSquad(database.db, fx.club.id, {
    name,
    level: 'junior',
    discipline: 'artistic-women',
  })
}

/** Athletes named by the formulae, stored as they are (as an older row or another path could). */
async function formulaAthletes(squadId: string, familyName: string) {
  return database.db
    .insert(athletes)
    .values(
      formulae.map((givenName) => ({
        clubId: fx.club.id,
        givenName,
        familyName,
        birthYear: 2012,
        squadId,
        discipline: 'artistic-women' as const,
      })),
    )
    .returning({ id: athletes.id, givenName: athletes.givenName })
}

async function runAudit(body: Record<string, unknown>) {
  const started = await director.post(`${base}/audits`).send(body)
  expect(started.status).toBe(202)
  let job = started.body
  for (let i = 0; i < 200 && job.status === 'running'; i++) {
    await new Promise((r) => setTimeout(r, 25))
    job = (await director.get(`${base}/audit-jobs/${job.id}`).expect(200)).body
  }
  expect(job.status).toBe('done')
  return (await director.get(`${base}/audits/${job.auditId}`).expect(200)).body as AuditReport
}

describe('CSV exports and spreadsheet formulae', () => {
  it('escapes names in the roster that a spreadsheet would run as formulae', async () => {
    const squad = await formulaSquad('@Roster squad')
    await formulaAthletes(squad.id, '-Roster')

    const res = await director.get(`${base}/athletes/export?squadId=${squad.id}`).expect(200)
    const rows = cellsOf(res.text)
    expectNoFormulae(rows)
    expect(rows[0]).toEqual(['givenName', 'familyName', 'birthYear', 'squad', 'discipline'])
    const body = rows.slice(1)
    expect(body.map((r) => r[0]).sort()).toEqual(formulae.map(escaped).sort())
    for (const row of body) {
      expect(row.slice(1)).toEqual([
        escaped('-Roster'),
        '2012',
        escaped('@Roster squad'),
        'artistic-women',
      ])
    }
  })

  it('escapes element names and notes in the catalogue export', async () => {
    const renamed = (await listElements(database.db, fx.club.id)).slice(0, formulae.length)
    for (const [i, element] of renamed.entries()) {
      const name = formulae[i]!
      await database.db
        .update(elements)
        .set(i === 0 ? { name, notes: '+notes' } : { name })
        .where(eq(elements.id, element.id))
    }

    const res = await director.get(`${base}/elements/export`).expect(200)
    const rows = cellsOf(res.text)
    expectNoFormulae(rows)
    const names = rows.slice(1).map((r) => r[0])
    for (const text of formulae) expect(names).toContain(escaped(text))
    const first = rows.find((r) => r[0] === escaped(formulae[0]!))!
    expect(first.at(-1)).toBe(escaped('+notes'))
    // the rotation stays the number it was
    expect(first[3]).toBe(String(renamed[0]!.quarterRotations))
  })

  it('escapes the gap list’s names and keeps the figures, negative changes too, as numbers', async () => {
    const squad = await formulaSquad('=Gap squad')
    const { backTuck, frontTuck } = await floorTucks(database.db, fx.club.id)
    await database.db.update(elements).set({ name: '-Back tuck' }).where(eq(elements.id, backTuck))
    await database.db
      .update(elements)
      .set({ name: '@Front tuck' })
      .where(eq(elements.id, frontTuck))
    const people = await formulaAthletes(squad.id, 'Gap')
    const [cora] = await database.db
      .insert(athletes)
      .values({
        clubId: fx.club.id,
        givenName: 'Cora',
        familyName: 'Elmstead',
        birthYear: 2012,
        squadId: squad.id,
        discipline: 'artistic-women',
      })
      .returning({ id: athletes.id })
    const step = (athleteId: string, elementId: string, stepIndex: number, occurredOn: string) => ({
      athleteId,
      elementId,
      coachId: fx.people.coach.id,
      change: { kind: 'step' as const, stepIndex, occurredOn, skipReason: 'Assessed' },
    })
    await appendHistory(
      database.db,
      fx.club.id,
      [...people, cora!].map((p) => step(p.id, backTuck, 3, addDays(-30))),
    )
    await runAudit({ squadId: squad.id, asOf: addDays(-20) })
    // Cora catches up on the forward side: the squad's front-lag falls
    await appendHistory(database.db, fx.club.id, [step(cora!.id, frontTuck, 3, addDays(-10))])
    const report = await runAudit({ squadId: squad.id })
    expect(report.comparison.clubFrontLag.change).toBeLessThan(0)

    const gaps = await director.get(`${base}/audits/${report.audit.id}/gaps.csv`).expect(200)
    const rows = cellsOf(gaps.text)
    expectNoFormulae(rows)
    const [header, ...body] = rows
    const column = (name: string) => header!.indexOf(name)
    expect(body.map((r) => r[column('athlete')]).sort()).toEqual(
      formulae.map((name) => escaped(`${name} Gap`)).sort(),
    )
    for (const row of body) {
      expect(row[column('squad')]).toBe(escaped('=Gap squad'))
      expect(row[column('backwardElement')]).toBe(escaped('-Back tuck'))
      expect(row[column('forwardElement')]).toBe(escaped('@Front tuck'))
      expect(row[column('backwardStep')]).toBe('4')
      expect(Number(row[column('deficitSteps')])).toBeGreaterThanOrEqual(1)
    }

    const headline = await director.get(`${base}/audits/${report.audit.id}/headline.csv`)
    expect(headline.status).toBe(200)
    const figures = cellsOf(headline.text)
    expectNoFormulae(figures)
    const frontLag = figures.find((r) => r[0] === 'front-lag')!
    const change = frontLag[figures[0]!.indexOf('changeSincePrevious')]!
    expect(change).toMatch(plainNumber)
    // in percentage points, rounded to one decimal as the report shows it
    expect(Math.abs(Number(change) - report.comparison.clubFrontLag.change! * 100)).toBeLessThan(
      0.05 + 1e-9,
    )
    // written bare, so a spreadsheet reads a negative number, not text
    expect(headline.text).toContain(`,${change},pts\r\n`)
  })
})

// Each control character a cell could smuggle: C0 controls (U+0000–U+001F) and DEL (U+007F).
const controls = [
  ['NUL', '\u0000'],
  ['tab', '\t'],
  ['carriage return', '\r'],
  ['line feed', '\n'],
  ['unit separator', '\u001f'],
  ['DEL', '\u007f'],
] as const
const notText = [
  ['a number', 2013],
  ['null', null],
  ['a boolean', true],
  ['an object', { text: 'x' }],
] as const

async function rowCount(table: typeof athletes | typeof elements) {
  const [row] = await database.db
    .select({ n: count() })
    .from(table)
    .where(eq(table.clubId, fx.club.id))
  return row!.n
}

async function expectRefused(
  path: string,
  rows: Record<string, unknown>[],
  field: string,
  table: typeof athletes | typeof elements,
) {
  const before = await rowCount(table)
  for (const dryRun of [false, true]) {
    const res = await director.post(`${base}${path}`).send({ rows, dryRun })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(res.body.error.issues).toEqual([
      { path: `rows.2.${field}`, message: expect.any(String) },
    ])
  }
  expect(await rowCount(table)).toBe(before)
}

describe('POST /api/clubs/:clubId/athletes/import', () => {
  const good = {
    givenName: 'Iris',
    familyName: 'Lowther',
    birthYear: '2013',
    squad: 'Squad A',
    discipline: '',
  }
  const second = { ...good, givenName: 'Jude' }

  it.each(controls)('refuses a %s inside a cell, naming the row and field', async (_, c) => {
    await expectRefused(
      '/athletes/import',
      [good, { ...second, familyName: `Low${c}ther` }],
      'familyName',
      athletes,
    )
  })

  it.each(notText)(
    'refuses %s in place of a cell’s text, naming the row and field',
    async (_, v) => {
      await expectRefused(
        '/athletes/import',
        [good, { ...second, birthYear: v }],
        'birthYear',
        athletes,
      )
    },
  )
})

describe('POST /api/clubs/:clubId/elements/import', () => {
  const good = {
    name: 'Wide side salto',
    apparatus: 'tumbling',
    direction: 'sideward',
    quarterRotations: '4',
    twists: '0',
    shape: 'straight',
    takeOff: 'punch',
    difficultyLetter: '',
    notes: '',
  }
  const second = {
    ...good,
    name: 'Side salto 1¾',
    quarterRotations: '7',
    twists: '0 0',
    shape: 'tuck',
    takeOff: 'standing',
  }

  it.each(controls)('refuses a %s inside a cell, naming the row and field', async (_, c) => {
    await expectRefused(
      '/elements/import',
      [good, { ...second, name: `Side${c}salto` }],
      'name',
      elements,
    )
  })

  it.each(notText)(
    'refuses %s in place of a cell’s text, naming the row and field',
    async (_, v) => {
      await expectRefused(
        '/elements/import',
        [good, { ...second, quarterRotations: v }],
        'quarterRotations',
        elements,
      )
    },
  )
})
