import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { Readable } from 'node:stream'
import { HeadObjectCommand, S3Client } from '@aws-sdk/client-s3'
import { and, eq } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { clips } from '../../server/db/schema-visits.ts'
import { queues } from '../../server/jobs/queue.ts'
import { projectDir } from '../../server/paths.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { addMembership, createUser } from '../../server/services/members.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { squadBWithCoach } from '../support/visits.ts'
import { addDays, clubWithPeople, floorTucks, signedIn, testPassword } from '../support/fixtures.ts'

// A WebM recorded once in Chromium (seed/clips): real container bytes, 1A 45 DF A3 first.
const webm = readFileSync(join(projectDir, 'seed/clips/attempt-1.webm'))
// An MP4 opens with a box whose type at offset 4 is 'ftyp' (ISO/IEC 14496-12 §4.3); the rest
// of these bytes need not be a playable movie for the type check.
const mp4Head = Buffer.concat([
  Buffer.from([0, 0, 0, 0x18]),
  Buffer.from('ftypisom'),
  Buffer.alloc(200, 1),
])

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let coach: TestAgent
let director: TestAgent
let clinician: TestAgent
let board: TestAgent
let otherCoach: TestAgent
let lateClinician: TestAgent
let athleteId: string
let backTuck: string
const base = () => `/api/clubs/${fx.club.id}`

const upload = (agent: TestAgent, body: Buffer, query: Record<string, string> = {}) =>
  agent
    .post(`${base()}/clips`)
    .query({ athleteId, elementId: backTuck, fileName: 'attempt.webm', ...query })
    .set('Content-Type', 'video/webm')
    .send(body)

const objectExists = async (key: string) => {
  const env = t.context.env
  const client = new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID!, secretAccessKey: env.S3_SECRET_ACCESS_KEY! },
  })
  try {
    await client.send(new HeadObjectCommand({ Bucket: env.S3_BUCKET, Key: key }))
    return true
  } catch {
    return false
  }
}

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { env: { CLIP_MAX_MB: 1 } })
  fx = await clubWithPeople(database.db, 'clips')
  athleteId = (
    await createAthlete(database.db, fx.club.id, {
      givenName: 'Ada',
      familyName: 'Example',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
  ).id
  backTuck = (await floorTucks(database.db, fx.club.id)).backTuck
  // A coach of another squad, and a clinician whose visit ended yesterday.
  await squadBWithCoach(database.db, fx.club.id, 'coach-b-clips@test.example')
  const late = await createUser(database.db, {
    email: 'late-clinician@test.example',
    name: 'Late Clinician',
    password: testPassword,
  })
  await addMembership(database.db, {
    clubId: fx.club.id,
    userId: late.id,
    role: 'clinician',
    accessStartsOn: addDays(-5),
    accessEndsOn: addDays(-1),
  })
  coach = await signedIn(t, fx.people.coach.email)
  director = await signedIn(t, fx.people.director.email)
  clinician = await signedIn(t, fx.people.clinician.email)
  board = await signedIn(t, fx.people.board.email)
  otherCoach = await signedIn(t, 'coach-b-clips@test.example')
  lateClinician = await signedIn(t, 'late-clinician@test.example')
})
afterAll(async () => {
  await t.close()
  await database.close()
})

