import { randomBytes, randomUUID } from 'node:crypto'
import { Writable } from 'node:stream'
import { DrizzleQueryError, sql } from 'drizzle-orm'
import express from 'express'
import pino from 'pino'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../server/app.ts'
import { storedSessionId } from '../../server/auth/sessions.ts'
import { hashToken } from '../../server/auth/tokens.ts'
import {
  clusterUrl,
  ensureDatabase,
  removeCluster,
  startCluster,
  stopCluster,
  throwawayCluster,
} from '../../server/cli/postgres.ts'
import { createDatabase, type Database } from '../../server/db/client.ts'
import { applyMigrations } from '../../server/db/migrate.ts'
import { errorHandler } from '../../server/http/errors.ts'
import type { Env } from '../../server/env.ts'
import { loggerOptions } from '../../server/logger.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { apiErrorBodySchema } from '../../shared/schemas/errors.ts'
import { brokenCharacterMessage, nulCharacterMessage } from '../../shared/schemas/text.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, testEnv, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'

const argon2Hash =
  '$argon2id$v=19$m=19456,t=2,p=1$c2FsdHNhbHRzYWx0c2FsdA$aGFzaGhhc2hoYXNoaGFzaGhhc2hoYXNoaGFzaA'

/** A pino logger with the server's options, writing its lines to memory. */
function memoryLogger(level: Env['LOG_LEVEL'] = 'info') {
  const lines: string[] = []
  const stream = new Writable({
    write(chunk, _encoding, done) {
      lines.push(String(chunk))
      done()
    },
  })
  const logger = pino(loggerOptions({ LOG_LEVEL: level, NODE_ENV: 'production' }), stream)
  return { logger, output: () => lines.join('') }
}

/** The error body's issues, checked against the one error shape. */
function issuesOf(res: request.Response) {
  return apiErrorBodySchema.parse(res.body).error.issues ?? []
}

