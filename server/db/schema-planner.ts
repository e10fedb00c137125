import {
  boolean,
  date,
  foreignKey,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core'
import type { Placement, PlanModel } from '../../shared/domain/planner/types.ts'
import type { PlanOutcome } from '../../shared/schemas/planner.ts'
import { clubs, users } from './schema-accounts.ts'
import { squads } from './schema-athletes.ts'
import { modalityEnum } from './schema-catalogue.ts'
import { createdAt } from './schema-columns.ts'

// The session planner: the club's stations and its saved plans. Club data, keyed by club_id
// first like every other club table (see schema-accounts.ts).

/** A station of the club's gym, saved once and chosen for each plan. */
export const plannerStations = pgTable(
  'planner_stations',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    name: text().notNull(),
    modality: modalityEnum().notNull(),
    capacity: integer().notNull(),
    secondsPerTurn: integer().notNull(),
    needsSpotter: boolean().notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.clubId, t.id] }), uniqueIndex().on(t.clubId, t.name)],
)

/**
 * A saved plan for a squad's session: the model it was computed from (a copy of the stations and
 * of each athlete's focus steps as they were) and the placements, as the coach left them; after
 * the session, what was recorded from it.
 */
export const sessionPlans = pgTable(
  'session_plans',
  {
    clubId: uuid()
      .notNull()
      .references(() => clubs.id, { onDelete: 'cascade' }),
    id: uuid().notNull().defaultRandom(),
    squadId: uuid().notNull(),
    sessionDate: date().notNull(),
    model: jsonb().$type<PlanModel>().notNull(),
    placements: jsonb().$type<Placement[]>().notNull(),
    outcome: jsonb().$type<PlanOutcome>(),
    createdBy: text().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: createdAt(),
    recordedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [
    primaryKey({ columns: [t.clubId, t.id] }),
    foreignKey({
      columns: [t.clubId, t.squadId],
      foreignColumns: [squads.clubId, squads.id],
    }).onDelete('cascade'),
    index('session_plans_squad_idx').on(t.clubId, t.squadId, t.sessionDate),
  ],
)
