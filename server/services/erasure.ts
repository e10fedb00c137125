import { randomUUID } from 'node:crypto'
import { and, eq, isNull, sql } from 'drizzle-orm'
import {
  athleteFullName,
  confirmationMatches,
  replaceAthleteId,
} from '../../shared/domain/erasure.ts'
import { replaceOutcomeAthleteId } from '../../shared/domain/visit-outcomes.ts'
import { athleteErasureSchema, clubDeletionSchema } from '../../shared/schemas/erasure.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx, Tx } from '../db/client.ts'
import {
  clubs,
  invitationTokens,
  invitations,
  mailOutbox,
  memberships,
  sessions,
} from '../db/schema-accounts.ts'
import {
  athletes,
  coachSquads,
  progressEvents,
  progressRecords,
  squads,
} from '../db/schema-athletes.ts'
import {
  ageThresholds,
  auditRuns,
  audits,
  clubArchiveFiles,
  clubArchives,
  reportPdfFiles,
  reportPdfs,
  requirementProfiles,
} from '../db/schema-audits.ts'
import {
  elementPrerequisites,
  elementStepMaps,
  elementSteps,
  elements,
  progressionTemplates,
} from '../db/schema-catalogue.ts'
import {
  clipReviews,
  clips,
  recommendationEvents,
  recommendations,
  visitSquads,
  visits,
} from '../db/schema-visits.ts'
import { plannerStations, sessionPlans } from '../db/schema-planner.ts'
import { removeAthleteFromPlans } from './planner-plans.ts'
import { AppError, notFound } from '../http/errors.ts'
import type { JobQueue } from '../jobs/queue.ts'
import { queueClipRemoval } from './clips.ts'

const mismatch = (message: string) =>
  new AppError(400, 'confirmation_mismatch', message, [{ path: 'confirmName', message }])

/**
 * Erases an athlete for good, in one transaction: their clips, progress history and records,
 * then the athlete. Answers the keys of the clip objects, which the caller deletes from the
 * store once this has committed; their removal is queued in the same transaction as well, so
 * that a worker retries it should the store fail then. Stored audits keep their figures; where they listed the
 * athlete, the athlete's id is replaced by a new one that nothing else holds, and reports show
 * no name for it; PDF reports already drawn and club archives already made (or being made) are
 * deleted; saved session plans drop the athlete.
 */
export async function eraseAthlete(
  db: DbOrTx,
  jobs: JobQueue,
  access: ClubAccess,
  athleteId: string,
  body: unknown,
) {
  const { confirmName } = athleteErasureSchema.parse(body)
  return db.transaction(async (tx) => {
    // Locking the club row holds off, until this commits, anything new that points at the club
    // (a club archive asked for meanwhile would otherwise read the athlete as they were).
    await tx.select({ id: clubs.id }).from(clubs).where(eq(clubs.id, access.clubId)).for('update')
    const [athlete] = await tx
      .select()
      .from(athletes)
      .where(and(eq(athletes.clubId, access.clubId), eq(athletes.id, athleteId)))
      .for('update')
    if (!athlete) throw notFound('No such athlete.')
    if (!confirmationMatches(confirmName, athleteFullName(athlete)))
      throw mismatch(`Type “${athleteFullName(athlete)}” exactly to erase this athlete.`)
    const ofAthlete = <T extends typeof progressRecords | typeof progressEvents>(table: T) =>
      and(eq(table.clubId, access.clubId), eq(table.athleteId, athleteId))
    // Recommendations naming the athlete go with them (their history by its cascade).
    await tx
      .delete(recommendations)
      .where(
        and(eq(recommendations.clubId, access.clubId), eq(recommendations.athleteId, athleteId)),
      )
    // Their clips (recommendations on a clip name its athlete, so they are gone already).
    const erased = await tx
      .delete(clips)
      .where(and(eq(clips.clubId, access.clubId), eq(clips.athleteId, athleteId)))
      .returning({ key: clips.objectKey })
    // Records name their newest event: they go first, then the events, then the athlete.
    await tx.delete(progressRecords).where(ofAthlete(progressRecords))
    await tx.delete(progressEvents).where(ofAthlete(progressEvents))
    await tx
      .delete(athletes)
      .where(and(eq(athletes.clubId, access.clubId), eq(athletes.id, athleteId)))
    await unlinkFromAudits(tx, access.clubId, athleteId)
    await removeAthleteFromPlans(tx, access.clubId, athleteId)
    // A PDF report drawn before may name the athlete: the club's go, the next ask draws anew.
    await tx.delete(reportPdfFiles).where(eq(reportPdfFiles.clubId, access.clubId))
    await tx.delete(reportPdfs).where(eq(reportPdfs.clubId, access.clubId))
    await queueClipRemoval(
      tx,
      jobs,
      erased.map((c) => c.key),
    )
    // Mail not sent yet that is about them (a recommendation links to the athlete's page): its
    // text names them, so it goes unsent.
    await tx
      .delete(mailOutbox)
      .where(
        and(
          isNull(mailOutbox.sentAt),
          sql`strpos(${mailOutbox.text}, ${`/athletes/${athleteId}`}) > 0`,
        ),
      )
    // So may every club archive (their bytes by the cascade). One being made now finds its row
    // gone when it comes to store the zip, and stores nothing.
    await tx.delete(clubArchives).where(eq(clubArchives.clubId, access.clubId))
    return erased.map((c) => c.key)
  })
}