describe('text with a NUL character', () => {
  let database: Database
  let t: TestApp
  let fixture: Awaited<ReturnType<typeof clubWithPeople>>
  let director: TestAgent
  let base: string
  beforeAll(async () => {
    database = await freshDatabase()
    t = await testApp(database)
    fixture = await clubWithPeople(database.db)
    director = await signedIn(t, fixture.people.director.email)
    base = `/api/clubs/${fixture.club.id}`
  })
  afterAll(async () => {
    await t.close()
    await database.close()
  })

  const expectNulRefused = (res: request.Response, path: string) => {
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(issuesOf(res)).toContainEqual({ path, message: nulCharacterMessage })
  }

  it('refuses a NUL in the sign-in e-mail, naming the field', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: `director\u0000@test.example`, password: testPassword })
    expectNulRefused(res, 'email')
  })

  it('refuses a NUL in an athlete name with 400, not 500, naming the field', async () => {
    const res = await director.post(`${base}/athletes`).send({
      givenName: 'Ada\u0000',
      familyName: 'Lovelace',
      birthYear: 2013,
      squadId: fixture.squad.id,
      discipline: 'artistic-women',
    })
    expectNulRefused(res, 'givenName')
  })

  it('refuses a NUL in an element name, naming the field', async () => {
    const res = await director.post(`${base}/elements`).send({
      name: 'Side\u0000 salto',
      apparatus: 'floor',
      direction: 'sideward',
      quarterRotations: 4,
      twists: [0],
      shape: 'tuck',
      takeOff: 'standing',
    })
    expectNulRefused(res, 'name')
  })

  it('refuses a NUL in a squad name, naming the field', async () => {
    const res = await director
      .post(`${base}/squads`)
      .send({ name: 'Squad\u0000B', level: 'junior', discipline: 'tumbling' })
    expectNulRefused(res, 'name')
  })

  it('refuses a NUL deep in an import row, naming the row (from 1, as import errors do) and the field', async () => {
    const row = {
      givenName: 'Row',
      familyName: 'Ok',
      birthYear: '2012',
      squad: 'Squad A',
      discipline: 'artistic-women',
    }
    const res = await director.post(`${base}/athletes/import`).send({
      dryRun: true,
      rows: [row, row, row, { ...row, givenName: 'Bad\u0000' }],
    })
    expectNulRefused(res, 'rows.4.givenName')
  })

  it('refuses a NUL in a path parameter with 400, not 500', async () => {
    const res = await director.delete(`${base}/members/abc%00def`)
    expectNulRefused(res, 'path')
  })

  it('refuses a NUL in a query parameter, naming it', async () => {
    const res = await director.get(`${base}/elements`).query({ q: 'back\u0000tuck' })
    expectNulRefused(res, 'query.q')
  })

  // Unicode 15, section 3.9 (D91, "UTF-16"): a high surrogate (D800–DBFF) is only ever followed
  // by a low one (DC00–DFFF); either alone is ill-formed and encodes no character. JSON lets one
  // through as an escape ("\ud800"); UTF-8 cannot hold it (D92), so it would be stored as U+FFFD.
  it('refuses half a surrogate pair in an athlete name, naming the field, and saves nothing', async () => {
    const athlete = (givenName: string) => ({
      givenName,
      familyName: 'Surrogate',
      birthYear: 2013,
      squadId: fixture.squad.id,
      discipline: 'artistic-women',
    })
    const count = async () =>
      (await director.get(`${base}/athletes`).expect(200)).body.filter(
        (a: { familyName: string }) => a.familyName === 'Surrogate',
      ).length
    for (const broken of ['Ada\ud800', '\udc00Ada', 'Ada\udc00\ud800']) {
      const res = await director.post(`${base}/athletes`).send(athlete(broken))
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('invalid_input')
      expect(issuesOf(res)).toContainEqual({ path: 'givenName', message: brokenCharacterMessage })
    }
    expect(await count()).toBe(0)
    // A whole pair is a character like any other (U+1F938, person doing a cartwheel): saved as sent.
    const res = await director
      .post(`${base}/athletes`)
      .send(athlete('Ada \ud83e\udd38'))
      .expect(201)
    expect(res.body.givenName).toBe('Ada \u{1F938}')
    expect(await count()).toBe(1)
  })

  it('refuses half a surrogate pair in a key, naming the key with U+FFFD in its place', async () => {
    const res = await director.post(`${base}/squads`).send({ name: 'Squad C', 'lev\ud800el': 'x' })
    expect(res.status).toBe(400)
    expect(issuesOf(res)).toContainEqual({ path: 'lev\ufffdel', message: brokenCharacterMessage })
  })

  it('answers 400, not 500, when PostgreSQL itself refuses a NUL the input checks missed', async () => {
    const app = express()
    app.get('/unchecked', async () => {
      await database.db.execute(sql`select ${'text with \u0000 inside'}::text`)
    })
    app.use(errorHandler)
    const res = await request(app).get('/unchecked')
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
  })

  describe('PATCH with nothing to change', () => {
    it('answers 400 for an athlete update with no field, not 500', async () => {
      const athlete = await createAthlete(database.db, fixture.club.id, {
        givenName: 'Still',
        familyName: 'Here',
        birthYear: 2012,
        squadId: fixture.squad.id,
        discipline: 'artistic-women',
      })
      const res = await director.patch(`${base}/athletes/${athlete.id}`).send({})
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('invalid_input')
      expect(issuesOf(res)[0]!.message).toMatch(/change/i)
    })

    it.each([
      [
        'PATCH /elements/:id',
        async () => `/elements/${(await listElements(database.db, fixture.club.id))[0]!.id}`,
      ],
      ['PATCH /squads/:squadId', async () => `/squads/${fixture.squad.id}`],
      ['PATCH /members/:userId', async () => `/members/${fixture.people.coach.id}`],
      ['PATCH /settings', async () => '/settings'],
    ])('answers 400 invalid_input for %s with an empty body', async (_route, path) => {
      const res = await director.patch(`${base}${await path()}`).send({})
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('invalid_input')
    })
  })

  it('sends Cache-Control: no-store on signed-in answers, errors included', async () => {
    const me = await director.get('/api/auth/me')
    expect(me.status).toBe(200)
    expect(me.headers['cache-control']).toBe('no-store')
    const athletes = await director.get(`${base}/athletes`)
    expect(athletes.headers['cache-control']).toBe('no-store')
    const download = await director.get(`${base}/athletes/export`)
    expect(download.status).toBe(200)
    expect(download.headers['cache-control']).toBe('no-store')
    const missing = await director.get(`${base}/athletes/${randomUUID()}`)
    expect(missing.status).toBe(404)
    expect(missing.headers['cache-control']).toBe('no-store')
  })
})

describe('the log', () => {
  const token = 'Tk' + randomBytes(24).toString('base64url')
  const sessionSecret = randomBytes(20).toString('hex')

  it('keeps password hashes, tokens and query parameters out of a logged query error', () => {
    const { logger, output } = memoryLogger()
    const cause = Object.assign(
      new Error('null value in column "name" of relation "users" violates not-null constraint'),
      {
        code: '23502',
        severity: 'ERROR',
        detail: `Failing row contains (4f1c, someone@test.example, ${argon2Hash}, null).`,
      },
    )
    const err = new DrizzleQueryError(
      'insert into "users" ("id", "email", "password_hash", "name") values ($1, $2, $3, $4)',
      ['4f1c', 'someone@test.example', argon2Hash, hashToken(token)],
      cause,
    )
    // As pino-http's request logger does: the standard error serializer, not the logger's own.
    const requestLog = logger.child({}, { serializers: { err: pino.stdSerializers.err } })
    requestLog.error({ err }, 'unhandled error')
    logger.error(err)

    const text = output()
    expect(text).not.toContain('$argon2')
    expect(text).not.toContain('c2FsdHNhbHRzYWx0c2FsdA')
    expect(text).not.toContain(hashToken(token))
    expect(text).not.toContain('someone@test.example')
    // What helps to find the fault stays: the SQL without values, the message and the code.
    const line = JSON.parse(text.split('\n')[0]!)
    expect(line.err.type).toBe('DrizzleQueryError')
    expect(line.err.message).toContain('Failed query: insert into "users"')
    expect(line.err.message).toContain('violates not-null constraint')
    expect(line.err.query).toContain('values ($1, $2, $3, $4)')
    expect(line.err.stack).toContain('at ')
  })

  it('keeps secrets out whatever the key they are logged under, at any depth', () => {
    const { logger, output } = memoryLogger()
    logger.warn(
      {
        user: { email: 'a@test.example', passwordHash: argon2Hash },
        request: {
          headers: {
            cookie: `twofold_session=${sessionSecret}`,
            authorization: 'Bearer xyz-secret',
          },
        },
        invitation: { token, tokenHash: hashToken(token) },
        sessionId: sessionSecret,
        note: `stored ${argon2Hash} by mistake`,
      },
      'something odd',
    )
    const text = output()
    for (const secret of [argon2Hash, token, hashToken(token), sessionSecret, 'xyz-secret'])
      expect(text).not.toContain(secret)
    expect(JSON.parse(text).user.email).toBe('a@test.example')
  })
})

