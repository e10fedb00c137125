import { createHash } from 'node:crypto'
import { request as httpRequest } from 'node:http'
import { eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { clientKey } from '../../server/auth/limits.ts'
import { purgeExpired } from '../../server/auth/purge.ts'
import type { Database } from '../../server/db/client.ts'
import { passwordResets, rateLimits, sessions } from '../../server/db/schema-accounts.ts'
import { clubArchiveFiles, clubArchives } from '../../server/db/schema-audits.ts'
import { EnvError, parseEnv } from '../../server/env.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'

// Attacks on accounts, each performed against the real app over a real database and shown
// refused. Limits follow the OWASP Authentication Cheat Sheet ("Login Throttling", "Account
// Lockout": count per account and per client, without handing an attacker a lock-out of the
// victim) and the OWASP Forgot Password Cheat Sheet (single-use links, the newest one only,
// links never built from the Host header).

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'sec')
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const linkIn = (text: string) => /(https?:\/\/\S+)/.exec(text)?.[1] ?? ''
const tokenIn = (text: string) => /#token=([A-Za-z0-9_-]+)/.exec(text)?.[1] ?? ''

/** A GET to the local mail viewer with a chosen Host header, as a browser or a rebinding page would. */
function viewerGet(url: string, host: string) {
  const target = new URL(url)
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = httpRequest(
      { host: target.hostname, port: target.port, path: '/', headers: { Host: host } },
      (res) => {
        let body = ''
        res.on('data', (chunk: Buffer) => (body += chunk.toString()))
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body }))
      },
    )
    req.on('error', reject)
    req.end()
  })
}

describe('secret links are readable only by the person they are addressed to', () => {
  it('gives a director no way to read a reset link sent to a member of the club', async () => {
    const director = await signedIn(t, fx.people.director.email)
    await director
      .post('/api/auth/password-reset/request')
      .send({ email: fx.people.coach.email })
      .expect(202)
    await t.mailer.fake!.waitFor(fx.people.coach.email)
    // The club's old Outbox route showed every member's mail to the director.
    const outbox = await director.get(`/api/clubs/${fx.club.id}/outbox`)
    expect(outbox.status).toBe(404)
    for (const path of ['/api/auth/me', `/api/clubs/${fx.club.id}/`]) {
      const res = await director.get(path).expect(200)
      expect(JSON.stringify(res.body)).not.toMatch(/token=/)
    }
  })

  it('serves the local mail viewer on loopback only, and refuses a rebinding Host', async () => {
    const viewer = t.mailer.viewer!
    expect(new URL(viewer.url).hostname).toBe('127.0.0.1')
    const own = await viewerGet(viewer.url, new URL(viewer.url).host)
    expect(own.status).toBe(200)
    expect(own.body).toContain('Local mail')
    const rebound = await viewerGet(viewer.url, 'attacker.example')
    expect(rebound.status).toBe(403)
    expect(rebound.body).not.toMatch(/token=/)
  })

  it('escapes what it shows, so a message cannot run script in the viewer', async () => {
    await t.mailer.send({ to: 'x@test.example', subject: '<script>alert(1)</script>', text: 'hi' })
    await t.mailer.fake!.waitFor('x@test.example')
    const page = await viewerGet(t.mailer.viewer!.url, new URL(t.mailer.viewer!.url).host)
    expect(page.body).not.toContain('<script>alert(1)</script>')
    expect(page.body).toContain('&lt;script&gt;')
  })

  it('never starts the fake mail server or its viewer in production mode', async () => {
    expect(() => parseEnv({ NODE_ENV: 'production', DATABASE_URL: 'postgres://x/y' })).toThrow(
      /PUBLIC_URL: required in production[\s\S]*SMTP_URL: required in production/,
    )
    await expect(
      createMailer({ ...parseEnv({}), NODE_ENV: 'production', SMTP_URL: undefined }),
    ).rejects.toThrow(EnvError)
  })
})

