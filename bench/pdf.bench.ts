import { eq, sql } from 'drizzle-orm'
import { clubs, users } from '../server/db/schema-accounts.ts'
import { audits } from '../server/db/schema-audits.ts'
import { runAndStore } from '../server/services/audits.ts'
import type { ReportPdfJob } from '../shared/schemas/report-pdfs.ts'
import { demoPassword, seedDemo } from '../seed/demo.ts'
import { clock } from './clock.ts'
import { withBenchDatabase } from './harness.ts'
import {
  appEnvironment,
  p99,
  paced,
  sessionCookie,
  startServer,
  startWorker,
  within,
  type Window,
} from './load.ts'

/** PDF reports asked for at once in each round, one of each of as many audits. */
const downloads = 40
/** Each round asks as another person: a PDF already drawn for one is not drawn again for them. */
const askers = ['director@demo.example', 'clinician@demo.example']
/** A steady trickle of health checks, as monitoring and a few people would send. */
const perSecond = 200
const idleMs = 2000
/** How often the page of each person waiting polls their PDF, as the client does. */
const pollMs = 500

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/**
 * `/api/health` on a web process while 40 PDF reports of the demo club are asked for at once,
 * polled as the page polls them, drawn by a worker in a process of its own and downloaded;
 * against the same checks, sent at the same steady rate, while nothing is asked for.
 */
export default async function pdfBench() {
  await withBenchDatabase(async (database) => {
    const db = database.db
    await seedDemo(db)
    const [club] = await db.select({ id: clubs.id }).from(clubs)
    const [director] = await db
      .select({ id: users.id })
      .from(users)
      .where(eq(users.email, askers[0]!))
    const access = { clubId: club!.id, userId: director!.id, role: 'director' as const }
    // One audit run, stored again as copies: each PDF is the same work, the audits' runs not.
    const first = await runAndStore(db, access, { squadId: null })
    const copies = await db.execute<{ id: string }>(sql`
      insert into ${audits} (club_id, squad_id, as_of, input_hash, result, figures, created_by)
      select club_id, squad_id, as_of, input_hash, result, figures, created_by
      from ${audits} cross join generate_series(2, ${downloads})
      where club_id = ${club!.id} and id = ${first}
      returning id`)
    const auditIds = [first, ...copies.rows.map((r) => r.id)]

    const env = appEnvironment(database.url)
    const web = await startServer('app', env)
    const worker = await startWorker(env, web.url)
    try {
      const base = `${web.url}/api/clubs/${club!.id}`
      const checks = await paced(`${web.url}/api/health`, perSecond)
      await sleep(3000)
      const idle: Window[] = []
      const busy: Window[] = []
      const waits: number[] = []
      let sizes = 0
      for (const email of askers) {
        const cookie = await sessionCookie(web.url, email, demoPassword)
        const from = clock()
        await sleep(idleMs)
        idle.push({ from, to: clock() })
        const started = clock()
        await Promise.all(
          auditIds.map(async (auditId) => {
            const asked = clock()
            const res = await fetch(`${base}/audits/${auditId}/report-pdfs`, {
              method: 'POST',
              headers: { cookie },
            })
            if (res.status !== 202) throw new Error(`PDF not accepted: ${res.status}`)
            let job = (await res.json()) as ReportPdfJob
            while (job.status === 'running') {
              await sleep(pollMs)
              job = (await (
                await fetch(`${base}/report-pdfs/${job.id}`, { headers: { cookie } })
              ).json()) as ReportPdfJob
            }
            if (job.status !== 'done') throw new Error(`a PDF report ${job.status}`)
            const pdf = await fetch(`${base}/report-pdfs/${job.id}/download`, {
              headers: { cookie },
            })
            const bytes = Buffer.from(await pdf.arrayBuffer())
            if (bytes.subarray(0, 5).toString('latin1') !== '%PDF-') throw new Error('not a PDF')
            sizes += bytes.length
            waits.push(clock() - asked)
          }),
        )
        busy.push({ from: started, to: clock() })
        await sleep(500)
      }
      await checks.stop()

      const failed = checks.responses
        .filter((r) => r.status !== 200)
        .map((r) => r.error ?? r.status)
      if (failed.length) throw new Error(`health checks did not answer 200: ${failed.join(', ')}`)
      const idleMs99 = p99(within(checks, idle))
      const busyMs99 = p99(within(checks, busy))
      const seconds = busy.map((w) => ((w.to - w.from) / 1000).toFixed(1)).join(', ')
      waits.sort((a, b) => a - b)
      console.log(`\nGET /api/health on the web process, ${perSecond} checks a second`)
      console.log(
        `  while ${downloads} PDF reports of the demo club were asked for at once, polled, drawn on a worker process and downloaded (${seconds} s): p99 ${busyMs99.toFixed(1)} ms (${within(checks, busy).length} checks)`,
      )
      console.log(
        `  baseline (nothing asked for, in between): p99 ${idleMs99.toFixed(1)} ms (${within(checks, idle).length} checks)`,
      )
      console.log(`  ratio (p99): ${(busyMs99 / idleMs99).toFixed(2)}×`)
      console.log(
        `  each PDF from the ask to its last byte: median ${(waits[waits.length >> 1]! / 1000).toFixed(1)} s, ` +
          `longest ${(waits.at(-1)! / 1000).toFixed(1)} s; ${Math.round(sizes / waits.length / 1000)} kB each`,
      )
    } finally {
      await Promise.all([web.stop(), worker.stop()])
    }
  })
}
