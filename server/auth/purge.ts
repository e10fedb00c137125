import { and, inArray, isNotNull, isNull, lt, or, sql } from 'drizzle-orm'
import type { Db } from '../db/client.ts'
import {
  clubSignups,
  mailOutbox,
  passwordResets,
  rateLimits,
  sessions,
} from '../db/schema-accounts.ts'
import { clubArchiveFiles, clubArchives, reportPdfFiles, reportPdfs } from '../db/schema-audits.ts'

const day = 86_400_000

/**
 * How long the outbox keeps a message: sent, its row (recipient, subject, times; the text is
 * cleared at sending) for a month, to answer "was it sent?"; never sent, ten days, after its
 * last retry (5.7 days at most: queue.ts), since its text may hold a link or a name.
 */
export const mailKeptDays = { sent: 30, unsent: 10 }

/**
 * Deletes what can no longer be used: sessions past their idle expiry (the absolute lifetime
 * moves the expiry no further, so it is covered), reset and club sign-up links that expired or
 * were used, limiter counters whose window closed, club archives past their 24 hours and PDF
 * reports past their hour (the bytes first, then the row), and mail past `mailKeptDays`. Safe to
 * run from every process at once.
 */
export async function purgeExpired(db: Db, now = new Date()) {
  const ended = await db
    .delete(sessions)
    .where(lt(sessions.expiresAt, now))
    .returning({ id: sessions.id })
  const resets = await db
    .delete(passwordResets)
    .where(or(lt(passwordResets.expiresAt, now), isNotNull(passwordResets.usedAt)))
    .returning({ tokenHash: passwordResets.tokenHash })
  const signups = await db
    .delete(clubSignups)
    .where(or(lt(clubSignups.expiresAt, now), isNotNull(clubSignups.usedAt)))
    .returning({ tokenHash: clubSignups.tokenHash })
  const counters = await db
    .delete(rateLimits)
    .where(lt(rateLimits.expire, sql`${now.getTime()}`))
    .returning({ key: rateLimits.key })
  const expiredArchives = db
    .select({ clubId: clubArchives.clubId, id: clubArchives.id })
    .from(clubArchives)
    .where(lt(clubArchives.expiresAt, now))
  await db
    .delete(clubArchiveFiles)
    .where(
      inArray(sql`(${clubArchiveFiles.clubId}, ${clubArchiveFiles.archiveId})`, expiredArchives),
    )
  const archives = await db
    .delete(clubArchives)
    .where(lt(clubArchives.expiresAt, now))
    .returning({ id: clubArchives.id })
  const expiredPdfs = db
    .select({ clubId: reportPdfs.clubId, id: reportPdfs.id })
    .from(reportPdfs)
    .where(lt(reportPdfs.expiresAt, now))
  await db
    .delete(reportPdfFiles)
    .where(inArray(sql`(${reportPdfFiles.clubId}, ${reportPdfFiles.reportPdfId})`, expiredPdfs))
  const pdfs = await db
    .delete(reportPdfs)
    .where(lt(reportPdfs.expiresAt, now))
    .returning({ id: reportPdfs.id })
  const sentBefore = new Date(now.getTime() - mailKeptDays.sent * day)
  const unsentBefore = new Date(now.getTime() - mailKeptDays.unsent * day)
  const mail = await db
    .delete(mailOutbox)
    .where(
      or(
        lt(mailOutbox.sentAt, sentBefore),
        and(isNull(mailOutbox.sentAt), lt(mailOutbox.createdAt, unsentBefore)),
      ),
    )
    .returning({ id: mailOutbox.id })
  return {
    mail: mail.length,
    sessions: ended.length,
    resets: resets.length,
    signups: signups.length,
    counters: counters.length,
    archives: archives.length,
    reportPdfs: pdfs.length,
  }
}

/** Purges now and then every `intervalMs`; the timer does not keep the process alive. */
export function schedulePurge(db: Db, onError: (err: unknown) => void, intervalMs = 15 * 60_000) {
  const run = () => void purgeExpired(db).catch(onError)
  run()
  const timer = setInterval(run, intervalMs)
  timer.unref()
  return () => clearInterval(timer)
}