describe('links in mail never come from request headers', () => {
  it('builds a reset link on the address the server listens on, whatever Host says', async () => {
    const target = fx.people.board.email
    await request(t.app)
      .post('/api/auth/password-reset/request')
      .set('Host', 'attacker.example')
      .set('X-Forwarded-Host', 'attacker.example')
      .send({ email: target })
      .expect(202)
    const mail = await t.mailer.fake!.waitFor(target)
    expect(linkIn(mail.text)).toMatch(/^http:\/\/127\.0\.0\.1:3000\/reset-password#token=/)
    expect(mail.text).not.toContain('attacker.example')
  })

  it('uses PUBLIC_URL when it is set, for invitations too', async () => {
    const own = await testApp(database, { env: { PUBLIC_URL: 'https://club.example.org' } })
    try {
      const signIn = await request(own.app)
        .post('/api/auth/sign-in')
        .send({ email: fx.people.director.email, password: testPassword })
        .expect(200)
      const cookie = String(signIn.headers['set-cookie']).split(';')[0]!
      await request(own.app)
        .post(`/api/clubs/${fx.club.id}/invitations`)
        .set('Cookie', cookie)
        .set('Host', 'attacker.example')
        .send({ email: 'header-test@test.example', role: 'board' })
        .expect(201)
      const mail = await own.mailer.fake!.waitFor('header-test@test.example')
      expect(linkIn(mail.text)).toMatch(/^https:\/\/club\.example\.org\/accept-invitation#token=/)
    } finally {
      await own.close()
    }
  })
})

describe('every password check goes through the same limits', () => {
  it('stops guessing an existing account’s password through an invitation', async () => {
    const other = await clubWithPeople(database.db, 'sec-inv')
    const director = await signedIn(t, fx.people.director.email)
    const invitee = other.people.board.email
    await director
      .post(`/api/clubs/${fx.club.id}/invitations`)
      .send({ email: invitee, role: 'coach' })
      .expect(201)
    const token = tokenIn((await t.mailer.fake!.waitFor(invitee)).text)
    const answers: number[] = []
    for (let i = 0; i < 8; i++) {
      const res = await request(t.app)
        .post('/api/auth/invitations/accept')
        .send({ token, password: `wrong-guess-${i}` })
      answers.push(res.status)
    }
    expect(answers.slice(0, 5)).toEqual([400, 400, 400, 400, 400])
    expect(answers.slice(5)).toEqual([429, 429, 429])
    const right = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, password: testPassword })
    expect(right.status).toBe(429)
    expect(Number(right.headers['retry-after'])).toBeGreaterThan(0)
  })

  it('counts failures of the current password when changing it', async () => {
    const other = await clubWithPeople(database.db, 'sec-pw')
    const agent = await signedIn(t, other.people.coach.email)
    for (let i = 0; i < 5; i++) {
      await agent
        .post('/api/auth/password')
        .send({ currentPassword: `nope-${i}`, newPassword: 'orchid-saddle-pylon-93' })
        .expect(400)
    }
    await agent
      .post('/api/auth/password')
      .send({ currentPassword: testPassword, newPassword: 'orchid-saddle-pylon-93' })
      .expect(429)
  })
})

