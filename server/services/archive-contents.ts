import { and, asc, eq, gt, sql, type SQL } from 'drizzle-orm'
import type { PgColumn } from 'drizzle-orm/pg-core'
import { deriveElement, type DifficultyLetter } from '../../shared/domain/catalogue.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs, memberships, users } from '../db/schema-accounts.ts'
import {
  athletes,
  coachSquads,
  progressEvents,
  progressRecords,
  squads,
} from '../db/schema-athletes.ts'
import { ageThresholds, audits, requirementProfiles } from '../db/schema-audits.ts'
import {
  elementPrerequisites,
  elements,
  elementStepMaps,
  elementSteps,
  progressionTemplates,
} from '../db/schema-catalogue.ts'
import {
  countOf,
  csvFile,
  flag,
  iso,
  json,
  jsonFile,
  pagedCsvFile,
  type ArchiveFile,
} from './archive-files.ts'
import { auditFiles } from './archive-audits.ts'
import { plannerArchiveFiles } from './archive-planner.ts'
import { visitArchiveFiles } from './archive-visits.ts'

type AthleteRow = typeof athletes.$inferSelect & { squad: string }

/**
 * Every file of the club's archive, in the order they are written. Reads only counts and ids
 * now; each file reads its rows when it is written. Read within one snapshot (a repeatable-read
 * transaction), the files agree with each other and the counts with the files.
 */
export async function archiveFiles(
  db: DbOrTx,
  clubId: string,
  pageSize: number,
): Promise<ArchiveFile[]> {
  const ofClub = <T extends { clubId: PgColumn }>(table: T, ...more: (SQL | undefined)[]) =>
    and(eq(table.clubId, clubId), ...more)
  // One after the other: a transaction's queries share its one connection.
  const athleteCount = await countOf(db, athletes, clubId)
  const eventCount = await countOf(db, progressEvents, clubId)
  const recordCount = await countOf(db, progressRecords, clubId)
  const auditList = await db
    .select({ id: audits.id, asOf: audits.asOf })
    .from(audits)
    .where(ofClub(audits))
    .orderBy(asc(audits.asOf), asc(audits.id))

  return [
    jsonFile('club.json', 'club', async () => {
      const [club] = await db.select().from(clubs).where(eq(clubs.id, clubId))
      return {
        id: club!.id,
        name: club!.name,
        slug: club!.slug,
        lostSkillStepDown: club!.lostSkillStepDown,
        createdAt: iso(club!.createdAt),
      }
    }),
    // Name, e-mail, role and visit window: never a password hash, session or token.
    csvFile(
      'members.csv',
      'people',
      ['userId', 'name', 'email', 'role', 'accessStartsOn', 'accessEndsOn', 'memberSince'],
      async () =>
        (
          await db
            .select({
              userId: users.id,
              name: users.name,
              email: users.email,
              role: memberships.role,
              accessStartsOn: memberships.accessStartsOn,
              accessEndsOn: memberships.accessEndsOn,
              createdAt: memberships.createdAt,
            })
            .from(memberships)
            .innerJoin(users, eq(users.id, memberships.userId))
            .where(ofClub(memberships))
            .orderBy(asc(memberships.role), asc(users.name), asc(users.id))
        ).map(({ createdAt, ...m }) => ({ ...m, memberSince: iso(createdAt) })),
    ),
    csvFile('squads.csv', 'squads', ['id', 'name', 'level', 'discipline', 'createdAt'], async () =>
      (await db.select().from(squads).where(ofClub(squads)).orderBy(asc(squads.name))).map((s) => ({
        ...s,
        createdAt: iso(s.createdAt),
      })),
    ),
    csvFile('coach-assignments.csv', 'squads', ['squadId', 'userId'], () =>
      db
        .select({ squadId: coachSquads.squadId, userId: coachSquads.userId })
        .from(coachSquads)
        .where(ofClub(coachSquads))
        .orderBy(asc(coachSquads.squadId), asc(coachSquads.userId)),
    ),
    ...visitArchiveFiles(db, clubId),
    pagedCsvFile<AthleteRow>({
      name: 'athletes.csv',
      phase: 'athletes',
      fields: [
        'id',
        'givenName',
        'familyName',
        'birthYear',
        'squadId',
        'squad',
        'discipline',
        'archivedAt',
        'createdAt',
      ],
      rowCount: athleteCount,
      pageSize,
      page: (after, limit) =>
        db
          .select({ athlete: athletes, squad: squads.name })
          .from(athletes)
          .innerJoin(
            squads,
            and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)),
          )
          .where(ofClub(athletes, after ? gt(athletes.id, after.id) : undefined))
          .orderBy(asc(athletes.id))
          .limit(limit)
          .then((rows) => rows.map((r) => ({ ...r.athlete, squad: r.squad }))),
      toRow: (a) => ({
        ...a,
        archivedAt: iso(a.archivedAt),
        createdAt: iso(a.createdAt),
      }),
    }),
    ...catalogueFiles(db, clubId),
    pagedCsvFile<typeof progressEvents.$inferSelect>({
      name: 'progress-events.csv',
      phase: 'progress',
      fields: [
        'id',
        'athleteId',
        'elementId',
        'kind',
        'stepIndex',
        'stepsVersion',
        'pauseReason',
        'plannedStepIndex',
        'occurredOn',
        'recordedAt',
        'coachId',
        'note',
        'skipReason',
        'correctsEventId',
        'flagged',
        'checks',
      ],
      rowCount: eventCount,
      pageSize,
      page: (after, limit) =>
        db
          .select()
          .from(progressEvents)
          .where(ofClub(progressEvents, after ? gt(progressEvents.id, after.id) : undefined))
          .orderBy(asc(progressEvents.id))
          .limit(limit),
      toRow: (e) => ({
        ...e,
        recordedAt: iso(e.recordedAt),
        flagged: flag(e.flagged),
        checks: json(e.checks),
      }),
    }),
    pagedCsvFile<typeof progressRecords.$inferSelect>({
      name: 'progress-records.csv',
      phase: 'progress',
      fields: [
        'athleteId',
        'elementId',
        'stepIndex',
        'highestStepIndex',
        'stepReachedOn',
        'paused',
        'pauseReason',
        'plannedStepIndex',
        'lastEventOn',
        'lastEventId',
        'flagged',
        'updatedAt',
      ],
      rowCount: recordCount,
      pageSize,
      page: (after, limit) =>
        db
          .select()
          .from(progressRecords)
          .where(
            ofClub(
              progressRecords,
              after
                ? sql`(${progressRecords.athleteId}, ${progressRecords.elementId}) > (${after.athleteId}, ${after.elementId})`
                : undefined,
            ),
          )
          .orderBy(asc(progressRecords.athleteId), asc(progressRecords.elementId))
          .limit(limit),
      // The timeline is a cache rebuilt from the events: the events file holds the history.
      toRow: ({ timeline: _timeline, ...r }) => ({
        ...r,
        paused: flag(r.paused),
        flagged: flag(r.flagged),
        updatedAt: iso(r.updatedAt),
      }),
    }),
    jsonFile('requirement-profiles.json', 'settings', async () =>
      (
        await db
          .select()
          .from(requirementProfiles)
          .where(ofClub(requirementProfiles))
          .orderBy(asc(requirementProfiles.id))
      ).map(({ clubId: _club, updatedAt, ...p }) => ({ ...p, updatedAt: iso(updatedAt) })),
    ),
    csvFile(
      'age-thresholds.csv',
      'settings',
      ['discipline', 'juniorFromAge', 'seniorFromAge', 'source'],
      () =>
        db
          .select()
          .from(ageThresholds)
          .where(ofClub(ageThresholds))
          .orderBy(asc(ageThresholds.discipline)),
    ),
    ...plannerArchiveFiles(db, clubId),
    ...auditFiles(db, clubId, auditList),
  ]
}

