import { eq } from 'drizzle-orm'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import { publicOrigin } from '../../server/context.ts'
import type { Database } from '../../server/db/client.ts'
import { clubs, invitations } from '../../server/db/schema-accounts.ts'
import { elements } from '../../server/db/schema-catalogue.ts'
import {
  ClubFileError,
  readClubsCsv,
  setUpClub,
  setUpClubsFromCsv,
  type ClubSetupDeps,
} from '../../server/services/club-setup.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, testEnv, type TestApp } from '../support/app.ts'

// The operator's command (`npm run club:create`) for a federation setting up clubs: its core,
// called directly, with the app's own mailer (the local fake) and link address.

let database: Database
let t: TestApp
let deps: ClubSetupDeps

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  deps = { db: database.db, jobs: t.context.jobs, origin: publicOrigin(testEnv) }
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const tokenIn = (text: string) => /#token=([A-Za-z0-9_-]+)/.exec(text)?.[1] ?? ''

async function clubNamed(name: string) {
  const [club] = await database.db.select().from(clubs).where(eq(clubs.name, name))
  return club
}

describe('setting up one club', () => {
  it('creates the club with the standard catalogue and invites its director by e-mail', async () => {
    const outcome = await setUpClub(deps, {
      club: 'Harrowgate Trampoline Club',
      directorEmail: 'Mira.Holt@harrowgate.example',
      directorName: 'Mira Holt',
    })
    expect(outcome).toEqual({
      row: 1,
      club: 'Harrowgate Trampoline Club',
      status: 'created',
      slug: 'harrowgate-trampoline-club',
      directorEmail: 'mira.holt@harrowgate.example',
    })
    const club = (await clubNamed('Harrowgate Trampoline Club'))!
    const own = await database.db.select().from(elements).where(eq(elements.clubId, club.id))
    expect(own).toHaveLength(standardCatalogue.length)

    const mail = await t.mailer.fake!.waitFor('mira.holt@harrowgate.example')
    expect(mail.text).toContain('Hello Mira Holt,')
    expect(mail.text).toMatch(/http:\/\/127\.0\.0\.1:3000\/accept-invitation#token=/)
    const token = tokenIn(mail.text)
    const preview = await request(t.app)
      .post('/api/auth/invitations/preview')
      .send({ token })
      .expect(200)
    expect(preview.body).toMatchObject({ clubName: club.name, role: 'director' })
    const accepted = await request(t.app)
      .post('/api/auth/invitations/accept')
      .send({ token, name: 'Mira Holt', password: 'thistle-cobalt-meadow-71' })
      .expect(200)
    expect(accepted.body.memberships).toEqual([
      expect.objectContaining({ clubId: club.id, role: 'director' }),
    ])
  })

  it('refuses a club of the same name that has members, creating nothing', async () => {
    const before = (await database.db.select().from(clubs)).length
    const outcome = await setUpClub(deps, {
      club: 'harrowgate trampoline club',
      directorEmail: 'second@harrowgate.example',
      directorName: 'Second Director',
    })
    expect(outcome).toMatchObject({ status: 'failed', reason: expect.stringMatching(/members/) })
    expect(await database.db.select().from(clubs)).toHaveLength(before)
  })

  it('keeps nothing when the invitation cannot be put on its way', async () => {
    const broken = { ...deps, jobs: { send: () => Promise.reject(new Error('queue refused')) } }
    const outcome = await setUpClub(broken, {
      club: 'Unsent Gymnastics',
      directorEmail: 'unsent@test.example',
      directorName: 'Una Sent',
    })
    expect(outcome).toMatchObject({ status: 'failed', reason: expect.stringMatching(/refused/) })
    expect(await clubNamed('Unsent Gymnastics')).toBeUndefined()
  })
})

describe('setting up clubs from a CSV file', () => {
  const file = [
    'club,directorEmail,directorName',
    'Brackwater Acro,ada@brackwater.example,Ada Brack',
    'Cinderford Tumbling,not-an-address,Cy Inder',
    '"Dunmere\tGymnastics",dee@dunmere.example,Dee Mere',
    'Elmstead Flyers,eli@elmstead.example,Eli Stead',
  ].join('\n')

  it('creates each good row in its own transaction and reports each bad row with its reason', async () => {
    const outcomes = await setUpClubsFromCsv(deps, file)
    expect(outcomes.map((o) => [o.row, o.status])).toEqual([
      [1, 'created'],
      [2, 'failed'],
      [3, 'failed'],
      [4, 'created'],
    ])
    expect(outcomes[1]).toMatchObject({ reason: expect.stringMatching(/^directorEmail: /) })
    expect(outcomes[2]).toMatchObject({ reason: expect.stringMatching(/^club: Remove a tab/) })
    expect(await clubNamed('Brackwater Acro')).toBeDefined()
    expect(await clubNamed('Elmstead Flyers')).toBeDefined()
    expect(await clubNamed('Cinderford Tumbling')).toBeUndefined()
    await t.mailer.fake!.waitFor('ada@brackwater.example')
    await t.mailer.fake!.waitFor('eli@elmstead.example')
  })

  it('run again, invites the directors of clubs nobody joined yet, and the old link stops', async () => {
    const first = await t.mailer.fake!.waitFor('ada@brackwater.example')
    const oldToken = tokenIn(first.text)
    const outcomes = await setUpClubsFromCsv(deps, file)
    expect(outcomes.map((o) => o.status)).toEqual([
      'invited-again',
      'failed',
      'failed',
      'invited-again',
    ])
    const club = (await clubNamed('Brackwater Acro'))!
    const open = await database.db.select().from(invitations).where(eq(invitations.clubId, club.id))
    expect(open.filter((i) => i.withdrawnAt === null)).toHaveLength(1)
    expect(
      (await database.db.select().from(clubs).where(eq(clubs.name, 'Brackwater Acro'))).length,
    ).toBe(1)
    await request(t.app).post('/api/auth/invitations/preview').send({ token: oldToken }).expect(410)
  })

  it('refuses a file without the columns, naming the missing one', () => {
    expect(() => readClubsCsv('club,email\nA club,a@b.example')).toThrow(ClubFileError)
    expect(() => readClubsCsv('club,email\nA club,a@b.example')).toThrow(
      /missing: directorEmail, directorName/,
    )
    expect(() => readClubsCsv('club,directorEmail,directorName\n')).toThrow(/no rows/)
  })
})
