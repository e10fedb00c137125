import { sql } from 'drizzle-orm'
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
  uniqueIndex,
  uuid,
  varchar,
} from 'drizzle-orm/pg-core'
import { roles } from '../../shared/domain/club.ts'
import { createdAt } from './schema-columns.ts'

// Every table of club data carries club_id and puts it first in its keys and foreign keys, so
// that rows of one club can never point at another club's rows, and so that the club tables can
// later be distributed by club_id with every key and join staying on one node. Tables looked up
// without knowing the club (clubs, users, sessions, password_resets, invitation_tokens,
// club_signups, rate_limits, mail_outbox) are the reference side. tests/server/schema-distribution.test.ts holds the live
// database to that; README "Beyond one database" gives the plan.
//
// This file holds the clubs, the people and their access to them, and the tables looked up
// without knowing the club.

export const roleEnum = pgEnum('role', roles)

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
 * Counters of the request limiters (rate-limiter-flexible's PostgreSQL store), shared by every
 * server process. Columns as that library reads and writes them; `expire` is epoch milliseconds.
 */
export const rateLimits = pgTable('rate_limits', {
  key: varchar({ length: 255 }).primaryKey(),
  points: integer().notNull().default(0),
  expire: bigint({ mode: 'number' }),
})

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
