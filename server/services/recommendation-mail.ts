import { and, eq } from 'drizzle-orm'
import { stillOpen } from '../../shared/domain/visits.ts'
import type { Db, DbOrTx } from '../db/client.ts'
import { clubs, users } from '../db/schema-accounts.ts'
import { athletes, coachSquads, squads } from '../db/schema-athletes.ts'
import { recommendations } from '../db/schema-visits.ts'
import type { JobQueue } from '../jobs/queue.ts'
import { enqueueMail } from '../mail/outbox.ts'

// The mail about recommendations: to the coaches of the squad when one is left, and once a few
// days before its due date.

type Recommendation = typeof recommendations.$inferSelect

/** The data of a reminder job. `origin` is where links point, fixed by the web process. */
export interface ReminderJob {
  clubId: string
  recommendationId: string
  origin: string
}

async function coachAddresses(db: DbOrTx, clubId: string, squadId: string) {
  const rows = await db
    .select({ email: users.email })
    .from(coachSquads)
    .innerJoin(users, eq(users.id, coachSquads.userId))
    .where(and(eq(coachSquads.clubId, clubId), eq(coachSquads.squadId, squadId)))
  return rows.map((r) => r.email).sort()
}

async function describe(db: DbOrTx, rec: Recommendation, origin: string) {
  const [row] = await db
    .select({ club: clubs.name, squad: squads.name })
    .from(squads)
    .innerJoin(clubs, eq(clubs.id, squads.clubId))
    .where(and(eq(squads.clubId, rec.clubId), eq(squads.id, rec.squadId)))
  const [athlete] = rec.athleteId
    ? await db
        .select({ givenName: athletes.givenName, familyName: athletes.familyName })
        .from(athletes)
        .where(and(eq(athletes.clubId, rec.clubId), eq(athletes.id, rec.athleteId)))
    : []
  const about = athlete ? `${athlete.givenName} ${athlete.familyName} (${row!.squad})` : row!.squad
  // A subject outlives the message in the outbox (its text is cleared once sent) and passes
  // through the mail provider's logs: it names the squad, never an athlete.
  const subjectAbout = athlete ? `an athlete of ${row!.squad}` : row!.squad
  const link = rec.athleteId
    ? `${origin}/athletes/${rec.athleteId}`
    : `${origin}/squads/${rec.squadId}`
  return { club: row!.club, about, subjectAbout, link }
}

/** Mails the squad's coaches about a new recommendation, in `tx`'s transaction. */
export async function mailNewRecommendation(
  tx: DbOrTx,
  jobs: JobQueue,
  rec: Recommendation,
  origin: string,
) {
  const { club, about, subjectAbout, link } = await describe(tx, rec, origin)
  for (const to of await coachAddresses(tx, rec.clubId, rec.squadId))
    await enqueueMail(tx, jobs, {
      to,
      subject: `${club}: a recommendation for ${subjectAbout}`,
      text: [
        'Hello,',
        '',
        `The visiting clinician left a recommendation (${rec.priority} priority, due ${rec.dueOn}) for ${about}:`,
        '',
        rec.text,
        '',
        `Accept, decline or mark it done here: ${link}`,
      ].join('\n'),
    })
}

/**
 * The reminder job: mails the coaches once, if the recommendation still asks something of
 * them. The row is locked and `reminded_at` set in the mail's own transaction, so a job that
 * runs twice (a retry, a second worker) sends nothing the second time. Answers whether it sent.
 */
export async function remindRecommendation(db: Db, jobs: JobQueue, job: ReminderJob) {
  return db.transaction(async (tx) => {
    const [rec] = await tx
      .select()
      .from(recommendations)
      .where(
        and(eq(recommendations.clubId, job.clubId), eq(recommendations.id, job.recommendationId)),
      )
      .for('update')
    if (!rec || rec.remindedAt || !stillOpen(rec.status)) return false
    const { club, about, subjectAbout, link } = await describe(tx, rec, job.origin)
    for (const to of await coachAddresses(tx, rec.clubId, rec.squadId))
      await enqueueMail(tx, jobs, {
        to,
        subject: `${club}: reminder, a recommendation for ${subjectAbout} is due ${rec.dueOn}`,
        text: [
          'Hello,',
          '',
          `This recommendation for ${about} is due on ${rec.dueOn} and is still ${rec.status}:`,
          '',
          rec.text,
          '',
          `Mark it done or decline it here: ${link}`,
        ].join('\n'),
      })
    await tx
      .update(recommendations)
      .set({ remindedAt: new Date() })
      .where(and(eq(recommendations.clubId, rec.clubId), eq(recommendations.id, rec.id)))
    return true
  })
}