describe('uploading a clip', () => {
  it('stores a WebM from its bytes and lists it for the coach, the director and the clinician', async () => {
    const res = await upload(coach, webm)
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      athleteName: 'Ada Example',
      contentType: 'video/webm',
      sizeBytes: webm.length,
      fileName: 'attempt.webm',
      reviewedByMe: false,
    })
    for (const agent of [coach, director, clinician]) {
      const list = await agent.get(`${base()}/clips`).query({ athleteId, elementId: backTuck })
      expect(list.status).toBe(200)
      expect(list.body.map((c: { id: string }) => c.id)).toContain(res.body.id)
    }
  })

  it('takes an MP4 by its ftyp box, whatever the declared type', async () => {
    const res = await upload(coach, mp4Head).set('Content-Type', 'application/octet-stream')
    expect(res.status).toBe(201)
    expect(res.body.contentType).toBe('video/mp4')
  })

  it('refuses a file that is not a video with 400 naming the file, storing nothing', async () => {
    const before = await database.db.select().from(clips)
    const png = Buffer.concat([
      Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
      Buffer.alloc(100),
    ])
    const res = await upload(coach, png)
    expect(res.status).toBe(400)
    expect(res.body.error.issues).toEqual([{ path: 'file', message: expect.any(String) }])
    expect(await database.db.select().from(clips)).toHaveLength(before.length)
  })

  it('refuses a JSON body, which holds no video, with 400 naming the file at once', async () => {
    const res = await upload(coach, Buffer.from('{}'))
      .set('Content-Type', 'application/json')
      .timeout(5_000)
    expect(res.status).toBe(400)
    expect(res.body.error.issues).toEqual([
      {
        path: 'file',
        message: 'Send the video file itself as the body of the request, not JSON or a form.',
      },
    ])
  })

  it('refuses a clip over the size limit with 413 naming the file', async () => {
    // CLIP_MAX_MB is 1 here: one byte over 10^6 is too big.
    const res = await upload(coach, Buffer.concat([webm, Buffer.alloc(1_000_001 - webm.length)]))
    expect(res.status).toBe(413)
    expect(res.body.error.issues[0].path).toBe('file')
  })

  it('answers 400 naming the field for a missing element', async () => {
    const res = await coach
      .post(`${base()}/clips`)
      .query({ athleteId })
      .set('Content-Type', 'video/webm')
      .send(webm)
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain('elementId')
  })

  it('refuses the board, a coach of another squad and a clinician (403)', async () => {
    for (const agent of [board, otherCoach, clinician]) {
      expect((await upload(agent, webm)).status).toBe(403)
    }
  })
})

