import type { VisitOutcomes } from '../../shared/domain/visit-outcomes.ts'
import { sql } from 'drizzle-orm'
import {
  bigint,
  boolean,
  customType,
  date,
  foreignKey,
  index,
  integer,
  json,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  uuid,
  varchar,
} from 'drizzle-orm/pg-core'
import type { AuditFigures, AuditResult } from '../../shared/domain/audit/types.ts'
import type { AuditRun } from '../../shared/schemas/audits.ts'
import type { StoredAuditResult } from '../services/audit-storage.ts'
import { disciplines, roles, squadLevels } from '../../shared/domain/club.ts'
import {
  directions,
  modalities,
  rotationClasses,
  shapes,
  takeOffs,
  twistBands,
} from '../../shared/domain/element.ts'
import {
  pauseReasons,
  progressEventKinds,
  type TimelinePoint,
} from '../../shared/domain/progress.ts'

// Every table of club data carries club_id and puts it first in its keys and foreign keys, so
// that rows of one club can never point at another club's rows, and so that the club tables can
// later be distributed by club_id with every key and join staying on one node. Tables looked up
// without knowing the club (clubs, users, sessions, password_resets, invitation_tokens,
// rate_limits) are the reference side. tests/server/schema-distribution.test.ts holds the live
// database to that; README "Beyond one database" gives the plan.

export const roleEnum = pgEnum('role', roles)
export const disciplineEnum = pgEnum('discipline', disciplines)
export const squadLevelEnum = pgEnum('squad_level', squadLevels)
export const directionEnum = pgEnum('direction', directions)
export const shapeEnum = pgEnum('shape', shapes)
export const takeOffEnum = pgEnum('take_off', takeOffs)
export const rotationClassEnum = pgEnum('rotation_class', rotationClasses)
export const twistBandEnum = pgEnum('twist_band', twistBands)
export const modalityEnum = pgEnum('modality', modalities)
export const progressEventKindEnum = pgEnum('progress_event_kind', progressEventKinds)
export const pauseReasonEnum = pgEnum('pause_reason', pauseReasons)

const createdAt = () => timestamp({ withTimezone: true }).notNull().defaultNow()

export const clubs = pgTable('clubs', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  slug: text().notNull().unique(),
  /** How many steps a pause for a lost skill proposes to step down (the brief's default: 2). */
  lostSkillStepDown: integer().notNull().default(2),
  createdAt: createdAt(),
})

export const users = pgTable(
  'users',
  {
    id: text().primaryKey(),
    email: text().notNull(),
    name: text().notNull(),
    passwordHash: text(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_lower_idx').on(sql`lower(${t.email})`)],
)

export const memberships = pgTable(
  'memberships',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    userId: text()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: roleEnum().notNull(),
    /** Clinicians only: the visit window, inclusive, in the club's calendar. */
    accessStartsOn: date(),
    accessEndsOn: date(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.userId] }), index().on(t.userId)],
)

export const squads = pgTable(
  'squads',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    name: text().notNull(),
    level: squadLevelEnum().notNull(),
    discipline: disciplineEnum().notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.id] }), uniqueIndex().on(t.clubId, t.name)],
)

export const coachSquads = pgTable(
  'coach_squads',
  {
    clubId: uuid().notNull(),
    squadId: uuid().notNull(),
    userId: text().notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.squadId, t.userId] }),
    foreignKey({
      columns: [t.clubId, t.squadId],
      foreignColumns: [squads.clubId, squads.id],
    }).onDelete('cascade'),
    foreignKey({
      columns: [t.clubId, t.userId],
      foreignColumns: [memberships.clubId, memberships.userId],
    }).onDelete('cascade'),
  ],
)

