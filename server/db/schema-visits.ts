import {
  bigint,
  date,
  foreignKey,
  index,
  integer,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from 'drizzle-orm/pg-core'
import { recommendationPriorities, recommendationStatuses } from '../../shared/domain/visits.ts'
import { clubs, invitations, users } from './schema-accounts.ts'
import { athletes, squads } from './schema-athletes.ts'
import { elements } from './schema-catalogue.ts'
import { createdAt } from './schema-columns.ts'

// Clinician visits and their recommendations: club data, keyed by club_id first like every
// other club table (see schema-accounts.ts).

export const recommendationPriorityEnum = pgEnum(
  'recommendation_priority',
  recommendationPriorities,
)
export const recommendationStatusEnum = pgEnum('recommendation_status', recommendationStatuses)

/**
 * A clinician's visit: the days, inclusive, during which they read the covered squads and leave
 * recommendations. The clinician is a member of the club, or someone invited by e-mail whose
 * invitation names the visit until they accept it.
 */
export const visits = pgTable(
  'visits',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    clinicianId: text().references(() => users.id, { onDelete: 'set null' }),
    invitationId: uuid(),
    firstDay: date().notNull(),
    lastDay: date().notNull(),
    agenda: text().notNull().default(''),
    createdBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    cancelledAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.invitationId],
      foreignColumns: [invitations.clubId, invitations.id],
    }),
    index('visits_clinician_idx').on(t.clubId, t.clinicianId),
  ],
)

/** The squads a visit covers: the clinician reads only these. */
export const visitSquads = pgTable(
  'visit_squads',
  {
    clubId: uuid().notNull(),
    visitId: uuid().notNull(),
    squadId: uuid().notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.visitId, t.squadId] }),
    foreignKey({
      columns: [t.clubId, t.visitId],
      foreignColumns: [visits.clubId, visits.id],
    }).onDelete('cascade'),
    foreignKey({
      columns: [t.clubId, t.squadId],
      foreignColumns: [squads.clubId, squads.id],
    }).onDelete('cascade'),
    index('visit_squads_squad_idx').on(t.clubId, t.squadId),
  ],
)

/**
 * A short video of an athlete's attempt at an element, uploaded by a coach. The bytes live in
 * the clip store under `objectKey`; the row says whose attempt it is and how to serve it.
 */
export const clips = pgTable(
  'clips',
  {
    clubId: uuid().notNull(),
    id: uuid().notNull().defaultRandom(),
    athleteId: uuid().notNull(),
    elementId: uuid().notNull(),
    objectKey: text().notNull(),
    contentType: text().notNull(),
    sizeBytes: bigint({ mode: 'number' }).notNull(),
    fileName: text().notNull().default(''),
    note: text().notNull().default(''),
    uploadedBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.athleteId],
      foreignColumns: [athletes.clubId, athletes.id],
    }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }),
    index('clips_athlete_idx').on(t.clubId, t.athleteId, t.elementId),
  ],
)

/** A clinician marked the clip reviewed: it leaves their list of clips waiting. */
export const clipReviews = pgTable(
  'clip_reviews',
  {
    clubId: uuid().notNull(),
    clipId: uuid().notNull(),
    userId: text()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    reviewedAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.clipId, t.userId] }),
    foreignKey({
      columns: [t.clubId, t.clipId],
      foreignColumns: [clips.clubId, clips.id],
    }).onDelete('cascade'),
  ],
)

/**
 * A clinician's recommendation on a squad, an athlete of it, or an athlete's element with the
 * step to aim for (its index in the element's steps version `stepsVersion`), possibly about one
 * of the athlete's clips.
 */
export const recommendations = pgTable(
  'recommendations',
  {
    clubId: uuid().notNull(),
    id: uuid().notNull().defaultRandom(),
    visitId: uuid().notNull(),
    squadId: uuid().notNull(),
    athleteId: uuid(),
    elementId: uuid(),
    suggestedStepIndex: integer(),
    stepsVersion: integer(),
    clipId: uuid(),
    text: text().notNull(),
    priority: recommendationPriorityEnum().notNull().default('normal'),
    dueOn: date().notNull(),
    status: recommendationStatusEnum().notNull().default('open'),
    createdBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    /** Set in the transaction that puts the reminder mail on its way: it goes once. */
    remindedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.visitId],
      foreignColumns: [visits.clubId, visits.id],
    }),
    foreignKey({
      columns: [t.clubId, t.squadId],
      foreignColumns: [squads.clubId, squads.id],
    }),
    foreignKey({
      columns: [t.clubId, t.athleteId],
      foreignColumns: [athletes.clubId, athletes.id],
    }),
    foreignKey({
      columns: [t.clubId, t.elementId],
      foreignColumns: [elements.clubId, elements.id],
    }).onDelete('cascade'),
    foreignKey({
      columns: [t.clubId, t.clipId],
      foreignColumns: [clips.clubId, clips.id],
    }),
    index('recommendations_squad_idx').on(t.clubId, t.squadId),
    index('recommendations_athlete_idx').on(t.clubId, t.athleteId),
    index('recommendations_visit_idx').on(t.clubId, t.visitId),
  ],
)

/** Every status a recommendation went through, with who and when: appended, never changed. */
export const recommendationEvents = pgTable(
  'recommendation_events',
  {
    clubId: uuid().notNull(),
    id: uuid().notNull().defaultRandom(),
    recommendationId: uuid().notNull(),
    status: recommendationStatusEnum().notNull(),
    note: text().notNull().default(''),
    byUserId: text().references(() => users.id, { onDelete: 'set null' }),
    at: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.recommendationId],
      foreignColumns: [recommendations.clubId, recommendations.id],
    }).onDelete('cascade'),
    index('recommendation_events_recommendation_idx').on(t.clubId, t.recommendationId),
  ],
)