describe('the request log', () => {
  it('writes the path of a request but not its query string, and no proxy credentials', async () => {
    const database = await freshDatabase()
    const { logger, output } = memoryLogger()
    const env = { ...testEnv, LOG_LEVEL: 'info' as const }
    const mailer = await createMailer(env)
    try {
      const app = createApp({ env, database, logger, mailer })
      await request(app)
        .get('/api/auth/me?token=QuerySecret123&next=%2Fsquads')
        .set('Proxy-Authorization', 'Basic cHJveHk6c2VjcmV0')
        .expect(401)
      const text = output()
      expect(text).toContain('/api/auth/me')
      expect(text).not.toContain('QuerySecret123')
      expect(text).not.toContain('cHJveHk6c2VjcmV0')
    } finally {
      await mailer.close()
      await database.close()
    }
  })
})

describe('a deeply nested body', () => {
  it('is refused at once, naming where it went too deep', async () => {
    const database = await freshDatabase()
    const t = await testApp(database)
    try {
      const depth = 20_000
      const body = '['.repeat(depth) + ']'.repeat(depth)
      const res = await request(t.app)
        .post('/api/auth/sign-in')
        .set('Content-Type', 'application/json')
        .send(body)
      expect(res.status).toBe(400)
      expect(issuesOf(res)[0]?.message).toMatch(/nested too deeply/)
    } finally {
      await t.close()
      await database.close()
    }
  })
})

describe('while PostgreSQL is unreachable', () => {
  // A cluster of this test's own, so that stopping it cannot disturb the other test files.
  let cluster: Awaited<ReturnType<typeof throwawayCluster>>
  let database: Database
  let app: ReturnType<typeof createApp>
  let log: ReturnType<typeof memoryLogger>
  let close: () => Promise<void>
  beforeAll(async () => {
    cluster = await throwawayCluster('twofold-unreachable-')
    startCluster(cluster)
    await ensureDatabase(cluster, 'twofold')
    database = createDatabase(clusterUrl(cluster, 'twofold'))
    await applyMigrations(database.db)
    log = memoryLogger('debug')
    const mailer = await createMailer(testEnv)
    app = createApp({ env: testEnv, database, logger: log.logger, mailer })
    close = () => mailer.close()
  }, 120_000)
  afterAll(async () => {
    await close?.()
    await database?.close()
    if (cluster) removeCluster(cluster)
  })

  it('answers a write with 503 and Retry-After, and logs no secret', async () => {
    const { club, people } = await clubWithPeople(database.db)
    const director = request.agent(app)
    const signIn = await director
      .post('/api/auth/sign-in')
      .send({ email: people.director.email, password: testPassword })
    expect(signIn.status).toBe(200)
    const cookie = String(signIn.headers['set-cookie'])
    const sessionSecret = /twofold_session=([a-z0-9]+)/.exec(cookie)![1]!
    stopCluster(cluster)

    const res = await director
      .post(`/api/clubs/${club.id}/squads`)
      .send({ name: 'Squad B', level: 'junior', discipline: 'tumbling' })
    expect(res.status).toBe(503)
    expect(res.body).toEqual({
      error: {
        code: 'unavailable',
        message: 'The database is not reachable right now. Try again in a moment.',
      },
    })
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)
    expect(res.headers['cache-control']).toBe('no-store')

    const token = randomBytes(32).toString('base64url')
    const accept = await request(app)
      .post('/api/auth/invitations/accept')
      .send({ token, password: testPassword, name: 'New Person' })
    expect(accept.status).toBe(503)
    expect(accept.headers['retry-after']).toBeDefined()

    const text = log.output()
    expect(text).not.toContain(hashToken(token))
    expect(text).not.toContain(token)
    expect(text).not.toContain('$argon2')
    expect(text).not.toContain(sessionSecret)
    expect(text).not.toContain(storedSessionId(sessionSecret))
    expect(text).toContain('"statusCode":503')
  }, 60_000)
})
