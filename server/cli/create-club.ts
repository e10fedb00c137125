import { readFileSync } from 'node:fs'
import { createInterface } from 'node:readline'
import { parseArgs } from 'node:util'
import { publicOrigin } from '../context.ts'
import { createDatabase } from '../db/client.ts'
import { jobSettingsOf, parseEnv } from '../env.ts'
import { and, gte, isNull } from 'drizzle-orm'
import pino from 'pino'
import { mailOutbox } from '../db/schema-accounts.ts'
import { createJobQueue } from '../jobs/queue.ts'
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

Uses DATABASE_URL, else the project-local database; mail goes to SMTP_URL, else to the local
mail viewer, which stays open until you press Enter.`

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
await prepareDatabase(local.url, { seed: false })
const database = createDatabase(local.url)
const mailer = await createMailer(env)
const jobs = createJobQueue(database.db, jobSettingsOf(env))
// The invitations are queued with their clubs; a worker of this command's own sends them now
// (workers elsewhere would too).
const logger = pino({ level: 'silent' })
const worker = await startJobWorker({
  connectionString: local.url,
  db: database.db,
  mailer,
  logger,
  settings: jobSettingsOf(env),
})
jobs.attachWorker(worker.wake)
const startedAt = new Date()
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

if (outcomes.length > failed) {
  const unsent = async () =>
    (
      await database.db
        .select({ id: mailOutbox.id })
        .from(mailOutbox)
        .where(and(isNull(mailOutbox.sentAt), gte(mailOutbox.createdAt, startedAt)))
    ).length
  for (let i = 0; i < 60 && (await unsent()) > 0; i++) await new Promise((r) => setTimeout(r, 500))
  const left = await unsent()
  console.log(
    left === 0
      ? 'Every invitation is sent.'
      : `${left} invitation(s) not sent yet: the mail server did not take them. Twofold's workers keep trying.`,
  )
}
await worker.stop()

if (mailer.viewer && outcomes.length > failed) {
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
await mailer.close()
await database.close()
if (local.cluster) stopCluster(local.cluster)
