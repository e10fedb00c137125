import { eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { hashToken } from '../../server/auth/tokens.ts'
import { invitations, invitationTokens, memberships } from '../../server/db/schema-accounts.ts'
import { visits } from '../../server/db/schema-visits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: Awaited<ReturnType<typeof signedIn>>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'members')
  director = await signedIn(t, fx.people.director.email)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const base = () => `/api/clubs/${fx.club.id}`
const linkIn = (text: string) => /accept-invitation#token=([A-Za-z0-9_-]+)/.exec(text)?.[1]
const linksOf = async (invitationId: string) =>
  (
    await database.db
      .select({ tokenHash: invitationTokens.tokenHash })
      .from(invitationTokens)
      .where(eq(invitationTokens.invitationId, invitationId))
  ).map((r) => r.tokenHash)

describe('invitations', () => {
  it('e-mails a working link through the fake SMTP server; accepting it creates the account and signs in', async () => {
    const email = 'new.coach@test.example'
    const created = await director.post(`${base()}/invitations`).send({ email, role: 'coach' })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ email, role: 'coach', status: 'pending' })

    const mail = await t.mailer.fake!.waitFor(email)
    expect(mail.subject).toBe(`You are invited to ${fx.club.name} on Twofold`)
    const token = linkIn(mail.text)!
    expect(token).toBeDefined()
    // at least 128 bits: 22 base64url characters carry 132
    expect(token.length).toBeGreaterThanOrEqual(22)
    // Only the hash is stored, in the table of links, found without knowing the club.
    const [stored] = await database.db
      .select()
      .from(invitations)
      .where(eq(invitations.email, email))
    const links = await linksOf(stored!.id)
    expect(links).toEqual([hashToken(token)])
    expect(links[0]).not.toContain(token)

    const preview = await request(t.app).post('/api/auth/invitations/preview').send({ token })
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({
      clubName: fx.club.name,
      role: 'coach',
      existingAccount: false,
    })

    const weak = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, name: 'Nia', password: 'qwerty123' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.issues[0].path).toBe('password')

    const agent = request.agent(t.app)
    const accepted = await agent
      .post('/api/auth/invitations/accept')
      .send({ token, name: 'Nia Coldmere', password: 'juniper-cobalt-sprocket-4' })
    expect(accepted.status).toBe(200)
    expect(accepted.body.activeClubId).toBe(fx.club.id)
    expect(accepted.body.memberships[0]).toMatchObject({ clubId: fx.club.id, role: 'coach' })
    await agent.get(`${base()}/`).expect(200)

    const reuse = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, name: 'X', password: 'juniper-cobalt-sprocket-4' })
    expect(reuse.status).toBe(410)
    // The spent link is gone.
    expect(await linksOf(stored!.id)).toEqual([])
  })

  it('lets a person with an account in another club join with their own password', async () => {
    const other = await clubWithPeople(database.db, 'visiting')
    const email = other.people.clinician.email
    await director
      .post(`${base()}/invitations`)
      .send({ email, role: 'clinician', accessStartsOn: addDays(0), accessEndsOn: addDays(3) })
      .expect(201)
    const token = linkIn((await t.mailer.fake!.waitFor(email)).text)!
    const preview = await request(t.app).post('/api/auth/invitations/preview').send({ token })
    expect(preview.body.existingAccount).toBe(true)
    const wrong = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, password: 'not-my-password' })
    expect(wrong.status).toBe(400)
    const agent = request.agent(t.app)
    const res = await agent
      .post('/api/auth/invitations/accept')
      .send({ token, password: testPassword })
    expect(res.status).toBe(200)
    expect(res.body.memberships.map((m: { clubId: string }) => m.clubId).sort()).toEqual(
      [fx.club.id, other.club.id].sort(),
    )
    // switching between the two clubs
    const switched = await agent.post('/api/auth/club').send({ clubId: other.club.id })
    expect(switched.body.activeClubId).toBe(other.club.id)
  })

  it('asks for a clinician window and checks its order', async () => {
    const res = await director.post(`${base()}/invitations`).send({
      email: 'vis@test.example',
      role: 'clinician',
      accessStartsOn: '2026-05-10',
      accessEndsOn: '2026-05-01',
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues).toEqual([
      { path: 'accessEndsOn', message: 'The last day cannot be before the first day.' },
    ])
    const missing = await director
      .post(`${base()}/invitations`)
      .send({ email: 'vis@test.example', role: 'clinician' })
    expect(missing.body.error.issues.map((i: { path: string }) => i.path)).toEqual([
      'accessStartsOn',
      'accessEndsOn',
    ])
  })

  it('refuses to invite a member or someone already invited, naming the field', async () => {
    const member = await director
      .post(`${base()}/invitations`)
      .send({ email: fx.people.coach.email, role: 'coach' })
    expect(member.status).toBe(409)
    expect(member.body.error.issues[0].path).toBe('email')
    await director
      .post(`${base()}/invitations`)
      .send({ email: 'twice@test.example', role: 'board' })
      .expect(201)
    const twice = await director
      .post(`${base()}/invitations`)
      .send({ email: 'twice@test.example', role: 'board' })
    expect(twice.status).toBe(409)
    expect(twice.body.error.code).toBe('already_invited')
  })

  it('a resent invitation replaces the old link; a withdrawn one stops working', async () => {
    const email = 'resend@test.example'
    const { body } = await director
      .post(`${base()}/invitations`)
      .send({ email, role: 'board' })
      .expect(201)
    const first = linkIn((await t.mailer.fake!.waitFor(email)).text)!
    await director.post(`${base()}/invitations/${body.id}/resend`).expect(204)
    const mailTo = () => t.mailer.fake!.messages().filter((m) => m.to.includes(email))
    // Mail goes out from a worker, a moment after the request.
    await expect.poll(() => mailTo().length).toBe(2)
    const messages = mailTo()
    const second = linkIn(messages[0]!.text)!
    expect(second).not.toBe(first)
    await request(t.app).post('/api/auth/invitations/preview').send({ token: first }).expect(410)
    await request(t.app).post('/api/auth/invitations/preview').send({ token: second }).expect(200)
    expect(await linksOf(body.id)).toEqual([hashToken(second)])
    await director.delete(`${base()}/invitations/${body.id}`).expect(204)
    await request(t.app).post('/api/auth/invitations/preview').send({ token: second }).expect(410)
    expect(await linksOf(body.id)).toEqual([])
  })

  it('expires after 7 days', async () => {
    const email = 'late@test.example'
    await director.post(`${base()}/invitations`).send({ email, role: 'board' }).expect(201)
    const token = linkIn((await t.mailer.fake!.waitFor(email)).text)!
    await database.db
      .update(invitations)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(invitations.email, email))
    await request(t.app).post('/api/auth/invitations/preview').send({ token }).expect(410)
    const listed = (await director.get(`${base()}/invitations`).expect(200)).body as {
      email: string
      status: string
    }[]
    expect(listed.find((i) => i.email === email)?.status).toBe('expired')
  })
})