describe('watching a clip', () => {
  let clipId: string
  beforeAll(async () => {
    clipId = (await upload(coach, webm)).body.id
  })

  it('answers a range request with 206 and exactly those bytes', async () => {
    const res = await clinician
      .get(`${base()}/clips/${clipId}/video`)
      .set('Range', 'bytes=100-199')
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(res.status).toBe(206)
    expect(res.headers['accept-ranges']).toBe('bytes')
    expect(res.headers['content-range']).toBe(`bytes 100-199/${webm.length}`)
    expect(res.headers['content-type']).toBe('video/webm')
    expect(Buffer.compare(res.body as Buffer, webm.subarray(100, 200))).toBe(0)
  })

  it('sends the whole file without a range, and 416 for a range past its end', async () => {
    const whole = await coach
      .get(`${base()}/clips/${clipId}/video`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(whole.status).toBe(200)
    expect(Buffer.compare(whole.body as Buffer, webm)).toBe(0)
    const past = await coach
      .get(`${base()}/clips/${clipId}/video`)
      .set('Range', `bytes=${webm.length}-`)
    expect(past.status).toBe(416)
    expect(past.headers['content-range']).toBe(`bytes */${webm.length}`)
  })

  it('refuses the board, a coach of another squad and a clinician outside their visit', async () => {
    expect((await board.get(`${base()}/clips/${clipId}/video`)).status).toBe(403)
    expect((await otherCoach.get(`${base()}/clips/${clipId}/video`)).status).toBe(403)
    expect((await lateClinician.get(`${base()}/clips/${clipId}/video`)).status).toBe(403)
    expect((await otherCoach.get(`${base()}/clips`).query({ athleteId })).status).toBe(403)
  })

  it('leaves the clinician’s list of clips waiting once marked reviewed', async () => {
    const waiting = async () =>
      (await clinician.get(`${base()}/clips`).query({ unreviewed: 'true' })).body.map(
        (c: { id: string }) => c.id,
      )
    expect(await waiting()).toContain(clipId)
    const res = await clinician.post(`${base()}/clips/${clipId}/reviewed`)
    expect(res.status).toBe(200)
    expect(res.body.reviewedByMe).toBe(true)
    expect(await waiting()).not.toContain(clipId)
    // The director's own list is unaffected by the clinician's review.
    const all = await director.get(`${base()}/clips`).query({ unreviewed: 'true' })
    expect(all.body.map((c: { id: string }) => c.id)).toContain(clipId)
  })
})

describe('a recommendation on a clip', () => {
  it('names the clip of the athlete, and refuses a clip of someone else with 400 on clipId', async () => {
    const clipId = (await upload(coach, webm)).body.id as string
    const body = {
      squadId: fx.squad.id,
      athleteId,
      elementId: backTuck,
      suggestedStepIndex: 1,
      clipId,
      text: 'Open the tuck later, as the clip shows.',
      dueOn: addDays(7),
    }
    const res = await clinician.post(`${base()}/recommendations`).send(body)
    expect(res.status).toBe(201)
    expect(res.body.clipId).toBe(clipId)
    const other = await createAthlete(database.db, fx.club.id, {
      givenName: 'Bea',
      familyName: 'Example',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    const wrong = await clinician
      .post(`${base()}/recommendations`)
      .send({ ...body, athleteId: other.id })
    expect(wrong.status).toBe(400)
    expect(wrong.body.error.issues[0].path).toBe('clipId')
  })
})

describe('erasing the athlete', () => {
  it('deletes their clip rows and the stored objects', async () => {
    const clip = (await upload(coach, webm)).body
    const [row] = await database.db
      .select()
      .from(clips)
      .where(and(eq(clips.clubId, fx.club.id), eq(clips.id, clip.id)))
    expect(await objectExists(row!.objectKey)).toBe(true)
    const res = await director
      .post(`${base()}/athletes/${athleteId}/erase`)
      .send({ confirmName: 'Ada Example' })
    expect(res.status).toBe(204)
    expect(
      await database.db.select().from(clips).where(eq(clips.athleteId, athleteId)),
    ).toHaveLength(0)
    expect(await objectExists(row!.objectKey)).toBe(false)
    // Their removal was queued with the erasure as well: had the store failed just then, a
    // worker would retry it.
    const { rows } = await database.pool.query<{ data: { keys: string[] } }>(
      "select data from pgboss.job where name = 'clip-removal'",
    )
    expect(rows.some((r) => r.data.keys.includes(row!.objectKey))).toBe(true)
  })

  it('leaves the objects to a worker when the store fails just as the athlete is erased', async () => {
    const cy = await createAthlete(database.db, fx.club.id, {
      givenName: 'Cy',
      familyName: 'Example',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    const clip = (await upload(coach, webm, { athleteId: cy.id })).body
    const [row] = await database.db
      .select()
      .from(clips)
      .where(and(eq(clips.clubId, fx.club.id), eq(clips.id, clip.id)))
    // The web process's store refuses every request from now on; the worker's still works.
    const working = t.context.clips
    t.context.clips = {
      ...working!,
      remove: () => Promise.reject(new Error('the store is unreachable')),
    }
    try {
      await director
        .post(`${base()}/athletes/${cy.id}/erase`)
        .send({ confirmName: 'Cy Example' })
        .expect(204)
    } finally {
      t.context.clips = working
    }
    await expect.poll(() => objectExists(row!.objectKey), { timeout: 10_000 }).toBe(false)
  })

  it('has a worker delete the objects a queued removal names', async () => {
    const key = `clubs/${fx.club.id}/clips/left-behind`
    await t.context.clips!.put(key, Readable.from([webm]), webm.length, 'video/webm')
    expect(await objectExists(key)).toBe(true)
    await t.context.jobs.send(database.db, queues.clipRemoval, { keys: [key] })
    await expect.poll(() => objectExists(key), { timeout: 10_000 }).toBe(false)
  })
})
