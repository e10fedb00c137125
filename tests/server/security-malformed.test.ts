import { sql } from 'drizzle-orm'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Role } from '../../shared/domain/club.ts'
import type { Database } from '../../server/db/client.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { signedIn } from '../support/fixtures.ts'
import {
  badIds,
  bodyCases,
  faultProblem,
  fillPath,
  paramNames,
  queryCases,
  refusalProblem,
  registeredRoutes,
  routeKey,
  spoiledKeys,
  type RegisteredRoute,
} from '../support/route-sweep.ts'
import { sweepClub } from '../support/sweep-club.ts'

// "Bad input gets a clear error naming the field and loses nothing already saved; never a 500."
// Every route the app registers is sent malformed path ids, bodies and query parameters: as the
// club's director (or the role a route is for) under a club, signed out outside one (signed in
// where a route asks for it). Each answer must be a 4xx in the API's error shape. A route added
// later is swept too; the first test asks for its valid request, so that its body and query
// are spoiled field by field as well.

/** Query keys some route reads: every GET route is also sent these, spoiled all at once. */
const knownQueryKeys = ['squadId', 'athleteId', 'elementId', 'days', 'occurredOn', 'q', 'open']
/** Tables that may change without any saved data changing: sessions slide, limits count. */
const bookkeeping = new Set(['sessions', 'rate_limits'])

let database: Database
let t: TestApp
let club: Awaited<ReturnType<typeof sweepClub>>
let agents: Record<Role | 'signedIn', TestAgent>
let routes: RegisteredRoute[]

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { worker: false })
  club = await sweepClub(t, database)
  agents = {
    director: club.director,
    coach: await signedIn(t, club.people.coach.email),
    clinician: await signedIn(t, club.people.clinician.email),
    board: await signedIn(t, club.people.board.email),
    // someone of the club signed in, for the account routes outside it
    signedIn: await signedIn(t, club.people.board.email),
  }
  // The club's own deletion goes last, in case it were to go through.
  const last = (r: RegisteredRoute) => Number(routeKey(r) === 'DELETE /')
  routes = registeredRoutes(t.app).sort((a, b) => last(a) - last(b))
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const inClub = (route: RegisteredRoute) => route.path.startsWith('/api/clubs/:clubId')

/** Who sends a route its malformed requests. */
function senderOf(route: RegisteredRoute) {
  if (inClub(route)) {
    const allow = t.clubRoutes.find(
      (r) => `${r.method.toUpperCase()} ${r.path}` === routeKey(route),
    )!.allow
    return agents[allow.includes('director') ? 'director' : allow[0]!]
  }
  return route.guards.includes('requireSignIn') ? agents.signedIn : request(t.app)
}

interface Sent {
  path?: string
  query?: string
  body?: { raw: string; type: string }
}

/** Sends `route` its valid request with one part replaced; answers the problem, if any. */
async function send(
  route: RegisteredRoute,
  sent: Sent,
  problemOf: (res: request.Response) => string | null = (res) => refusalProblem(res),
) {
  const base = club.requests[routeKey(route)] ?? {}
  const path = sent.path ?? fillPath(route.path, club.paramValue)
  const query = sent.query ?? new URLSearchParams(base.query ?? {}).toString()
  const url = query ? `${path}?${query}` : path
  let call = senderOf(route)[route.method](url)
  if (sent.body) call = call.set('Content-Type', sent.body.type).send(sent.body.raw)
  else if (base.body !== undefined) call = call.send(base.body as object)
  // A request left without an answer is a fault too, if not one a status code shows.
  const res = await call.timeout(10_000).catch((err: Error) => err)
  return res instanceof Error ? `no answer: ${res.message}` : problemOf(res)
}

/** Runs each case of each route, collecting `KEY case: problem` for every bad answer. */
async function sweep<C>(
  cases: (route: RegisteredRoute) => C[],
  run: (route: RegisteredRoute, c: C) => Promise<[string, string | null]>,
) {
  const problems: string[] = []
  for (const route of routes) {
    for (const c of cases(route)) {
      const [label, problem] = await run(route, c)
      if (problem) problems.push(`${routeKey(route)} ${label}: ${problem}`)
    }
  }
  return problems
}

/** Every table's row count and a digest of its rows. */
async function snapshot() {
  const tables = await database.db.execute<{ name: string }>(
    sql`select table_name as name from information_schema.tables
        where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`,
  )
  const digest: Record<string, string> = {}
  for (const { name } of tables.rows) {
    if (bookkeeping.has(name)) continue
    const [row] = (
      await database.db.execute<{ n: number; h: string }>(
        sql`select count(*)::int as n, md5(coalesce(string_agg(x::text, ',' order by x::text), ''))
            as h from ${sql.identifier(name)} x`,
      )
    ).rows
    digest[name] = `${row!.n} rows, ${row!.h}`
  }
  return digest
}

describe('malformed requests to every route', () => {
  let before: Record<string, string>
  beforeAll(async () => {
    before = await snapshot()
  })

  it('knows the valid request of every route that changes something, and of no other', () => {
    const keys = routes.map(routeKey)
    const changing = routes.filter((r) => r.method !== 'get').map(routeKey)
    expect(changing.filter((k) => !(k in club.requests))).toEqual([])
    expect(Object.keys(club.requests).filter((k) => !keys.includes(k))).toEqual([])
  })

  it('refuses path ids that are not ids, or of nothing', async () => {
    const problems = await sweep(
      (route) => paramNames(route.path).flatMap((name) => badIds().map((id) => ({ name, id }))),
      async (route, { name, id: [label, id] }) => {
        const path = fillPath(route.path, (n, owner) =>
          n === name ? id : club.paramValue(n, owner),
        )
        return [`:${name} ${label}`, await send(route, { path })]
      },
    )
    expect(problems).toEqual([])
  })

  it('refuses malformed bodies, naming the field', async () => {
    const problems = await sweep(
      (route) => {
        const base = club.requests[routeKey(route)]
        if (base?.fileBody) return bodyCases(undefined).filter((c) => c.wholeBody)
        return base?.body === undefined ? [] : bodyCases(base.body, base)
      },
      async (route, c) => [
        c.label,
        await send(route, { body: c }, (res) => refusalProblem(res, c)),
      ],
    )
    expect(problems).toEqual([])
  })

  it('refuses query parameters of the wrong type or repeated', async () => {
    const problems = await sweep(
      (route) => queryCases(club.requests[routeKey(route)]?.query ?? {}),
      async (route, { label, query, field }) => [
        label,
        await send(route, { query }, (res) => refusalProblem(res, { field })),
      ],
    )
    expect(problems).toEqual([])
  })

  it('never fails on query parameters a route does not read', async () => {
    const problems = await sweep(
      (route) => (route.method === 'get' ? spoiledKeys(knownQueryKeys) : []),
      async (route, [label, query]) => [label, await send(route, { query }, faultProblem)],
    )
    expect(problems).toEqual([])
  })

  it('loses or changes nothing already saved', async () => {
    expect(await snapshot()).toEqual(before)
  })
})