export const athletes = pgTable(
  'athletes',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    givenName: text().notNull(),
    familyName: text().notNull(),
    /** Only the year: the competitive age categories count by calendar year. */
    birthYear: integer().notNull(),
    squadId: uuid().notNull(),
    discipline: disciplineEnum().notNull(),
    archivedAt: timestamp({ withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({ columns: [t.clubId, t.squadId], foreignColumns: [squads.clubId, squads.id] }),
    index().on(t.clubId, t.squadId),
  ],
)

export const sessions = pgTable(
  'sessions',
  {
    id: text().primaryKey(),
    userId: text()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** Moves forward with activity (idle timeout); never past createdAt + absolute lifetime. */
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    /** The club this session last worked in; ending that membership ends the session. */
    clubId: uuid().references(() => clubs.id, { onDelete: 'set null' }),
    userAgent: text(),
  },
  (t) => [index().on(t.userId)],
)

export const invitations = pgTable(
  'invitations',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    email: text().notNull(),
    role: roleEnum().notNull(),
    accessStartsOn: date(),
    accessEndsOn: date(),
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    invitedBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    acceptedAt: timestamp({ withTimezone: true, mode: 'date' }),
    withdrawnAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.id] })],
)

/**
 * The link of an open invitation, looked up by its token without knowing the club: kept apart
 * from the club's invitations so that the lookup never has to search every club. One row per
 * open invitation; resending replaces it, accepting or withdrawing deletes it.
 */
export const invitationTokens = pgTable(
  'invitation_tokens',
  {
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text().primaryKey(),
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    invitationId: uuid().notNull(),
    /** The invitation's expiry when the link was sent. */
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('invitation_tokens_invitation_idx').on(t.clubId, t.invitationId),
    // The one foreign key from the reference side into club data: a distributed database cannot
    // keep it, so the services delete the row with its invitation themselves (see README).
    foreignKey({
      columns: [t.clubId, t.invitationId],
      foreignColumns: [invitations.clubId, invitations.id],
    }).onDelete('cascade'),
  ],
)

export const passwordResets = pgTable(
  'password_resets',
  {
    tokenHash: text().primaryKey(),
    userId: text()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    usedAt: timestamp({ withTimezone: true, mode: 'date' }),
    createdAt: createdAt(),
  },
  (t) => [index().on(t.userId)],
)

/**
 * A club asked for on the Start a club page, waiting for its e-mail address to be confirmed.
 * Looked up by the token's hash, a global value: no club exists yet, so no club_id.
 */
export const clubSignups = pgTable(
  'club_signups',
  {
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text().primaryKey(),
    email: text().notNull(),
    personName: text().notNull(),
    clubName: text().notNull(),
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    usedAt: timestamp({ withTimezone: true, mode: 'date' }),
    createdAt: createdAt(),
  },
  (t) => [index().on(t.expiresAt)],
)

/**
 * The club's catalogue. Description columns are what the director types; rotation class, twist
 * band and the two keys are derived by shared/domain/catalogue.ts on every write and stored only
 * so that SQL can filter and join on them.
 */
export const elements = pgTable(
  'elements',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    name: text().notNull(),
    apparatus: text().notNull(),
    direction: directionEnum().notNull(),
    quarterRotations: integer().notNull(),
    twists: integer().array().notNull(),
    shape: shapeEnum(),
    takeOff: takeOffEnum().notNull(),
    difficultyLetter: text(),
    notes: text(),
    rotationClass: rotationClassEnum().notNull(),
    twistBand: twistBandEnum().notNull(),
    descriptionKey: text().notNull(),
    counterpartKey: text(),
    templateFamily: text().notNull(),
    /** Goes up by one whenever the progression's steps change (see element_step_maps). */
    stepsVersion: integer().notNull().default(1),
    createdAt: createdAt(),
    updatedAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    uniqueIndex('elements_description_idx').on(t.clubId, t.descriptionKey),
    uniqueIndex('elements_name_idx').on(t.clubId, t.apparatus, sql`lower(${t.name})`),
    index('elements_counterpart_idx').on(t.clubId, t.counterpartKey),
  ],
)

/** The ordered steps of an element's progression; the last one is competition-ready. */
export const elementSteps = pgTable(
  'element_steps',
  {
    clubId: uuid().notNull(),
    elementId: uuid().notNull(),
    position: integer().notNull(),
    name: text().notNull(),
    modality: modalityEnum().notNull(),
    criterion: text().notNull(),
    minDays: integer(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.elementId, t.position] }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }).onDelete('cascade'),
  ],
)

/**
 * When the steps of an element change while athletes are on it, the director says where each
 * old step goes: mapping[oldIndex] = newIndex, from `fromVersion` to the next. Events keep the
 * step index of the version they were recorded under, so history is never rewritten.
 */
