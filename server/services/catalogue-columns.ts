import { and, eq, sql } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { elements, elementSteps } from '../db/schema-catalogue.ts'

// Pieces of SQL that every read of the catalogue's elements shares: how an element's counterpart
// is found and how long its progression is.

/** The elements table again, as the counterpart of the element being read. */
export const counterpart = alias(elements, 'counterpart')

/** Joins an element to its counterpart: the club's element whose description is its mirror. */
export const counterpartOfElement = and(
  eq(counterpart.clubId, elements.clubId),
  eq(counterpart.descriptionKey, elements.counterpartKey),
)

/** The number of steps in the element's progression; `whenNone` when it has none. */
export function progressionLength(whenNone: 0 | 1) {
  return sql<number>`(select coalesce(max(${elementSteps.position}) + 1, ${sql.raw(String(whenNone))})::int from ${elementSteps} where ${elementSteps.clubId} = ${elements.clubId} and ${elementSteps.elementId} = ${elements.id})`
}