/** Gives the athlete a new id, a different one in each stored audit that lists them. */
async function unlinkFromAudits(tx: Tx, clubId: string, athleteId: string) {
  // The text search only narrows the rows to read; replaceAthleteId decides.
  const rows = await tx
    .select({ id: audits.id, result: audits.result, visitOutcomes: audits.visitOutcomes })
    .from(audits)
    .where(
      and(
        eq(audits.clubId, clubId),
        sql`(strpos(${audits.result}::text, ${athleteId}) > 0 or strpos(coalesce(${audits.visitOutcomes}::text, ''), ${athleteId}) > 0)`,
      ),
    )
  for (const row of rows) {
    const replacement = randomUUID()
    const result = replaceAthleteId(row.result, athleteId, replacement)
    const visitOutcomes =
      row.visitOutcomes && replaceOutcomeAthleteId(row.visitOutcomes, athleteId, replacement)
    if (!result && !visitOutcomes) continue
    await tx
      .update(audits)
      .set({ ...(result ? { result } : {}), ...(visitOutcomes ? { visitOutcomes } : {}) })
      .where(and(eq(audits.clubId, clubId), eq(audits.id, row.id)))
  }
}

/**
 * Deletes a club and everything it holds, in one transaction, once its name is typed exactly.
 * Table by table within the club, children first, so that no step depends on a cascade; the
 * people keep their accounts (and their other clubs), and their sessions forget the club.
 * Answers the keys of the club's clip objects, for the caller to delete once this committed
 * (their removal is queued too, as for an erased athlete).
 */
export async function deleteClub(db: DbOrTx, jobs: JobQueue, access: ClubAccess, body: unknown) {
  const { confirmName } = clubDeletionSchema.parse(body)
  const clubId = access.clubId
  return db.transaction(async (tx) => {
    // Locking the club row waits for writes in flight that point at it, and holds off new ones.
    const [club] = await tx.select().from(clubs).where(eq(clubs.id, clubId)).for('update')
    if (!club) throw notFound('No such club.')
    if (!confirmationMatches(confirmName, club.name))
      throw mismatch(`Type “${club.name}” exactly to delete the club.`)
    const objects = await tx
      .select({ key: clips.objectKey })
      .from(clips)
      .where(eq(clips.clubId, clubId))
    for (const table of [
      sessionPlans,
      plannerStations,
      recommendationEvents,
      recommendations,
      clipReviews,
      clips,
      visitSquads,
      visits,
      clubArchiveFiles,
      clubArchives,
      progressRecords,
      progressEvents,
      auditRuns,
      reportPdfFiles,
      reportPdfs,
      audits,
      athletes,
      coachSquads,
      squads,
      elementPrerequisites,
      elementStepMaps,
      elementSteps,
      elements,
      progressionTemplates,
      requirementProfiles,
      ageThresholds,
      invitationTokens,
      invitations,
      memberships,
    ]) {
      await tx.delete(table).where(eq(table.clubId, clubId))
    }
    await tx.update(sessions).set({ clubId: null }).where(eq(sessions.clubId, clubId))
    await tx.delete(clubs).where(eq(clubs.id, clubId))
    await queueClipRemoval(
      tx,
      jobs,
      objects.map((c) => c.key),
    )
    return objects.map((c) => c.key)
  })
}
