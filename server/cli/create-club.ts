import { readFileSync } from 'node:fs'
import { createInterface } from 'node:readline'
import { parseArgs } from 'node:util'
import { publicOrigin } from '../context.ts'
import { createDatabase } from '../db/client.ts'
import { pendingMigrations } from '../db/migrate.ts'
import { jobSettingsOf, parseEnv } from '../env.ts'
import { and, gte, inArray, isNull, sql } from 'drizzle-orm'
import pino from 'pino'
import { mailOutbox } from '../db/schema-accounts.ts'
import { createJobQueue, missingQueues } from '../jobs/queue.ts'
import { startJobWorker } from '../jobs/worker.ts'
import { createMailer } from '../mail/mailer.ts'
import { clubSetupRowSchema } from '../../shared/schemas/signup.ts'
import {
  ClubFileError,
  describeIssues,
  setUpClub,
  setUpClubsFromCsv,
  type ClubSetupOutcome,
} from '../services/club-setup.ts'
import { localDatabase, prepareDatabase } from './bootstrap.ts'
import { stopCluster } from './postgres.ts'

// `npm run club:create`: a federation sets up clubs, each with its director invited by e-mail.

const usage = `Sets up clubs with the standard catalogue and e-mails each director an invitation.

  npm run club:create -- --club "Name" --director-email a@b.example --director-name "Name"
  npm run club:create -- --file clubs.csv      (columns club,directorEmail,directorName)

With DATABASE_URL (a deployment's database, migrated with npm run db:migrate), PUBLIC_URL is
required and the invitations are queued for the deployment's workers to send. Without it, the
project-local database is used and this command sends them itself: to SMTP_URL, else to the
local mail viewer, which stays open until you press Enter.`

function fail(message: string): never {
  console.error(`${message}\n\n${usage}`)
  process.exit(2)
}

let args
try {
  args = parseArgs({
    options: {
      club: { type: 'string' },
      'director-email': { type: 'string' },
      'director-name': { type: 'string' },
      file: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
  }).values
} catch (err) {
  fail(err instanceof Error ? err.message : String(err))
}
if (args.help) {
  console.log(usage)
  process.exit(0)
}
const single = args.club !== undefined || args['director-email'] || args['director-name']
if (args.file && single) fail('Give either --file or --club with its director, not both.')
if (!args.file && !single) fail('Nothing to set up.')
let csv: string | null = null
try {
  if (args.file) csv = readFileSync(args.file, 'utf8')
} catch (err) {
  fail(`Cannot read ${args.file}: ${err instanceof Error ? err.message : String(err)}`)
}
const row = {
  club: args.club ?? '',
  directorEmail: args['director-email'] ?? '',
  directorName: args['director-name'] ?? '',
}
// A mistyped option is told before any database is opened.
const checked = clubSetupRowSchema.safeParse(row)
if (!csv && !checked.success) fail(describeIssues(checked.error.issues))

const env = parseEnv()
const local = await localDatabase(env.DATABASE_URL)
// A deployment's database is the deployment's to migrate and its workers' to serve: this
// command only adds the clubs and queues their invitations there. It neither migrates it nor
// starts a worker, which would take every queue's jobs, the other clubs' mail among them.
if (local.external && !env.PUBLIC_URL) {
  fail('PUBLIC_URL is required with DATABASE_URL: the invitations link to it.')
}
if (!local.external) await prepareDatabase(local.url, { seed: false })
const database = createDatabase(local.url)
if (local.external) {
  const pending = await pendingMigrations(database.db)
  const queuesMissing = await missingQueues(database.db)
  if (pending > 0 || queuesMissing.length > 0) {
    await database.close()
    const lacks =
      pending > 0 ? `${pending} migration(s)` : `the job queues ${queuesMissing.join(', ')}`
    fail(`The database at DATABASE_URL lacks ${lacks}: run npm run db:migrate first.`)
  }
}
const settings = jobSettingsOf(env)
const jobs = createJobQueue(database.db, settings)
// On the project-local database, a worker of this command's own sends the invitations now.
const mailer = local.external ? null : await createMailer(env)
const worker = mailer
  ? await startJobWorker({
      connectionString: local.url,
      db: database.db,
      mailer,
      logger: pino({ level: 'silent' }),
      settings,
    })
  : null
if (worker) jobs.attachWorker(worker.wake)
// On the database's clock, which stamps the outbox's rows.
const { rows: clock } = await database.db.execute<{ ms: number }>(
  sql`select extract(epoch from now())::float8 * 1000 as ms`,
)
const startedAt = new Date(clock[0]!.ms)
const deps = { db: database.db, jobs, origin: publicOrigin(env) }

let outcomes: ClubSetupOutcome[] = []
try {
  outcomes = csv ? await setUpClubsFromCsv(deps, csv) : [await setUpClub(deps, row)]
} catch (err) {
  if (!(err instanceof ClubFileError)) throw err
  console.error(err.message)
  process.exitCode = 2
}

const label = { created: 'created', 'invited-again': 'invited again', failed: 'FAILED' }
for (const o of outcomes) {
  const where = csv ? `row ${o.row}: ` : ''
  const detail = o.status === 'failed' ? o.reason : `${o.slug}, director invited`
  console.log(`${where}${label[o.status]}  ${o.club || '(no name)'}  ${detail}`)
}
const failed = outcomes.filter((o) => o.status === 'failed').length
if (outcomes.length > 0) {
  console.log(`${outcomes.length - failed} set up, ${failed} failed.`)
  if (failed > 0) process.exitCode = 1
}

// The invitations of this run: to its directors, queued since it started.
const invited = outcomes.filter((o) => o.status !== 'failed').map((o) => o.directorEmail)
const unsent = async () =>
  (
    await database.db
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(
        and(
          isNull(mailOutbox.sentAt),
          gte(mailOutbox.createdAt, startedAt),
          inArray(mailOutbox.to, invited),
        ),
      )
  ).length
if (invited.length > 0 && !worker) {
  console.log(
    `${await unsent()} invitation(s) queued: the deployment's workers send them (npm run worker).`,
  )
}
if (invited.length > 0 && worker) {
  for (let i = 0; i < 60 && (await unsent()) > 0; i++) await new Promise((r) => setTimeout(r, 500))
  const left = await unsent()
  console.log(
    left === 0
      ? 'Every invitation is sent.'
      : `${left} invitation(s) not sent yet: the mail server did not take them. Twofold's workers keep trying.`,
  )
}
await worker?.stop()

if (mailer?.viewer && invited.length > 0) {
  // The local fake keeps its messages in this process: they go when it ends.
  console.log(`\nNo SMTP_URL: the invitations are in the local mail viewer, ${mailer.viewer.url}`)
  console.log('Press Enter (or Ctrl-C) when you have read them.')
  await new Promise<void>((resolve) => {
    const input = createInterface({ input: process.stdin })
    const done = () => {
      input.close()
      resolve()
    }
    input.once('line', done)
    input.once('close', done)
    input.once('SIGINT', done)
    process.once('SIGINT', done)
    process.once('SIGTERM', done)
  })
}
await mailer?.close()
await database.close()
if (local.cluster) stopCluster(local.cluster)