describe('limits per client, per account and per pair, held in PostgreSQL', () => {
  const from = (app: TestApp['app'], ip: string, email: string, password: string) =>
    request(app).post('/api/auth/sign-in').set('X-Forwarded-For', ip).send({ email, password })

  it('refuses one client spraying many accounts, and the count holds across processes', async () => {
    const proxied = { env: { TRUST_PROXY: 1 } }
    const first = await testApp(database, proxied)
    const second = await testApp(database, proxied)
    try {
      const statuses: number[] = []
      for (let i = 0; i < 40; i++) {
        // Alternate between two server processes over the same database.
        const app = i % 2 === 0 ? first.app : second.app
        statuses.push((await from(app, '203.0.113.7', `spray-${i}@test.example`, 'x')).status)
      }
      expect(statuses.filter((s) => s === 401)).toHaveLength(30)
      expect(statuses.slice(30).every((s) => s === 429)).toBe(true)
      // Another client is not affected.
      await from(first.app, '203.0.113.8', fx.people.coach.email, testPassword).expect(200)
    } finally {
      await first.close()
      await second.close()
    }
  })

  it('does not hand an attacker a lock-out of the account’s owner on another client', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const victim = (await clubWithPeople(database.db, 'sec-victim')).people.director.email
      for (let i = 0; i < 5; i++) await from(own.app, '198.51.100.1', victim, `g${i}`).expect(401)
      // The attacker's client is stopped on this account…
      const stopped = await from(own.app, '198.51.100.1', victim, testPassword)
      expect(stopped.status).toBe(429)
      expect(stopped.headers['retry-after']).toBeDefined()
      // …while the owner, on their own client, signs in.
      await from(own.app, '192.0.2.44', victim, testPassword).expect(200)
    } finally {
      await own.close()
    }
  })

  it('slows an account guessed from many clients for a window', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const target = (await clubWithPeople(database.db, 'sec-many')).people.coach.email
      for (let i = 0; i < 20; i++) {
        await from(own.app, `198.51.100.${10 + i}`, target, `g${i}`).expect(401)
      }
      const slowed = await from(own.app, '198.51.100.99', target, 'another-guess')
      expect(slowed.status).toBe(429)
      // Counters are hashed: the table names neither the address nor the client.
      const keys = (await database.db.select().from(rateLimits)).map((r) => r.key).join(' ')
      expect(keys).not.toContain(target)
      expect(keys).not.toContain('198.51.100')
    } finally {
      await own.close()
    }
  })

  it('counts a burst of concurrent guesses before checking any of them', async () => {
    const target = (await clubWithPeople(database.db, 'sec-burst')).people.coach.email
    const answers = await Promise.all(
      Array.from({ length: 12 }, (_, i) =>
        request(t.app)
          .post('/api/auth/sign-in')
          .send({ email: target, password: `burst-${i}` }),
      ),
    )
    const statuses = answers.map((r) => r.status)
    expect(statuses.filter((s) => s === 401)).toHaveLength(5)
    expect(statuses.filter((s) => s === 429)).toHaveLength(7)
  })

  it('lets the owner in on a device that signed in before, while others are held back', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const owner = (await clubWithPeople(database.db, 'sec-device')).people.board.email
      const first = await from(own.app, '192.0.2.10', owner, testPassword).expect(200)
      const device = String(first.headers['set-cookie'])
        .split(/,(?=\s*\w+=)/)
        .map((c) => c.trim().split(';')[0]!)
        .find((c) => c.startsWith('twofold_device='))
      expect(device).toMatch(/^twofold_device=[A-Za-z0-9_-]{43}$/)
      // Guessing from twenty other addresses exhausts the account's own count…
      for (let i = 0; i < 20; i++) await from(own.app, `198.51.100.${120 + i}`, owner, `g${i}`)
      await from(own.app, '192.0.2.77', owner, testPassword).expect(429)
      // …but the owner's known device still signs in, even from a new address.
      await from(own.app, '192.0.2.78', owner, testPassword).set('Cookie', device!).expect(200)
    } finally {
      await own.close()
    }
  })

  it('believes one proxy hop only: a client cannot choose its own address', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const statuses: number[] = []
      for (let i = 0; i < 32; i++) {
        const res = await request(own.app)
          .post('/api/auth/sign-in')
          .set('X-Forwarded-For', `10.9.${i}.1, 203.0.113.50`)
          .send({ email: `forged-${i}@test.example`, password: 'x' })
        statuses.push(res.status)
      }
      expect(statuses.slice(30)).toEqual([429, 429])
    } finally {
      await own.close()
    }
  })

  it.each([
    // RFC 4291 (IPv6 addressing): an interface identifier is the last 64 bits; RFC 5952 forms.
    ['::ffff:192.0.2.1', '192.0.2.1'],
    ['192.0.2.1', '192.0.2.1'],
    ['2001:db8:85a3::8a2e:370:7334', '2001:db8:85a3:0::/64'],
    ['2001:db8:85a3:0:ffff:1:2:3', '2001:db8:85a3:0::/64'],
    ['2001:0db8:0000:0001::1', '2001:db8:0:1::/64'],
    ['::1', '0:0:0:0::/64'],
  ])('counts %s as the client %s', (ip, key) => {
    expect(clientKey(ip)).toBe(key)
  })

  it('limits reset mail asked for one address', async () => {
    const email = 'nobody-in-particular@test.example'
    const statuses: number[] = []
    for (let i = 0; i < 5; i++) {
      statuses.push(
        (await request(t.app).post('/api/auth/password-reset/request').send({ email })).status,
      )
    }
    expect(statuses).toEqual([202, 202, 202, 429, 429])
  })
})

