import { desc, eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { passwordResets, rateLimits, sessions, users } from '../../server/db/schema-accounts.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'auth')
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const cookieOf = (res: request.Response) => String(res.headers['set-cookie'] ?? '')

describe('POST /api/auth/sign-in', () => {
  it('signs in, sets an HttpOnly SameSite=Lax cookie and answers with the memberships', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.coach.email, password: testPassword })
    expect(res.status).toBe(200)
    expect(res.body.user.email).toBe(fx.people.coach.email)
    expect(res.body.memberships).toEqual([
      expect.objectContaining({ clubId: fx.club.id, role: 'coach', accessOpen: true }),
    ])
    expect(res.body.activeClubId).toBe(fx.club.id)
    const cookie = cookieOf(res)
    expect(cookie).toMatch(/^twofold_session=/)
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).not.toMatch(/Secure/i)
  })

  it('accepts the e-mail in any case', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.coach.email.toUpperCase(), password: testPassword })
    expect(res.status).toBe(200)
  })

  it('refuses a wrong password with 401 and no cookie', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.board.email, password: 'not-it-at-all' })
    expect(res.status).toBe(401)
    expect(res.body.error.code).toBe('invalid_credentials')
    expect(res.headers['set-cookie']).toBeUndefined()
  })

  it('names the field of a malformed sign-in', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'not-an-address', password: '' })
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path).sort()).toEqual([
      'email',
      'password',
    ])
  })

  it('gives a new session at each sign-in', async () => {
    const agent = await signedIn(t, fx.people.director.email)
    const first = (
      await database.db.select().from(sessions).where(eq(sessions.userId, fx.people.director.id))
    ).map((s) => s.id)
    await agent
      .post('/api/auth/sign-in')
      .send({ email: fx.people.director.email, password: testPassword })
      .expect(200)
    const second = (
      await database.db.select().from(sessions).where(eq(sessions.userId, fx.people.director.id))
    ).map((s) => s.id)
    expect(second.filter((id) => !first.includes(id))).toHaveLength(1)
    // the session the agent had before is gone
    expect(second.length).toBe(first.length)
  })

  it('marks the cookie Secure and __Host- prefixed when served over HTTPS', async () => {
    const secure = await testApp(database, { env: { PUBLIC_URL: 'https://twofold.example.org' } })
    try {
      const res = await request(secure.app)
        .post('/api/auth/sign-in')
        .send({ email: fx.people.coach.email, password: testPassword })
      expect(cookieOf(res)).toMatch(/^__Host-twofold_session=.*Secure/i)
      expect(cookieOf(res)).toMatch(/Path=\//)
    } finally {
      await secure.close()
    }
  })
})

describe('sign-out and replayed cookies', () => {
  it('a cookie replayed after sign-out gets 401', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.coach.email, password: testPassword })
    const cookie = cookieOf(res).split(';')[0]!
    await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(200)
    await request(t.app).post('/api/auth/sign-out').set('Cookie', cookie).expect(204)
    const replay = await request(t.app).get('/api/auth/me').set('Cookie', cookie)
    expect(replay.status).toBe(401)
    expect(replay.body.error.code).toBe('unauthenticated')
  })
})

describe('session lifetime', () => {
  it('ends a session idle for longer than the idle timeout', async () => {
    const agent = await signedIn(t, fx.people.board.email)
    await database.db
      .update(sessions)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(sessions.userId, fx.people.board.id))
    await agent.get('/api/auth/me').expect(401)
  })

  it('ends a session past its absolute lifetime even while it is in use', async () => {
    const agent = await signedIn(t, fx.people.clinician.email)
    await database.db
      .update(sessions)
      .set({
        createdAt: new Date(Date.now() - 12 * 3_600_000 - 1000),
        expiresAt: new Date(Date.now() + 3_600_000),
      })
      .where(eq(sessions.userId, fx.people.clinician.id))
    await agent.get('/api/auth/me').expect(401)
  })

  it('slides the idle timeout forward with activity, capped by the absolute lifetime', async () => {
    const agent = await signedIn(t, fx.people.coach.email)
    const [row] = await database.db
      .select()
      .from(sessions)
      .where(eq(sessions.userId, fx.people.coach.id))
      .orderBy(desc(sessions.createdAt))
    const soon = new Date(Date.now() + 5 * 60_000)
    await database.db.update(sessions).set({ expiresAt: soon })
    await agent.get('/api/auth/me').expect(200)
    const [after] = await database.db.select().from(sessions).where(eq(sessions.id, row!.id))
    expect(after!.expiresAt.getTime()).toBeGreaterThan(Date.now() + 59 * 60_000)
    expect(after!.expiresAt.getTime()).toBeLessThanOrEqual(
      after!.createdAt.getTime() + 12 * 3_600_000,
    )
  })
})

describe('own sessions', () => {
  it('lists them without their secrets and ends another one', async () => {
    const phone = await signedIn(t, fx.people.director.email)
    const laptop = await signedIn(t, fx.people.director.email)
    const list = (await laptop.get('/api/auth/sessions').expect(200)).body as {
      handle: string
      current: boolean
    }[]
    const ids = (await database.db.select().from(sessions)).map((s) => s.id)
    for (const s of list) expect(ids).not.toContain(s.handle)
    const other = list.find((s) => !s.current)!
    await laptop.delete(`/api/auth/sessions/${other.handle}`).expect(204)
    const remaining = (await laptop.get('/api/auth/sessions').expect(200)).body as unknown[]
    expect(remaining).toHaveLength(list.length - 1)
    await laptop.post('/api/auth/sessions/end-others').expect(204)
    await phone.get('/api/auth/me').expect(401)
    await laptop.get('/api/auth/me').expect(200)
  })
})

