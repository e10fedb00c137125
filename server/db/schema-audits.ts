import type { VisitOutcomes } from '../../shared/domain/visit-outcomes.ts'
import {
  customType,
  date,
  foreignKey,
  index,
  integer,
  json,
  jsonb,
  pgTable,
  primaryKey,
  smallint,
  text,
  timestamp,
  uuid,
} from 'drizzle-orm/pg-core'
import type { AuditFigures, AuditResult } from '../../shared/domain/audit/types.ts'
import type { AuditRun } from '../../shared/schemas/audits.ts'
import type { StoredAuditResult } from '../services/audit-storage.ts'
import { clubs, roleEnum, users } from './schema-accounts.ts'
import { disciplineEnum, squads } from './schema-athletes.ts'
import { createdAt } from './schema-columns.ts'

// Audits, the requirements they measure against, and what workers build for a poll to follow:
// audit runs, PDF reports and club archives. Club data, keyed by club_id first (see
// schema-accounts.ts).

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