describe('reset links do not pile up', () => {
  it('keeps only the newest link alive, and using it ends every other', async () => {
    const person = (await clubWithPeople(database.db, 'sec-reset')).people.coach
    const tokens: string[] = []
    for (let i = 0; i < 3; i++) {
      const before = t.mailer.fake!.messages().length
      await request(t.app)
        .post('/api/auth/password-reset/request')
        .send({ email: person.email })
        .expect(202)
      await expect.poll(() => t.mailer.fake!.messages().length).toBeGreaterThan(before)
      tokens.push(tokenIn(t.mailer.fake!.messages()[0]!.text))
    }
    const live = await database.db
      .select()
      .from(passwordResets)
      .where(eq(passwordResets.userId, person.id))
    expect(live).toHaveLength(1)
    const older = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: tokens[0], newPassword: 'granite-lupine-vessel-41' })
    expect(older.status).toBe(400)
    await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: tokens[2], newPassword: 'granite-lupine-vessel-41' })
      .expect(204)
    const after = await database.db
      .select()
      .from(passwordResets)
      .where(eq(passwordResets.userId, person.id))
    expect(after.every((r) => r.usedAt !== null)).toBe(true)
  })

  it('purges expired sessions, used or expired links, and closed limiter windows', async () => {
    const agent = await signedIn(t, fx.people.clinician.email)
    await agent.get('/api/auth/me').expect(200)
    const past = new Date(Date.now() - 60_000)
    await database.db
      .update(sessions)
      .set({ expiresAt: past })
      .where(eq(sessions.userId, fx.people.clinician.id))
    await database.db.insert(rateLimits).values({ key: 'old', points: 3, expire: Date.now() - 1 })
    // A club archive past its 24 hours, and one still within them.
    const archive = (expiresAt: Date) =>
      database.db
        .insert(clubArchives)
        .values({ clubId: fx.club.id, status: 'done', expiresAt })
        .returning()
        .then(([row]) => row!.id)
    const expiredArchive = await archive(past)
    const liveArchive = await archive(new Date(Date.now() + 60_000))
    await database.db
      .insert(clubArchiveFiles)
      .values({ clubId: fx.club.id, archiveId: expiredArchive, bytes: Buffer.from('zip') })
    const purged = await purgeExpired(database.db)
    expect(purged.sessions).toBeGreaterThan(0)
    expect(purged.resets).toBeGreaterThan(0)
    expect(purged.counters).toBeGreaterThan(0)
    expect(purged.archives).toBe(1)
    const archivesLeft = await database.db.select({ id: clubArchives.id }).from(clubArchives)
    expect(archivesLeft.map((a) => a.id)).toEqual([liveArchive])
    expect(await database.db.select().from(clubArchiveFiles)).toEqual([])
    const left = await database.db
      .select()
      .from(sessions)
      .where(eq(sessions.userId, fx.people.clinician.id))
    expect(left).toHaveLength(0)
  })
})

describe('the session cookie', () => {
  const setCookie = (res: request.Response) => String(res.headers['set-cookie'] ?? '')

  it('is a browser-session cookie: no Max-Age and no Expires', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.coach.email, password: testPassword })
      .expect(200)
    const cookies = res.headers['set-cookie'] as unknown as string[]
    const session = cookies.find((c) => c.startsWith('twofold_session='))
    expect(session).toBeDefined()
    expect(session).not.toMatch(/Max-Age|Expires/i)
  })

  it('is Secure and __Host- prefixed when reached over https through a trusted proxy', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const res = await request(own.app)
        .post('/api/auth/sign-in')
        .set('X-Forwarded-Proto', 'https')
        .send({ email: fx.people.coach.email, password: testPassword })
        .expect(200)
      expect(setCookie(res)).toMatch(/^__Host-twofold_session=[a-z0-9]+; Path=\/; .*Secure/)
      const cookie = setCookie(res).split(';')[0]!
      await request(own.app)
        .get('/api/auth/me')
        .set('X-Forwarded-Proto', 'https')
        .set('Cookie', cookie)
        .expect(200)
    } finally {
      await own.close()
    }
  })

  it('is stored as the SHA-256 of its secret, so the table signs nobody in', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: fx.people.board.email, password: testPassword })
      .expect(200)
    const secret = setCookie(res).split(';')[0]!.split('=')[1]!
    const ids = (
      await database.db.select().from(sessions).where(eq(sessions.userId, fx.people.board.id))
    ).map((s) => s.id)
    expect(ids).not.toContain(secret)
    expect(ids).toContain(createHash('sha256').update(secret).digest('hex'))
    // The stored id presented as a cookie is worthless.
    await request(t.app).get('/api/auth/me').set('Cookie', `twofold_session=${ids[0]}`).expect(401)
  })
})
