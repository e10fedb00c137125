import net from 'node:net'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { purgeExpired } from '../../server/auth/purge.ts'
import { freePort } from '../../server/cli/postgres.ts'
import type { Database } from '../../server/db/client.ts'
import { mailOutbox } from '../../server/db/schema-accounts.ts'
import { mailJobExpirySeconds } from '../../server/jobs/queue.ts'
import { createMailer, mailSendLimitMs, type Mailer } from '../../server/mail/mailer.ts'
import { deliverMail } from '../../server/mail/outbox.ts'
import { freshDatabase } from '../support/database.ts'
import { testEnv } from '../support/app.ts'

let database: Database
let up: Mailer
const closers: (() => Promise<unknown>)[] = []

beforeAll(async () => {
  database = await freshDatabase()
  up = await createMailer(testEnv)
  closers.push(() => up.close())
})

afterAll(async () => {
  for (const close of closers) await close()
  await database.close()
})

const queued = async (to: string) =>
  (
    await database.db
      .insert(mailOutbox)
      .values({ to, subject: 'Your sign-in link', text: 'https://club.invalid/secret' })
      .returning({ id: mailOutbox.id })
  )[0]!.id

const outboxRow = async (id: string) =>
  (await database.db.select().from(mailOutbox).where(eq(mailOutbox.id, id)))[0]!

describe('the mail outbox', () => {
  it('keeps a message while the provider is down, then sends it once when it is back', async () => {
    // A port nothing listens on: the provider refuses the connection.
    const down = await createMailer({
      ...testEnv,
      SMTP_URL: `smtp://127.0.0.1:${await freePort()}`,
    })
    closers.push(() => down.close())
    const to = 'down-then-up@club.invalid'
    const id = await queued(to)

    await expect(deliverMail(database.db, down, id)).rejects.toThrow()
    await expect(deliverMail(database.db, down, id)).rejects.toThrow()
    const waiting = await outboxRow(id)
    expect(waiting).toMatchObject({
      sentAt: null,
      attempts: 2,
      text: 'https://club.invalid/secret',
    })
    expect(waiting.lastError).toBeTruthy()

    await deliverMail(database.db, up, id)
    // Delivered again (a retry that raced the first send): nothing more goes out.
    await deliverMail(database.db, up, id)
    const sent = await outboxRow(id)
    expect(sent).toMatchObject({ attempts: 3, lastError: null, text: null })
    expect(sent.sentAt).toBeInstanceOf(Date)
    const mail = await up.fake!.waitFor(to)
    expect(mail.text).toContain('https://club.invalid/secret')
    // The fake reads what it received a moment after the provider's answer: a second copy, sent
    // by the second delivery, would be read by then.
    await new Promise((resolve) => setTimeout(resolve, 300))
    expect(up.fake!.messages().filter((m) => m.to.includes(to))).toHaveLength(1)
  })

  it('gives up on a provider that connects and then says nothing', async () => {
    // A server that accepts the connection and never greets. Without a greeting timeout the send
    // would wait half a minute (nodemailer's default), past this test's own time limit; the
    // timeout given in SMTP_URL's query wins over the product's own.
    const silent = net.createServer(() => {})
    await new Promise<void>((resolve) => silent.listen(0, '127.0.0.1', resolve))
    closers.push(() => new Promise((resolve) => silent.close(resolve)))
    const { port } = silent.address() as net.AddressInfo
    silent.on('connection', (socket) => closers.push(async () => socket.destroy()))
    const mailer = await createMailer({
      ...testEnv,
      SMTP_URL: `smtp://127.0.0.1:${port}?greetingTimeout=300`,
    })
    closers.push(() => mailer.close())
    await expect(
      mailer.send({
        to: 'nobody@club.invalid',
        subject: 'x',
        text: 'x',
        messageId: '<x@t.invalid>',
      }),
    ).rejects.toThrow(/greeting/i)
  })

  it('forgets a sent message after a month and one never sent after ten days', async () => {
    const now = new Date()
    const daysAgo = (days: number) => new Date(now.getTime() - days * 86_400_000)
    const rows = [
      // [label, created, sent]: kept unless named "gone".
      ['sent 31 days ago, gone', daysAgo(32), daysAgo(31)],
      ['sent 29 days ago', daysAgo(29), daysAgo(29)],
      ['never sent, 11 days old, gone', daysAgo(11), null],
      ['never sent, 9 days old', daysAgo(9), null],
    ] as const
    for (const [label, createdAt, sentAt] of rows) {
      await database.db
        .insert(mailOutbox)
        .values({ to: 'purge@club.invalid', subject: label, text: null, createdAt, sentAt })
    }
    const purged = await purgeExpired(database.db, now)
    expect(purged.mail).toBe(2)
    const left = await database.db
      .select({ subject: mailOutbox.subject })
      .from(mailOutbox)
      .where(eq(mailOutbox.to, 'purge@club.invalid'))
    expect(left.map((r) => r.subject).sort()).toEqual([
      'never sent, 9 days old',
      'sent 29 days ago',
    ])
  })

  it('ends every send well before another worker may take its job over', () => {
    // An invariant between two settings: a mail job taken over while its first send still ran
    // would hand the provider the message twice.
    expect(mailSendLimitMs * 2).toBeLessThan(mailJobExpirySeconds * 1000)
  })
})
