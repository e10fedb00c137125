import { sql } from 'drizzle-orm'
import {
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
} from 'drizzle-orm/pg-core'
import { disciplines, roles, squadLevels } from '../../shared/domain/club.ts'

// Every table of club data carries club_id and puts it first in its keys and foreign keys, so
// that rows of one club can never point at another club's rows.

export const roleEnum = pgEnum('role', roles)
export const disciplineEnum = pgEnum('discipline', disciplines)
export const squadLevelEnum = pgEnum('squad_level', squadLevels)

const createdAt = () => timestamp({ withTimezone: true }).notNull().defaultNow()

export const clubs = pgTable('clubs', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  slug: text().notNull().unique(),
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
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text().notNull().unique(),
    expiresAt: timestamp({ withTimezone: true, mode: 'date' }).notNull(),
    invitedBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    acceptedAt: timestamp({ withTimezone: true, mode: 'date' }),
    withdrawnAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.id] })],
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
