import pino from 'pino'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { startJobWorker, type JobWorker } from '../../server/jobs/worker.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { getReportPdf, submitReportPdf } from '../../server/services/report-pdfs.ts'
import { testApp, testJobSettings, type TestApp } from '../support/app.ts'
import { freshDatabase } from '../support/database.ts'
import { clubWithPeople } from '../support/fixtures.ts'
import type { ReportPdfJob } from '../../shared/schemas/report-pdfs.ts'

let database: Database
let t: TestApp
let worker: JobWorker | undefined

beforeAll(async () => {
  database = await freshDatabase()
  // A web process only: the jobs wait in the queue until the worker below starts.
  t = await testApp(database, { worker: false })
})
afterAll(async () => {
  await worker?.stop(2_000)
  await t.close()
  await database.close()
})

describe('a job worker', () => {
  it('takes the next job as soon as it has finished one, not at its next poll', async () => {
    const fx = await clubWithPeople(database.db, 'drain')
    const access = { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' as const }
    const pdfs: ReportPdfJob[] = []
    for (let i = 0; i < 3; i++) {
      const auditId = await runAndStore(database.db, access, { squadId: null })
      pdfs.push(await submitReportPdf(database.db, t.context.jobs, access, auditId))
    }
    // Polling every 30 s, a worker that waited between jobs would take a minute for the last.
    const started = Date.now()
    worker = await startJobWorker({
      connectionString: database.url,
      db: database.db,
      mailer: t.mailer,
      logger: pino({ level: 'silent' }),
      settings: { ...testJobSettings, pollSeconds: 30 },
    })
    await expect
      .poll(
        async () => {
          const states = await Promise.all(
            pdfs.map((p) => getReportPdf(database.db, t.context.jobs, access, p.id)),
          )
          return states.map((s) => s.status)
        },
        { timeout: 20_000, interval: 200 },
      )
      .toEqual(['done', 'done', 'done'])
    expect(Date.now() - started).toBeLessThan(20_000)
  })
})