export const elementStepMaps = pgTable(
  'element_step_maps',
  {
    clubId: uuid().notNull(),
    elementId: uuid().notNull(),
    fromVersion: integer().notNull(),
    mapping: integer().array().notNull(),
    createdAt: createdAt(),
    createdBy: text().references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.elementId, t.fromVersion] }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }).onDelete('cascade'),
  ],
)

export const elementPrerequisites = pgTable(
  'element_prerequisites',
  {
    clubId: uuid().notNull(),
    elementId: uuid().notNull(),
    requiresElementId: uuid().notNull(),
    /** The step of the required element the athlete must have reached. */
    stepIndex: integer().notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.elementId, t.requiresElementId] }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }).onDelete('cascade'),
    foreignKey({
      columns: [t.clubId, t.requiresElementId],
      foreignColumns: [elements.clubId, elements.id],
    }).onDelete('cascade'),
  ],
)

/** The club's own copy of each progression template, used for elements created from now on. */
export const progressionTemplates = pgTable(
  'progression_templates',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    family: text().notNull(),
    label: text().notNull(),
    steps: jsonb().notNull(),
    updatedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.family] })],
)

/**
 * The append-only history of an athlete's progress on an element. Nothing here is updated, and
 * nothing deleted but with the athlete erased for good: a mistaken event is voided by a later one
 * (corrects_event_id).
 */
export const progressEvents = pgTable(
  'progress_events',
  {
    clubId: uuid().notNull(),
    id: uuid().notNull().defaultRandom(),
    athleteId: uuid().notNull(),
    elementId: uuid().notNull(),
    kind: progressEventKindEnum().notNull(),
    stepIndex: integer(),
    /** The element's steps version the step index refers to. */
    stepsVersion: integer().notNull(),
    pauseReason: pauseReasonEnum(),
    plannedStepIndex: integer(),
    occurredOn: date().notNull(),
    recordedAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    coachId: text().references(() => users.id, { onDelete: 'set null' }),
    note: text(),
    skipReason: text(),
    correctsEventId: uuid(),
    /** The checks shown before saving, kept with the event. */
    checks: jsonb().notNull().default([]),
    flagged: boolean().notNull().default(false),
    /**
     * The id the tablet gave the entry, so that a retry (a lost answer, an offline queue sent
     * twice) stores it once: the unique index below turns the second copy into a read-back.
     */
    clientEventId: uuid(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    // Partial: entries without a client id (most of the history) are not indexed at all.
    uniqueIndex('progress_events_client_event_idx')
      .on(t.clubId, t.clientEventId)
      .where(sql`${t.clientEventId} IS NOT NULL`),
    foreignKey({
      columns: [t.clubId, t.athleteId],
      foreignColumns: [athletes.clubId, athletes.id],
    }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }),
    foreignKey({
      columns: [t.clubId, t.correctsEventId],
      foreignColumns: [t.clubId, t.id],
    }),
    index('progress_events_record_idx').on(t.clubId, t.athleteId, t.elementId),
    index('progress_events_element_idx').on(t.clubId, t.elementId),
    // Deleting events (erasing an athlete) checks that no correction still points at them.
    index('progress_events_corrects_idx')
      .on(t.clubId, t.correctsEventId)
      .where(sql`${t.correctsEventId} is not null`),
  ],
)

/**
 * The current state of each athlete × element record, rebuilt from progress_events by
 * shared/domain/progress.ts in the same transaction as every event. It is a cache for the squad
 * grid and the conflict check; the events stay the truth.
 */