describe('POST /api/auth/password', () => {
  it('needs the current password, refuses a weak one, and ends the other sessions', async () => {
    const db = database.db
    const extra = await clubWithPeople(db, 'pw')
    const other = await signedIn(t, extra.people.coach.email)
    const agent = await signedIn(t, extra.people.coach.email)

    const wrong = await agent
      .post('/api/auth/password')
      .send({ currentPassword: 'nope', newPassword: 'orbit-meadow-falcon-91' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.error.issues[0].path).toBe('currentPassword')

    const weak = await agent
      .post('/api/auth/password')
      .send({ currentPassword: testPassword, newPassword: 'password123' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.code).toBe('weak_password')
    expect(weak.body.error.issues[0].path).toBe('newPassword')
    expect(weak.body.error.message).toMatch(/too easy to guess/)

    const short = await agent
      .post('/api/auth/password')
      .send({ currentPassword: testPassword, newPassword: 'abc' })
    expect(short.body.error.issues[0]).toEqual({
      path: 'newPassword',
      message: 'Use at least 8 characters.',
    })

    await agent
      .post('/api/auth/password')
      .send({ currentPassword: testPassword, newPassword: 'orbit-meadow-falcon-91' })
      .expect(204)
    await agent.get('/api/auth/me').expect(200)
    await other.get('/api/auth/me').expect(401)
    await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: extra.people.coach.email, password: 'orbit-meadow-falcon-91' })
      .expect(200)
  })
})

describe('password reset by e-mail', () => {
  it('sends a single-use link that sets a new password and ends every session', async () => {
    const extra = await clubWithPeople(database.db, 'reset')
    const email = extra.people.board.email
    const before = await signedIn(t, email)
    await request(t.app).post('/api/auth/password-reset/request').send({ email }).expect(202)
    const mail = await t.mailer.fake!.waitFor(email)
    expect(mail.subject).toMatch(/Reset your Twofold password/)
    const token = /reset-password#token=([A-Za-z0-9_-]+)/.exec(mail.text)![1]!
    expect(token.length).toBeGreaterThanOrEqual(43) // 256 bits in base64url
    // Only the hash is stored.
    const stored = await database.db.select().from(passwordResets)
    expect(stored.map((r) => r.tokenHash)).not.toContain(token)

    await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token, newPassword: 'harbour-tinsel-comet-58' })
      .expect(204)
    await before.get('/api/auth/me').expect(401)
    await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email, password: 'harbour-tinsel-comet-58' })
      .expect(200)

    const again = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token, newPassword: 'another-lovely-phrase-33' })
    expect(again.status).toBe(400)
    expect(again.body.error.code).toBe('invalid_token')
  })

  it('refuses an expired link', async () => {
    const extra = await clubWithPeople(database.db, 'expired')
    const email = extra.people.coach.email
    await request(t.app).post('/api/auth/password-reset/request').send({ email }).expect(202)
    const token = /token=([A-Za-z0-9_-]+)/.exec((await t.mailer.fake!.waitFor(email)).text)![1]!
    await database.db.update(passwordResets).set({ expiresAt: new Date(Date.now() - 1000) })
    const res = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token, newPassword: 'harbour-tinsel-comet-58' })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_token')
  })

  it('answers the same for an unknown address and sends nothing', async () => {
    const res = await request(t.app)
      .post('/api/auth/password-reset/request')
      .send({ email: 'nobody@test.example' })
    expect(res.status).toBe(202)
    expect(t.mailer.fake!.messages().some((m) => m.to.includes('nobody@test.example'))).toBe(false)
  })
})

describe('brute-force throttling', () => {
  it('answers 429 with a retry time after repeated failures, and leaves other accounts alone', async () => {
    const extra = await clubWithPeople(database.db, 'throttle')
    const victim = extra.people.coach.email
    for (let i = 0; i < 5; i++) {
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: victim, password: `guess-${i}` })
        .expect(401)
    }
    const blocked = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: victim, password: testPassword })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0)
    expect(blocked.body.error.retryAfterSeconds).toBe(Number(blocked.headers['retry-after']))

    // Another account signs in as usual meanwhile.
    await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: extra.people.director.email, password: testPassword })
      .expect(200)

    // Once the window is over the right password works again.
    await database.db.update(rateLimits).set({ expire: Date.now() - 1 })
    await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: victim, password: testPassword })
      .expect(200)
  })
})

describe('cross-site requests', () => {
  it('refuses a state-changing request from a foreign Origin with 403', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .set('Origin', 'https://elsewhere.example')
      .send({ email: fx.people.coach.email, password: testPassword })
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe('cross_origin')
  })

  it('refuses Sec-Fetch-Site cross-site without an Origin', async () => {
    const res = await request(t.app).post('/api/auth/sign-out').set('Sec-Fetch-Site', 'cross-site')
    expect(res.status).toBe(403)
  })

  it('lets the same origin through', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .set('Host', 'twofold.test')
      .set('Origin', 'http://twofold.test')
      .send({ email: fx.people.coach.email, password: testPassword })
    expect(res.status).toBe(200)
  })
})

describe('stored passwords', () => {
  it('are argon2id with m=19456, t=2, p=1', async () => {
    const [row] = await database.db.select().from(users).where(eq(users.id, fx.people.director.id))
    expect(row!.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/)
  })
})
