import { createHash } from 'node:crypto'
import { eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { progressionTemplates } from '../../shared/domain/progression-templates.ts'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import {
  defaultPasswordRules,
  defaultResetRules,
  defaultSignupRules,
} from '../../server/auth/limits.ts'
import { purgeExpired } from '../../server/auth/purge.ts'
import type { Database } from '../../server/db/client.ts'
import { clubSignups, clubs, memberships, users } from '../../server/db/schema-accounts.ts'
import { elements } from '../../server/db/schema-catalogue.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, testPassword } from '../support/fixtures.ts'

// A person starts a club: a request e-mails a single-use link (OWASP Forgot Password Cheat
// Sheet: a random token stored hashed, expiring, never built from the Host header, the same
// answer whether or not the address has an account), and confirming it makes the club and its
// director in one go.

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>

const strong = 'quill-harbour-sorrel-58'

beforeAll(async () => {
  database = await freshDatabase()
  // Per client the count is lifted here, so that the file's many requests from one address test
  // the other rules; the per-client default is tested on its own below.
  t = await testApp(database, {
    limits: {
      password: defaultPasswordRules,
      reset: defaultResetRules,
      signup: { ...defaultSignupRules, client: { points: 1000, seconds: 3600 } },
    },
  })
  fx = await clubWithPeople(database.db, 'signup')
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const linkIn = (text: string) => /(https?:\/\/\S+)/.exec(text)?.[1] ?? ''
const tokenIn = (text: string) => /#token=([A-Za-z0-9_-]+)/.exec(text)?.[1] ?? ''

let sequence = 0
/** A sign-up request for a new club; answers the token from the mail and the mail itself. */
async function requestSignup(
  input: { clubName?: string; name?: string; email?: string } = {},
  app = t,
) {
  sequence += 1
  const body = {
    clubName: input.clubName ?? `Lowfield Tumbling Club ${sequence}`,
    name: input.name ?? 'Ines Marwick',
    email: input.email ?? `ines.${sequence}@lowfield.example`,
  }
  const before = app.mailer.fake!.messages().length
  const res = await request(app.app).post('/api/signup/request').send(body)
  expect(res.status).toBe(202)
  await expect.poll(() => app.mailer.fake!.messages().length).toBeGreaterThan(before)
  const mail = await app.mailer.fake!.waitFor(body.email)
  return { ...body, res, mail, token: tokenIn(mail.text) }
}

const confirm = (token: string, password: string) =>
  request(t.app).post('/api/signup/confirm').send({ token, password })

describe('starting a club', () => {
  it('e-mails a link, and confirming it makes the club with its director signed in', async () => {
    const { token, mail, email, clubName } = await requestSignup({
      clubName: 'Lowfield Tumbling Club',
    })
    expect(linkIn(mail.text)).toMatch(/^http:\/\/127\.0\.0\.1:3000\/confirm-club#token=/)
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/)
    // Only the token's SHA-256 is stored.
    const [stored] = await database.db
      .select()
      .from(clubSignups)
      .where(eq(clubSignups.tokenHash, createHash('sha256').update(token).digest('hex')))
    expect(stored?.email).toBe(email)
    expect(JSON.stringify(stored)).not.toContain(token)

    const preview = await request(t.app).post('/api/signup/preview').send({ token }).expect(200)
    expect(preview.body).toEqual({ clubName, name: 'Ines Marwick', email, existingAccount: false })

    const res = await confirm(token, strong).expect(201)
    const cookie = String(res.headers['set-cookie']).split(';')[0]!
    expect(cookie).toMatch(/^twofold_session=[a-z0-9]+$/)
    expect(res.body.memberships).toEqual([
      expect.objectContaining({ clubName, role: 'director', accessOpen: true }),
    ])
    const clubId = res.body.activeClubId as string
    expect(res.body.memberships[0].clubId).toBe(clubId)

    const [club] = await database.db.select().from(clubs).where(eq(clubs.id, clubId))
    expect(club?.slug).toBe('lowfield-tumbling-club')
    const me = await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(200)
    expect(me.body.user).toMatchObject({ email, name: 'Ines Marwick' })
    const catalogue = await request(t.app)
      .get(`/api/clubs/${clubId}/elements`)
      .set('Cookie', cookie)
      .expect(200)
    expect(catalogue.body).toHaveLength(standardCatalogue.length)
    const templates = await request(t.app)
      .get(`/api/clubs/${clubId}/progression-templates`)
      .set('Cookie', cookie)
      .expect(200)
    expect(templates.body).toHaveLength(Object.keys(progressionTemplates).length)
  })

  it('makes a link work once: the second confirm is told the link is spent', async () => {
    const { token } = await requestSignup()
    await confirm(token, strong).expect(201)
    const again = await confirm(token, strong)
    expect(again.status).toBe(410)
    expect(again.body.error.code).toBe('signup_invalid')
    expect(again.body.error.message).toMatch(/already used/)
    await request(t.app).post('/api/signup/preview').send({ token }).expect(410)
  })

  it('refuses an expired link, and makes no club', async () => {
    const { token, clubName } = await requestSignup()
    await database.db
      .update(clubSignups)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(clubSignups.tokenHash, createHash('sha256').update(token).digest('hex')))
    await request(t.app).post('/api/signup/preview').send({ token }).expect(410)
    expect((await confirm(token, strong)).status).toBe(410)
    expect(await database.db.select().from(clubs).where(eq(clubs.name, clubName))).toEqual([])
  })

  it('refuses a weak password naming the field, and the link still works', async () => {
    const { token, email } = await requestSignup()
    const weak = await confirm(token, 'password1')
    expect(weak.status).toBe(400)
    expect(weak.body.error.code).toBe('weak_password')
    expect(weak.body.error.issues).toEqual([
      expect.objectContaining({ path: 'password', message: expect.stringMatching(/easy/) }),
    ])
    expect(await database.db.select().from(users).where(eq(users.email, email))).toEqual([])
    await confirm(token, strong).expect(201)
  })

  it('gives two clubs of the same name each a slug of their own', async () => {
    const first = await requestSignup({ clubName: 'Étoile Acro' })
    const second = await requestSignup({ clubName: 'Étoile Acro' })
    const a = await confirm(first.token, strong).expect(201)
    const b = await confirm(second.token, strong).expect(201)
    const slugs = await database.db
      .select({ slug: clubs.slug })
      .from(clubs)
      .where(eq(clubs.name, 'Étoile Acro'))
    expect(slugs.map((s) => s.slug).sort()).toEqual(['etoile-acro', 'etoile-acro-2'])
    expect(a.body.activeClubId).not.toBe(b.body.activeClubId)
  })

  it('refuses a form without a club name or with a bad address, naming the fields', async () => {
    const res = await request(t.app)
      .post('/api/signup/request')
      .send({ clubName: ' ', name: 'Ines', email: 'not-an-address' })
      .expect(400)
    const paths = res.body.error.issues.map((i: { path: string }) => i.path).sort()
    expect(paths).toEqual(['clubName', 'email'])
  })
})

describe('an address that already has an account', () => {
  it('gets the same answer as a new one', async () => {
    const known = await requestSignup({ email: fx.people.coach.email })
    const unknown = await requestSignup({ email: 'nobody.yet@lowfield.example' })
    const generic = (body: { message: string }, email: string) => body.message.replace(email, '…')
    expect(generic(known.res.body, known.email)).toBe(generic(unknown.res.body, unknown.email))
  })

  it('confirms with its current password, and becomes director of the new club too', async () => {
    const { token, clubName } = await requestSignup({ email: fx.people.board.email })
    const preview = await request(t.app).post('/api/signup/preview').send({ token }).expect(200)
    expect(preview.body.existingAccount).toBe(true)
    const wrong = await confirm(token, strong)
    expect(wrong.status).toBe(400)
    expect(wrong.body.error.issues[0].path).toBe('password')
    const res = await confirm(token, testPassword).expect(201)
    const roles = res.body.memberships.map((m: { clubName: string; role: string }) => [
      m.clubName,
      m.role,
    ])
    expect(roles).toEqual(
      expect.arrayContaining([
        [clubName, 'director'],
        [fx.club.name, 'board'],
      ]),
    )
    // Its password is the one it had.
    const [user] = await database.db.select().from(users).where(eq(users.id, fx.people.board.id))
    expect(user?.passwordHash).toBeTruthy()
  })

  it('stops guessing that password through the link, under the sign-in limits', async () => {
    const target = (await clubWithPeople(database.db, 'signup-guess')).people.coach.email
    const { token } = await requestSignup({ email: target })
    const answers: number[] = []
    for (let i = 0; i < 7; i++) answers.push((await confirm(token, `wrong-guess-${i}`)).status)
    expect(answers).toEqual([400, 400, 400, 400, 400, 429, 429])
    const right = await confirm(token, testPassword)
    expect(right.status).toBe(429)
    expect(Number(right.headers['retry-after'])).toBeGreaterThan(0)
  })
})

describe('limits on sign-up mail', () => {
  it('limits the links asked for one address', async () => {
    const email = 'many.links@lowfield.example'
    const statuses: number[] = []
    for (let i = 0; i < 5; i++) {
      const res = await request(t.app)
        .post('/api/signup/request')
        .send({ clubName: `Club ${i}`, name: 'Ines', email })
      statuses.push(res.status)
      if (res.status === 429) expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)
    }
    expect(statuses).toEqual([202, 202, 202, 429, 429])
  })

  it('limits the links one client asks for, leaving other clients alone', async () => {
    const own = await testApp(database, { env: { TRUST_PROXY: 1 } })
    try {
      const from = (ip: string, i: number) =>
        request(own.app)
          .post('/api/signup/request')
          .set('X-Forwarded-For', ip)
          .send({ clubName: 'Spam Club', name: 'Ines', email: `spray-${ip}-${i}@test.example` })
      const statuses: number[] = []
      for (let i = 0; i <= defaultSignupRules.client.points; i++)
        statuses.push((await from('203.0.113.50', i)).status)
      expect(statuses.filter((s) => s === 202)).toHaveLength(defaultSignupRules.client.points)
      const refused = await from('203.0.113.50', 99)
      expect(refused.status).toBe(429)
      expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0)
      await from('203.0.113.51', 0).expect(202)
    } finally {
      await own.close()
    }
  })
})

