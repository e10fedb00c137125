import { sql } from 'drizzle-orm'
import {
  foreignKey,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core'
import {
  directions,
  modalities,
  rotationClasses,
  shapes,
  takeOffs,
  twistBands,
} from '../../shared/domain/element.ts'
import { clubs, users } from './schema-accounts.ts'
import { createdAt } from './schema-columns.ts'

// The club's catalogue of elements, their progressions and the templates new progressions start
// from. Club data, keyed by club_id first (see schema-accounts.ts).

export const directionEnum = pgEnum('direction', directions)
export const shapeEnum = pgEnum('shape', shapes)
export const takeOffEnum = pgEnum('take_off', takeOffs)
export const rotationClassEnum = pgEnum('rotation_class', rotationClasses)
export const twistBandEnum = pgEnum('twist_band', twistBands)
export const modalityEnum = pgEnum('modality', modalities)

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
