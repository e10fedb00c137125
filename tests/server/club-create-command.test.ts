import { spawnSync } from 'node:child_process'
import { eq, sql } from 'drizzle-orm'
import { describe, expect, it } from 'vitest'
import { clubs, mailOutbox } from '../../server/db/schema-accounts.ts'
import { pendingMigrations } from '../../server/db/migrate.ts'
import { createJobQueue, missingQueues, queues } from '../../server/jobs/queue.ts'
import { projectDir } from '../../server/paths.ts'
import { emptyDatabase, freshDatabase } from '../support/database.ts'

// `npm run club:create` against a deployment's database (DATABASE_URL): it adds the clubs and
// queues their invitations, and leaves the migrating to `npm run db:migrate` and the sending to
// the deployment's workers (a worker of its own would take every queue's jobs, other clubs'
// mail among them, and send it through whatever mail setting the operator's shell has).

const club = ['--club', 'Fernhill Acro', '--director-email', 'ines.varga@fernhill.example']
const director = ['--director-name', 'Ines Varga']

function createClub(env: Record<string, string>) {
  const { DATABASE_URL: _, PUBLIC_URL: __, SMTP_URL: ___, ...inherited } = process.env
  return spawnSync(
    process.execPath,
    ['--import', 'tsx', 'server/cli/create-club.ts', ...club, ...director],
    { cwd: projectDir, env: { ...inherited, LOG_LEVEL: 'silent', ...env }, encoding: 'utf8' },
  )
}

describe('setting up a club in a deployment’s database', () => {
  it('queues the invitation, linking to PUBLIC_URL, for the deployment’s workers', async () => {
    const database = await freshDatabase()
    try {
      const run = createClub({
        DATABASE_URL: database.url,
        PUBLIC_URL: 'https://clubs.example.org',
      })
      expect(run.stderr).toBe('')
      expect(run.status).toBe(0)
      expect(run.stdout).toContain('created  Fernhill Acro  fernhill-acro, director invited')
      expect(run.stdout).toContain('1 invitation(s) queued')
      const [created] = await database.db
        .select()
        .from(clubs)
        .where(eq(clubs.slug, 'fernhill-acro'))
      expect(created?.name).toBe('Fernhill Acro')
      // Still in the outbox: no worker of the command's own sent it.
      const [invitation] = await database.db
        .select()
        .from(mailOutbox)
        .where(eq(mailOutbox.to, 'ines.varga@fernhill.example'))
      expect(invitation?.sentAt).toBeNull()
      expect(invitation?.text).toContain('https://clubs.example.org/')
    } finally {
      await database.close()
    }
  }, 60_000)

  it('needs PUBLIC_URL, which the invitation links to', async () => {
    const database = await freshDatabase()
    try {
      const run = createClub({ DATABASE_URL: database.url })
      expect(run.status).toBe(2)
      expect(run.stderr).toContain('PUBLIC_URL is required with DATABASE_URL')
      const rows = await database.db.select().from(clubs)
      expect(rows).toEqual([])
    } finally {
      await database.close()
    }
  }, 60_000)

  it('does not migrate a database, and sends the operator to npm run db:migrate', async () => {
    const database = await emptyDatabase()
    try {
      const before = await pendingMigrations(database.db)
      expect(before).toBeGreaterThan(20)
      const run = createClub({
        DATABASE_URL: database.url,
        PUBLIC_URL: 'https://clubs.example.org',
      })
      expect(run.status).toBe(2)
      expect(run.stderr).toContain(`lacks ${before} migration(s): run npm run db:migrate first`)
      const { rows } = await database.db.execute<{ present: boolean }>(
        sql`select to_regclass('public.clubs') is not null as present`,
      )
      expect(rows[0]?.present).toBe(false)
    } finally {
      await database.close()
    }
  }, 60_000)
})

describe('a database whose job queues this release has not installed', () => {
  it('refuses a job for a missing queue, and club:create sends the operator to db:migrate', async () => {
    const database = await freshDatabase()
    try {
      expect(await missingQueues(database.db)).toEqual([])
      await database.pool.query("delete from pgboss.queue where name = 'clip-removal'")
      expect(await missingQueues(database.db)).toEqual(['clip-removal'])
      // pg-boss would answer null and write nothing: the sender says so instead.
      const jobs = createJobQueue(database.db)
      await expect(
        jobs.send(database.db, queues.clipRemoval, { keys: ['clubs/x/clips/y'] }),
      ).rejects.toMatchObject({ status: 503, code: 'jobs_not_ready' })
      const run = createClub({
        DATABASE_URL: database.url,
        PUBLIC_URL: 'https://clubs.example.org',
      })
      expect(run.status).toBe(2)
      expect(run.stderr).toContain('lacks the job queues clip-removal: run npm run db:migrate')
    } finally {
      await database.close()
    }
  }, 60_000)
})