describe('members', () => {
  it('lists the members with their roles and squads', async () => {
    const res = await director.get(`${base()}/members`).expect(200)
    const coach = res.body.find((m: { userId: string }) => m.userId === fx.people.coach.id)
    expect(coach).toMatchObject({ role: 'coach', squadIds: [fx.squad.id] })
  })

  it('changes a role', async () => {
    const res = await director
      .patch(`${base()}/members/${fx.people.board.id}`)
      .send({ role: 'coach' })
    expect(res.status).toBe(200)
    expect(res.body.role).toBe('coach')
    await director
      .patch(`${base()}/members/${fx.people.board.id}`)
      .send({ role: 'board' })
      .expect(200)
  })

  it('keeps at least one director', async () => {
    const res = await director
      .patch(`${base()}/members/${fx.people.director.id}`)
      .send({ role: 'coach' })
    expect(res.status).toBe(409)
    expect(res.body.error.code).toBe('last_director')
  })

  it('ending a membership ends that person’s sessions in the club', async () => {
    const other = await clubWithPeople(database.db, 'ending')
    const coach = await signedIn(t, other.people.coach.email)
    const otherDirector = await signedIn(t, other.people.director.email)
    await coach.get(`/api/clubs/${other.club.id}/`).expect(200)
    await otherDirector
      .delete(`/api/clubs/${other.club.id}/members/${other.people.coach.id}`)
      .expect(204)
    await coach.get('/api/auth/me').expect(401)
    const rows = await database.db
      .select()
      .from(memberships)
      .where(eq(memberships.userId, other.people.coach.id))
    expect(rows).toHaveLength(0)
  })
})

describe('clinician windows', () => {
  // Access derives from the clinician's visits (the membership's dates became one).
  it.each([
    ['not yet open', 1, 5, `Your next visit runs from ${addDays(1)} to ${addDays(5)}`],
    ['already closed', -5, -1, 'You have no visit scheduled'],
  ])('refuses a clinician whose window is %s, saying why', async (_label, from, to, said) => {
    const other = await clubWithPeople(database.db, `win${from}`)
    await database.db
      .update(visits)
      .set({ firstDay: addDays(from), lastDay: addDays(to) })
      .where(eq(visits.clinicianId, other.people.clinician.id))
    const agent = await signedIn(t, other.people.clinician.email)
    const res = await agent.get(`/api/clubs/${other.club.id}/`)
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe('access_window_closed')
    expect(res.body.error.message).toContain(said)
    const me = await agent.get('/api/auth/me').expect(200)
    expect(me.body.memberships[0].accessOpen).toBe(false)
  })
})