export const progressRecords = pgTable(
  'progress_records',
  {
    clubId: uuid().notNull(),
    athleteId: uuid().notNull(),
    elementId: uuid().notNull(),
    stepIndex: integer(),
    highestStepIndex: integer(),
    stepReachedOn: date(),
    paused: boolean().notNull().default(false),
    pauseReason: pauseReasonEnum(),
    plannedStepIndex: integer(),
    lastEventOn: date(),
    /**
     * The steps at the end of each day they changed (shared/domain/progress.ts `TimelinePoint`),
     * so that an audit as of any date reads one row per record instead of replaying its events.
     * Null only on rows written before the column existed, until the start-up backfill.
     */
    timeline: jsonb().$type<TimelinePoint[]>(),
    /** The newest event of the record: a writer that saw another one is told of the conflict. */
    lastEventId: uuid(),
    flagged: boolean().notNull().default(false),
    updatedAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.athleteId, t.elementId] }),
    foreignKey({
      columns: [t.clubId, t.athleteId],
      foreignColumns: [athletes.clubId, athletes.id],
    }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }),
    foreignKey({
      columns: [t.clubId, t.lastEventId],
      foreignColumns: [progressEvents.clubId, progressEvents.id],
    }),
    index('progress_records_element_idx').on(t.clubId, t.elementId),
    // Deleting events (erasing an athlete) checks that no record still names them.
    index('progress_records_last_event_idx').on(t.clubId, t.lastEventId),
  ],
)

/**
 * A stored audit: the result of shared/domain/audit/run.ts over the club's data as of a date,
 * never changed after it is written (publishing only stamps it, and erasing an athlete for good
 * replaces their id in it), with the hash of its inputs.
 */
export const audits = pgTable(
  'audits',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    /** Null for an audit of the whole club. */
    squadId: uuid(),
    asOf: date().notNull(),
    inputHash: text().notNull(),
    /** How `inputHash` was made (`AuditHashVersion`): 1 for audits stored before version 2. */
    hashVersion: smallint().notNull().default(1),
    /**
     * The whole result, in its stored form (`packAuditResult`; rows written before it hold the
     * full AuditResult, and `unpackAuditResult` reads both). Plain json (stored as written,
     * compressed with lz4 where the server has it): it is only ever written once and read whole,
     * and for a large club it runs to megabytes, which jsonb would parse and rebuild on every
     * insert.
     */
    result: json().$type<StoredAuditResult | AuditResult>().notNull(),
    /** The headline and the squad breakdown: what lists, trends and the board read. */
    figures: jsonb().$type<AuditFigures>().notNull(),
    /**
     * What the visits of the scope changed (shared/domain/visit-outcomes.ts), computed with the
     * audit and kept with it so that the report reads the same later; null without a visit.
     */
    visitOutcomes: json().$type<VisitOutcomes>(),
    createdBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    publishedAt: timestamp({ withTimezone: true, mode: 'date' }),
    publishedBy: text().references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({ columns: [t.clubId, t.squadId], foreignColumns: [squads.clubId, squads.id] }),
    index('audits_scope_idx').on(t.clubId, t.squadId, t.asOf),
  ],
)

/** What each age category asks for, per discipline; seeded from the published rules. */
export const requirementProfiles = pgTable(
  'requirement_profiles',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: text().notNull(),
    label: text().notNull(),
    discipline: disciplineEnum().notNull(),
    /** Only elements of this apparatus can meet the requirements (floor, tumbling, …). */
    apparatus: text().notNull(),
    categories: text().array().notNull(),
    source: text().notNull(),
    requirements: jsonb().notNull(),
    updatedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.id] })],
)

/** The club's age bands per discipline (calendar-year ages); seeded from the FIG rules. */
export const ageThresholds = pgTable(
  'age_thresholds',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    discipline: disciplineEnum().notNull(),
    juniorFromAge: integer().notNull(),
    seniorFromAge: integer().notNull(),
    source: text().notNull(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.discipline] })],
)

/**
 * Counters of the request limiters (rate-limiter-flexible's PostgreSQL store), shared by every
 * server process. Columns as that library reads and writes them; `expire` is epoch milliseconds.
 */
export const rateLimits = pgTable('rate_limits', {
  key: varchar({ length: 255 }).primaryKey(),
  points: integer().notNull().default(0),
  expire: bigint({ mode: 'number' }),
})

/**
 * An audit asked for and its progress, written by whichever worker computes it, so that any web
 * process answers a poll. The run's job (pg-boss) is sent in the same transaction as this row.
 */