/** Elements with every derived field, their steps, step maps and prerequisites, the templates. */
function catalogueFiles(db: DbOrTx, clubId: string): ArchiveFile[] {
  return [
    csvFile(
      'elements.csv',
      'catalogue',
      [
        // The catalogue import's columns first, so that the file can start another catalogue.
        'name',
        'apparatus',
        'direction',
        'quarterRotations',
        'twists',
        'shape',
        'takeOff',
        'difficultyLetter',
        'notes',
        'id',
        'saltoCount',
        'totalHalfTwists',
        'rotationClass',
        'twistBand',
        'notation',
        'trampolineDifficulty',
        'difficultyValue',
        'descriptionKey',
        'counterpartKey',
        'templateFamily',
        'stepsVersion',
        'createdAt',
        'updatedAt',
      ],
      async () => {
        const rows = await db
          .select()
          .from(elements)
          .where(eq(elements.clubId, clubId))
          .orderBy(asc(elements.apparatus), asc(elements.quarterRotations), asc(elements.name))
        return rows.map((e) => ({
          ...e,
          ...deriveElement({
            ...e,
            difficultyLetter: e.difficultyLetter as DifficultyLetter | null,
          }),
          twists: e.twists.join(' '),
          createdAt: iso(e.createdAt),
          updatedAt: iso(e.updatedAt),
        }))
      },
    ),
    csvFile(
      'progression-steps.csv',
      'catalogue',
      ['elementId', 'position', 'name', 'modality', 'criterion', 'minDays'],
      () =>
        db
          .select()
          .from(elementSteps)
          .where(eq(elementSteps.clubId, clubId))
          .orderBy(asc(elementSteps.elementId), asc(elementSteps.position)),
    ),
    csvFile(
      'progression-step-maps.csv',
      'catalogue',
      ['elementId', 'fromVersion', 'mapping', 'createdAt', 'createdBy'],
      async () =>
        (
          await db
            .select()
            .from(elementStepMaps)
            .where(eq(elementStepMaps.clubId, clubId))
            .orderBy(asc(elementStepMaps.elementId), asc(elementStepMaps.fromVersion))
        ).map((m) => ({ ...m, mapping: json(m.mapping), createdAt: iso(m.createdAt) })),
    ),
    csvFile('prerequisites.csv', 'catalogue', ['elementId', 'requiresElementId', 'stepIndex'], () =>
      db
        .select()
        .from(elementPrerequisites)
        .where(eq(elementPrerequisites.clubId, clubId))
        .orderBy(asc(elementPrerequisites.elementId), asc(elementPrerequisites.requiresElementId)),
    ),
    jsonFile('progression-templates.json', 'catalogue', async () =>
      (
        await db
          .select()
          .from(progressionTemplates)
          .where(eq(progressionTemplates.clubId, clubId))
          .orderBy(asc(progressionTemplates.family))
      ).map(({ clubId: _club, updatedAt, ...t }) => ({ ...t, updatedAt: iso(updatedAt) })),
    ),
  ]
}
