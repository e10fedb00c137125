import { and, asc, eq, sql, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { deriveElement } from '../../shared/domain/catalogue.ts'
import type { ElementDetail, ElementQuery } from '../../shared/schemas/catalogue.ts'
import type { CatalogueElement, ElementInput } from '../../shared/schemas/elements.ts'
import type { ProgressionStep } from '../../shared/schemas/progressions.ts'
import type { DbOrTx } from '../db/client.ts'
import { progressEvents } from '../db/schema-athletes.ts'
import { elementPrerequisites, elements, elementSteps } from '../db/schema-catalogue.ts'
import { notFound } from '../http/errors.ts'
import { counterpart, counterpartOfElement } from './catalogue-columns.ts'

// The catalogue's reads: elements with their counterparts, one element with its steps and
// prerequisites, and the mappings from an element's description and its steps to their stored
// columns that the writes share. Writes are in catalogue-writes.ts, steps and prerequisites in catalogue-steps.ts,
// CSV in catalogue-csv.ts, templates and the standard catalogue in catalogue-templates.ts.
type ElementRow = typeof elements.$inferSelect

/** The stored columns of an element: its description and what the server derives from it. */
export function elementColumns(input: ElementInput) {
  const derived = deriveElement(input)
  return {
    name: input.name,
    apparatus: input.apparatus,
    direction: input.direction,
    quarterRotations: input.quarterRotations,
    twists: [...input.twists],
    shape: input.shape,
    takeOff: input.takeOff,
    difficultyLetter: input.difficultyLetter ?? null,
    notes: input.notes ?? null,
    rotationClass: derived.rotationClass,
    twistBand: derived.twistBand,
    descriptionKey: derived.descriptionKey,
    counterpartKey: derived.counterpartKey,
  }
}

/** The stored rows of an element's steps, numbered from 0 in the order given. */
export function stepRows(clubId: string, elementId: string, steps: readonly ProgressionStep[]) {
  return steps.map((step, position) => ({
    clubId,
    elementId,
    position,
    name: step.name,
    modality: step.modality,
    criterion: step.criterion,
    minDays: step.minDays ?? null,
  }))
}

function toApi(row: ElementRow, counterpartId: string | null): CatalogueElement {
  const input: ElementInput = {
    name: row.name,
    apparatus: row.apparatus,
    direction: row.direction,
    quarterRotations: row.quarterRotations,
    twists: row.twists,
    shape: row.shape,
    takeOff: row.takeOff,
    difficultyLetter: row.difficultyLetter as ElementInput['difficultyLetter'],
    notes: row.notes,
  }
  const { descriptionKey: _key, ...derived } = deriveElement(input)
  return { ...input, ...derived, id: row.id, clubId: row.clubId, counterpartId }
}

/** Elements with their counterpart found by key in SQL: one query, any filter. */
export async function selectElements(db: DbOrTx, clubId: string, where: SQL[] = []) {
  const rows = await db
    .select({ element: elements, counterpartId: counterpart.id })
    .from(elements)
    .leftJoin(counterpart, counterpartOfElement)
    .where(and(eq(elements.clubId, clubId), ...where))
    .orderBy(asc(elements.apparatus), asc(elements.quarterRotations), asc(elements.name))
  return rows.map((r) => toApi(r.element, r.counterpartId))
}

export async function listElements(db: DbOrTx, clubId: string, query: ElementQuery = {}) {
  const where: SQL[] = []
  if (query.apparatus) where.push(eq(elements.apparatus, query.apparatus))
  if (query.direction) where.push(eq(elements.direction, query.direction))
  if (query.rotationClass) where.push(eq(elements.rotationClass, query.rotationClass))
  if (query.twistBand) where.push(eq(elements.twistBand, query.twistBand))
  if (query.shape) where.push(eq(elements.shape, query.shape))
  const list = await selectElements(db, clubId, where)
  // The notation is derived, not stored, so the search runs over the derived list.
  const q = query.q?.toLowerCase()
  return q
    ? list.filter((e) =>
        [e.name, e.notes ?? '', e.notation ?? ''].some((text) => text.toLowerCase().includes(q)),
      )
    : list
}

export async function stepsOf(
  db: DbOrTx,
  clubId: string,
  elementId: string,
): Promise<ProgressionStep[]> {
  const rows = await db
    .select()
    .from(elementSteps)
    .where(and(eq(elementSteps.clubId, clubId), eq(elementSteps.elementId, elementId)))
    .orderBy(asc(elementSteps.position))
  return rows.map((r) => ({
    name: r.name,
    modality: r.modality,
    criterion: r.criterion,
    minDays: r.minDays,
  }))
}

/** Athletes with at least one event on the element. */
export async function athletesWithRecords(db: DbOrTx, clubId: string, elementId: string) {
  const [row] = await db
    .select({ n: sql<number>`count(distinct ${progressEvents.athleteId})::int` })
    .from(progressEvents)
    .where(and(eq(progressEvents.clubId, clubId), eq(progressEvents.elementId, elementId)))
  return row?.n ?? 0
}

export async function getElement(db: DbOrTx, clubId: string, id: string): Promise<ElementDetail> {
  const [element] = await selectElements(db, clubId, [eq(elements.id, id)])
  if (!element) throw notFound('No such element in this club’s catalogue.')
  const [row] = await db
    .select({ templateFamily: elements.templateFamily, stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(and(eq(elements.clubId, clubId), eq(elements.id, id)))
  const required = alias(elements, 'required')
  const prerequisites = await db
    .select({
      elementId: elementPrerequisites.requiresElementId,
      stepIndex: elementPrerequisites.stepIndex,
      name: required.name,
      apparatus: required.apparatus,
      stepName: elementSteps.name,
    })
    .from(elementPrerequisites)
    .innerJoin(
      required,
      and(
        eq(required.clubId, elementPrerequisites.clubId),
        eq(required.id, elementPrerequisites.requiresElementId),
      ),
    )
    .leftJoin(
      elementSteps,
      and(
        eq(elementSteps.clubId, elementPrerequisites.clubId),
        eq(elementSteps.elementId, elementPrerequisites.requiresElementId),
        eq(elementSteps.position, elementPrerequisites.stepIndex),
      ),
    )
    .where(and(eq(elementPrerequisites.clubId, clubId), eq(elementPrerequisites.elementId, id)))
  return {
    ...element,
    steps: await stepsOf(db, clubId, id),
    prerequisites,
    athletesWithRecords: await athletesWithRecords(db, clubId, id),
    templateFamily: row!.templateFamily,
    stepsVersion: row!.stepsVersion,
  }
}
