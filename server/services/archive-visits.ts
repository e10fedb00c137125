import { and, asc, eq } from 'drizzle-orm'
import type { DbOrTx } from '../db/client.ts'
import {
  clipReviews,
  clips,
  recommendationEvents,
  recommendations,
  visitSquads,
  visits,
} from '../db/schema-visits.ts'
import { csvFile, iso, type ArchiveFile } from './archive-files.ts'

/**
 * The club's visits, the squads they covered, the recommendations and their history, and the
 * list of clips (the videos themselves stay in the clip store: the archive is a data export).
 */
export function visitArchiveFiles(db: DbOrTx, clubId: string): ArchiveFile[] {
  return [
    csvFile(
      'visits.csv',
      'squads',
      ['id', 'clinicianId', 'firstDay', 'lastDay', 'agenda', 'createdAt', 'cancelledAt'],
      async () =>
        (
          await db
            .select()
            .from(visits)
            .where(eq(visits.clubId, clubId))
            .orderBy(asc(visits.firstDay), asc(visits.id))
        ).map((v) => ({ ...v, createdAt: iso(v.createdAt), cancelledAt: iso(v.cancelledAt) })),
    ),
    csvFile('visit-squads.csv', 'squads', ['visitId', 'squadId'], () =>
      db
        .select({ visitId: visitSquads.visitId, squadId: visitSquads.squadId })
        .from(visitSquads)
        .where(eq(visitSquads.clubId, clubId))
        .orderBy(asc(visitSquads.visitId), asc(visitSquads.squadId)),
    ),
    csvFile(
      'recommendations.csv',
      'squads',
      [
        'id',
        'visitId',
        'squadId',
        'athleteId',
        'elementId',
        'suggestedStepIndex',
        'stepsVersion',
        'clipId',
        'text',
        'priority',
        'dueOn',
        'status',
        'createdBy',
        'createdAt',
        'remindedAt',
      ],
      async () =>
        (
          await db
            .select()
            .from(recommendations)
            .where(eq(recommendations.clubId, clubId))
            .orderBy(asc(recommendations.createdAt), asc(recommendations.id))
        ).map((r) => ({ ...r, createdAt: iso(r.createdAt), remindedAt: iso(r.remindedAt) })),
    ),
    csvFile(
      'recommendation-history.csv',
      'squads',
      ['recommendationId', 'status', 'note', 'byUserId', 'at'],
      async () =>
        (
          await db
            .select()
            .from(recommendationEvents)
            .where(and(eq(recommendationEvents.clubId, clubId)))
            .orderBy(asc(recommendationEvents.at), asc(recommendationEvents.id))
        ).map((e) => ({ ...e, at: iso(e.at) })),
    ),
    csvFile(
      'clips.csv',
      'athletes',
      [
        'id',
        'athleteId',
        'elementId',
        'contentType',
        'sizeBytes',
        'fileName',
        'note',
        'uploadedBy',
        'createdAt',
      ],
      async () =>
        (
          await db
            .select()
            .from(clips)
            .where(eq(clips.clubId, clubId))
            .orderBy(asc(clips.createdAt), asc(clips.id))
        ).map((c) => ({ ...c, createdAt: iso(c.createdAt) })),
    ),
    csvFile('clip-reviews.csv', 'athletes', ['clipId', 'userId', 'reviewedAt'], async () =>
      (
        await db
          .select()
          .from(clipReviews)
          .where(eq(clipReviews.clubId, clubId))
          .orderBy(asc(clipReviews.clipId), asc(clipReviews.userId))
      ).map((r) => ({ ...r, reviewedAt: iso(r.reviewedAt) })),
    ),
  ]
}
