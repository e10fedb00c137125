import { sql } from 'drizzle-orm'
import {
  boolean,
  date,
  foreignKey,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core'
import { disciplines, squadLevels } from '../../shared/domain/club.ts'
import {
  pauseReasons,
  progressEventKinds,
  type TimelinePoint,
} from '../../shared/domain/progress.ts'
import { clubs, memberships, users } from './schema-accounts.ts'
import { elements } from './schema-catalogue.ts'
import { createdAt } from './schema-columns.ts'

// The squads and their coaches, the athletes, and the athletes' progress on the catalogue's
// elements. Club data, keyed by club_id first (see schema-accounts.ts).

export const disciplineEnum = pgEnum('discipline', disciplines)
export const squadLevelEnum = pgEnum('squad_level', squadLevels)
export const progressEventKindEnum = pgEnum('progress_event_kind', progressEventKinds)
export const pauseReasonEnum = pgEnum('pause_reason', pauseReasons)

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
