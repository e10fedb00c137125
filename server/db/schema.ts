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