export const auditRuns = pgTable(
  'audit_runs',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    /** The run as asked for: its squad (null for the whole club) and date. */
    run: jsonb().$type<AuditRun>().notNull(),
    requestedBy: text().references(() => users.id, { onDelete: 'set null' }),
    requesterRole: roleEnum().notNull(),
    jobId: uuid(),
    status: text().$type<'running' | 'done' | 'failed'>().notNull().default('running'),
    phase: text().notNull().default('queued'),
    done: integer().notNull().default(0),
    total: integer().notNull().default(1),
    auditId: uuid(),
    error: text(),
    createdAt: createdAt(),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({ columns: [t.clubId, t.auditId], foreignColumns: [audits.clubId, audits.id] }),
  ],
)

/** Raw bytes (PostgreSQL bytea), read and written as a Buffer. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' })

/**
 * A director's download of everything the club holds, built by a worker as one zip archive. The
 * row carries the build's progress, so that any web process answers a poll; the bytes live in
 * club_archive_files, which no poll reads. An archive is kept 24 hours, then purged.
 */
export const clubArchives = pgTable(
  'club_archives',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    requestedBy: text().references(() => users.id, { onDelete: 'set null' }),
    jobId: uuid(),
    status: text().$type<'running' | 'done' | 'failed'>().notNull().default('running'),
    phase: text().notNull().default('queued'),
    done: integer().notNull().default(0),
    total: integer().notNull().default(1),
    error: text(),
    createdAt: createdAt(),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
    /** A download after this answers 410; the purge deletes the row and its bytes. */
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    byteSize: integer(),
    /** SHA-256 of the whole zip, hex. */
    sha256: text(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    index('club_archives_expires_idx').on(t.expiresAt),
  ],
)

/** The zip of a finished archive, apart from its row so that polls never read it. */
export const clubArchiveFiles = pgTable(
  'club_archive_files',
  {
    clubId: uuid().notNull(),
    archiveId: uuid().notNull(),
    bytes: bytea().notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.archiveId] }),
    foreignKey({
      columns: [t.clubId, t.archiveId],
      foreignColumns: [clubArchives.clubId, clubArchives.id],
    }).onDelete('cascade'),
  ],
)

/**
 * A PDF report of an audit asked for by one person, drawn by a worker. The row carries the
 * drawing's progress, so that any web process answers a poll; the bytes live in
 * report_pdf_files, which no poll reads. `squadIds` is the part of the club the person could read
 * when asking (null: every squad): the worker draws that, and the PDF is handed only to the same
 * person with the same reach. Kept an hour, then purged.
 */
export const reportPdfs = pgTable(
  'report_pdfs',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    auditId: uuid().notNull(),
    requestedBy: text().references(() => users.id, { onDelete: 'cascade' }),
    squadIds: jsonb().$type<string[] | null>(),
    jobId: uuid(),
    status: text().$type<'running' | 'done' | 'failed'>().notNull().default('running'),
    phase: text().notNull().default('queued'),
    done: integer().notNull().default(0),
    total: integer().notNull().default(2),
    error: text(),
    createdAt: createdAt(),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
    /** A download after this answers 410; the purge deletes the row and its bytes. */
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    byteSize: integer(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.auditId],
      foreignColumns: [audits.clubId, audits.id],
    }).onDelete('cascade'),
    index('report_pdfs_audit_idx').on(t.clubId, t.auditId, t.requestedBy),
    index('report_pdfs_expires_idx').on(t.expiresAt),
  ],
)

/** The bytes of a drawn PDF report, apart from its row so that polls never read them. */
export const reportPdfFiles = pgTable(
  'report_pdf_files',
  {
    clubId: uuid().notNull(),
    reportPdfId: uuid().notNull(),
    bytes: bytea().notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.reportPdfId] }),
    foreignKey({
      columns: [t.clubId, t.reportPdfId],
      foreignColumns: [reportPdfs.clubId, reportPdfs.id],
    }).onDelete('cascade'),
  ],
)

/**
 * Mail on its way: written in the same transaction as the change that causes it and sent by a
 * worker, retried while the provider is down. Once sent, the text (which may hold a link that
 * signs someone in) is cleared.
 */
export const mailOutbox = pgTable('mail_outbox', {
  id: uuid().primaryKey().defaultRandom(),
  to: text().notNull(),
  subject: text().notNull(),
  text: text(),
  createdAt: createdAt(),
  sentAt: timestamp({ withTimezone: true, mode: 'date' }),
  attempts: integer().notNull().default(0),
  lastError: text(),
})
