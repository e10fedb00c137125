import { eq, sql } from 'drizzle-orm'
import type { Db, DbOrTx } from '../db/client.ts'
import { mailOutbox } from '../db/schema-accounts.ts'
import { queues, type JobQueue } from '../jobs/queue.ts'
import type { Mail, Mailer } from './mailer.ts'

/**
 * Puts a message on its way in `tx`'s transaction: it is sent if, and only if, the change that
 * causes it commits. A worker sends it, retrying with back-off while the provider is down.
 */
export async function enqueueMail(tx: DbOrTx, jobs: JobQueue, mail: Mail) {
  const [row] = await tx
    .insert(mailOutbox)
    .values({ to: mail.to, subject: mail.subject, text: mail.text })
    .returning({ id: mailOutbox.id })
  await jobs.send(tx, queues.mail, { outboxId: row!.id })
}

/**
 * A worker's part: sends one message unless it was sent already, then clears its text. The
 * Message-ID is the message's own id, so that a copy sent again after a crash between the
 * provider's answer and this record can be recognised as the same message.
 */
export async function deliverMail(db: Db, mailer: Mailer, outboxId: string) {
  const [row] = await db.select().from(mailOutbox).where(eq(mailOutbox.id, outboxId))
  if (!row || row.sentAt || row.text === null) return
  try {
    await mailer.send({
      to: row.to,
      subject: row.subject,
      text: row.text,
      messageId: `<${row.id}@twofold.invalid>`,
    })
  } catch (err) {
    await db
      .update(mailOutbox)
      .set({
        attempts: sql`${mailOutbox.attempts} + 1`,
        lastError: (err as Error).message.slice(0, 300),
      })
      .where(eq(mailOutbox.id, outboxId))
    throw err
  }
  await db
    .update(mailOutbox)
    .set({
      sentAt: new Date(),
      text: null,
      attempts: sql`${mailOutbox.attempts} + 1`,
      lastError: null,
    })
    .where(eq(mailOutbox.id, outboxId))
}