describe('the link and what the new director reaches', () => {
  it('builds the link on the address the server listens on, whatever Host says', async () => {
    const email = 'forged.host@lowfield.example'
    await request(t.app)
      .post('/api/signup/request')
      .set('Host', 'attacker.example')
      .set('X-Forwarded-Host', 'attacker.example')
      .send({ clubName: 'Hostile Club', name: 'Ines', email })
      .expect(202)
    const mail = await t.mailer.fake!.waitFor(email)
    expect(linkIn(mail.text)).toMatch(/^http:\/\/127\.0\.0\.1:3000\/confirm-club#token=/)
    expect(mail.text).not.toContain('attacker.example')
  })

  it('shows the new director nothing of another club (its ids answer 404)', async () => {
    const { token } = await requestSignup()
    const res = await confirm(token, strong).expect(201)
    const cookie = String(res.headers['set-cookie']).split(';')[0]!
    await request(t.app)
      .get(`/api/clubs/${res.body.activeClubId}/`)
      .set('Cookie', cookie)
      .expect(200)
    for (const path of ['/', '/elements', '/squads']) {
      await request(t.app).get(`/api/clubs/${fx.club.id}${path}`).set('Cookie', cookie).expect(404)
    }
    const mine = await database.db
      .select()
      .from(memberships)
      .where(eq(memberships.clubId, res.body.activeClubId))
    expect(mine).toHaveLength(1)
    const ownElements = await database.db
      .select({ id: elements.id })
      .from(elements)
      .where(eq(elements.clubId, res.body.activeClubId))
    expect(ownElements).toHaveLength(standardCatalogue.length)
  })

  it('purges used and expired sign-ups', async () => {
    const { token } = await requestSignup()
    await database.db
      .update(clubSignups)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(clubSignups.tokenHash, createHash('sha256').update(token).digest('hex')))
    const purged = await purgeExpired(database.db)
    expect(purged.signups).toBeGreaterThan(0)
    const left = await database.db.select().from(clubSignups)
    expect(left.every((r) => r.usedAt === null && r.expiresAt.getTime() > Date.now())).toBe(true)
  })
})
