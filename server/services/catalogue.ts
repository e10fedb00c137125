import { and, asc, eq, or, sql, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/pg-core'
import { deriveElement, findPrerequisiteCycle } from '../../shared/domain/catalogue.ts'
import {
  elementCsvColumns,
  elementFromCsvRow,
  elementToCsvRow,
} from '../../shared/domain/catalogue-csv.ts'
import {
  progressionTemplates as standardTemplates,
  templateFamilyFor,
} from '../../shared/domain/progression-templates.ts'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import type {
  ElementDetail,
  ElementQuery,
  ImportIssue,
  ImportResult,
  Prerequisite,
  ProgressionTemplateView,
  StepsUpdate,
} from '../../shared/schemas/catalogue.ts'
import {
  elementInputSchema,
  type CatalogueElement,
  type ElementInput,
} from '../../shared/schemas/elements.ts'
import { progressionStepsSchema, type ProgressionStep } from '../../shared/schemas/progressions.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { progressEvents } from '../db/schema-athletes.ts'
import {
  elementPrerequisites,
  elements,
  elementStepMaps,
  elementSteps,
  progressionTemplates,
} from '../db/schema-catalogue.ts'
import { clips } from '../db/schema-visits.ts'
import { toCsv } from '../http/csv.ts'
import { AppError, conflict, notFound } from '../http/errors.ts'
import { recomputeElementRecords } from './progress-records.ts'

type ElementRow = typeof elements.$inferSelect

/** The stored columns of an element: its description and what the server derives from it. */
function elementColumns(input: ElementInput) {
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

const counterpart = alias(elements, 'counterpart')

/** Elements with their counterpart found by key in SQL: one query, any filter. */
async function selectElements(db: DbOrTx, clubId: string, where: SQL[] = []) {
  const rows = await db
    .select({ element: elements, counterpartId: counterpart.id })
    .from(elements)
    .leftJoin(
      counterpart,
      and(
        eq(counterpart.clubId, elements.clubId),
        eq(counterpart.descriptionKey, elements.counterpartKey),
      ),
    )
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

async function stepsOf(db: DbOrTx, clubId: string, elementId: string): Promise<ProgressionStep[]> {
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

/** Refuses a name or a description that the club's catalogue already has. */
async function assertUnique(db: DbOrTx, clubId: string, input: ElementInput, exceptId?: string) {
  const { descriptionKey } = deriveElement(input)
  const clash = await db
    .select({ id: elements.id, name: elements.name, descriptionKey: elements.descriptionKey })
    .from(elements)
    .where(
      and(
        eq(elements.clubId, clubId),
        or(
          eq(elements.descriptionKey, descriptionKey),
          and(
            eq(elements.apparatus, input.apparatus),
            sql`lower(${elements.name}) = lower(${input.name})`,
          ),
        ),
      ),
    )
  const others = clash.filter((c) => c.id !== exceptId)
  const sameDescription = others.find((c) => c.descriptionKey === descriptionKey)
  if (sameDescription) {
    throw new AppError(
      409,
      'duplicate_description',
      `The catalogue already has this element as “${sameDescription.name}”.`,
      [{ path: 'name', message: `Same description as “${sameDescription.name}”.` }],
      { existingId: sameDescription.id },
    )
  }
  const sameName = others[0]
  if (sameName) {
    throw new AppError(
      409,
      'duplicate_name',
      `“${input.name}” is already a ${input.apparatus} element.`,
      [{ path: 'name', message: `Another ${input.apparatus} element has this name.` }],
    )
  }
}

async function templateSteps(
  db: DbOrTx,
  clubId: string,
  family: string,
): Promise<ProgressionStep[]> {
  const [row] = await db
    .select({ steps: progressionTemplates.steps })
    .from(progressionTemplates)
    .where(and(eq(progressionTemplates.clubId, clubId), eq(progressionTemplates.family, family)))
  return progressionStepsSchema.parse(
    row?.steps ?? standardTemplates[family as keyof typeof standardTemplates]?.steps,
  )
}

async function insertSteps(
  db: DbOrTx,
  clubId: string,
  elementId: string,
  steps: readonly ProgressionStep[],
) {
  await db.insert(elementSteps).values(
    steps.map((step, position) => ({
      clubId,
      elementId,
      position,
      name: step.name,
      modality: step.modality,
      criterion: step.criterion,
      minDays: step.minDays ?? null,
    })),
  )
}

/** A new element with its progression copied from the club's template for its family. */
export async function createElement(db: DbOrTx, access: ClubAccess, raw: unknown) {
  const input = elementInputSchema.parse(raw)
  const id = await db.transaction(async (tx) => {
    await assertUnique(tx, access.clubId, input)
    const family = templateFamilyFor(input)
    const [row] = await tx
      .insert(elements)
      .values({ clubId: access.clubId, ...elementColumns(input), templateFamily: family })
      .returning({ id: elements.id })
    await insertSteps(tx, access.clubId, row!.id, await templateSteps(tx, access.clubId, family))
    return row!.id
  })
  const [created] = await selectElements(db, access.clubId, [eq(elements.id, id)])
  return created!
}

export async function updateElement(db: DbOrTx, access: ClubAccess, id: string, raw: unknown) {
  const input = elementInputSchema.parse(raw)
  await db.transaction(async (tx) => {
    const [current] = await tx
      .select({ id: elements.id })
      .from(elements)
      .where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
      .for('update')
    if (!current) throw notFound('No such element in this club’s catalogue.')
    await assertUnique(tx, access.clubId, input, id)
    await tx
      .update(elements)
      .set({ ...elementColumns(input), updatedAt: new Date() })
      .where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
  })
  const [updated] = await selectElements(db, access.clubId, [eq(elements.id, id)])
  return updated!
}

export async function deleteElement(db: DbOrTx, access: ClubAccess, id: string) {
  await db.transaction(async (tx) => {
    const [current] = await tx
      .select({ id: elements.id, name: elements.name })
      .from(elements)
      .where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
      .for('update')
    if (!current) throw notFound('No such element in this club’s catalogue.')
    const athletes = await athletesWithRecords(tx, access.clubId, id)
    if (athletes > 0) {
      throw new AppError(
        409,
        'has_records',
        `“${current.name}” cannot be deleted: ${athletes} athlete${athletes === 1 ? ' has' : 's have'} records on it.`,
      )
    }
    const [clip] = await tx
      .select({ id: clips.id })
      .from(clips)
      .where(and(eq(clips.clubId, access.clubId), eq(clips.elementId, id)))
      .limit(1)
    if (clip)
      throw new AppError(
        409,
        'has_clips',
        `“${current.name}” cannot be deleted: clips of attempts at it are kept.`,
      )
    await tx.delete(elements).where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
  })
}

/**
 * New steps for an element. With athletes on it the director must map every old step to a new
 * one; the mapping is kept, and the records are read through it, so none is lost or moved
 * silently. The edit applies only to the steps version it was made against, checked under the
 * element's row lock: of two edits made from the same version one wins and the other gets 409
 * with the element as it stands, so a mapping is never applied on top of itself.
 */
export async function replaceSteps(
  db: DbOrTx,
  access: ClubAccess,
  id: string,
  update: StepsUpdate,
) {
  await db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(elements)
      .where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
      .for('update')
    if (!current) throw notFound('No such element in this club’s catalogue.')
    if (current.stepsVersion !== update.stepsVersion) {
      throw conflict(
        'Someone else has just changed this progression. Here it is as it stands now; check it and make your change again.',
        { element: await getElement(tx, access.clubId, id) },
      )
    }
    const old = await stepsOf(tx, access.clubId, id)
    const athletes = await athletesWithRecords(tx, access.clubId, id)
    if (athletes > 0) {
      if (!update.mapping) {
        throw new AppError(
          409,
          'steps_need_mapping',
          `${athletes} athlete${athletes === 1 ? ' is' : 's are'} on this progression: say which new step each of the ${old.length} current steps becomes, so that no record is lost or moved silently.`,
          undefined,
          { athletes, currentSteps: old.map((s) => s.name) },
        )
      }
      if (update.mapping.length !== old.length) {
        throw new AppError(
          400,
          'invalid_mapping',
          `Map each of the ${old.length} current steps (got ${update.mapping.length}).`,
          [{ path: 'mapping', message: `Map each of the ${old.length} current steps.` }],
        )
      }
      const bad = update.mapping.findIndex((to) => to >= update.steps.length)
      if (bad >= 0) {
        throw new AppError(
          400,
          'invalid_mapping',
          `Step ${bad + 1} is mapped to a step that does not exist.`,
          [{ path: `mapping.${bad}`, message: 'No such new step.' }],
        )
      }
      await tx.insert(elementStepMaps).values({
        clubId: access.clubId,
        elementId: id,
        fromVersion: current.stepsVersion,
        mapping: update.mapping,
        createdBy: access.userId,
      })
    }
    await tx
      .delete(elementSteps)
      .where(and(eq(elementSteps.clubId, access.clubId), eq(elementSteps.elementId, id)))
    await insertSteps(tx, access.clubId, id, update.steps)
    await tx
      .update(elements)
      .set({ stepsVersion: current.stepsVersion + 1, updatedAt: new Date() })
      .where(and(eq(elements.clubId, access.clubId), eq(elements.id, id)))
    if (athletes > 0) await recomputeElementRecords(tx, access.clubId, id)
    // A prerequisite may point past the end of a shortened progression: keep it at the last step.
    await tx
      .update(elementPrerequisites)
      .set({ stepIndex: update.steps.length - 1 })
      .where(
        and(
          eq(elementPrerequisites.clubId, access.clubId),
          eq(elementPrerequisites.requiresElementId, id),
          sql`${elementPrerequisites.stepIndex} >= ${update.steps.length}`,
        ),
      )
  })
  return getElement(db, access.clubId, id)
}

/**
 * The whole prerequisite list of one element; a cycle is refused and named. The club's elements
 * are locked (in id order, so that two edits cannot deadlock) for the length of the change: two
 * edits at once would otherwise each check for a cycle without seeing the other, and two
 * identical ones would both insert the same rows.
 */
export async function replacePrerequisites(
  db: DbOrTx,
  access: ClubAccess,
  id: string,
  list: Prerequisite[],
) {
  await db.transaction(async (tx) => {
    const rows = await tx
      .select({ id: elements.id, name: elements.name, apparatus: elements.apparatus })
      .from(elements)
      .where(eq(elements.clubId, access.clubId))
      .orderBy(asc(elements.id))
      // Not 'update': that would also hold back every progress event referencing an element.
      .for('no key update')
    const byId = new Map(rows.map((r) => [r.id, r]))
    if (!byId.has(id)) throw notFound('No such element in this club’s catalogue.')
    for (const [i, p] of list.entries()) {
      if (!byId.has(p.elementId)) {
        throw new AppError(
          400,
          'invalid_input',
          'A prerequisite is not in this club’s catalogue.',
          [{ path: `prerequisites.${i}.elementId`, message: 'Not in this club’s catalogue.' }],
        )
      }
      if (p.elementId === id) {
        throw new AppError(400, 'prerequisite_cycle', 'An element cannot require itself.', [
          { path: `prerequisites.${i}.elementId`, message: 'An element cannot require itself.' },
        ])
      }
      const steps = await stepsOf(tx, access.clubId, p.elementId)
      if (p.stepIndex >= steps.length) {
        throw new AppError(
          400,
          'invalid_input',
          `${byId.get(p.elementId)!.name} has only ${steps.length} steps.`,
          [
            {
              path: `prerequisites.${i}.stepIndex`,
              message: `Choose one of its ${steps.length} steps.`,
            },
          ],
        )
      }
    }
    const others = await tx
      .select({
        elementId: elementPrerequisites.elementId,
        requiresElementId: elementPrerequisites.requiresElementId,
      })
      .from(elementPrerequisites)
      .where(eq(elementPrerequisites.clubId, access.clubId))
    const cycle = findPrerequisiteCycle(
      others.filter((e) => e.elementId !== id),
      list.map((p) => ({ elementId: id, requiresElementId: p.elementId })),
    )
    if (cycle) {
      const names = cycle.map((c) => byId.get(c)?.name ?? c).join(' → ')
      throw new AppError(
        400,
        'prerequisite_cycle',
        `These prerequisites would go round in a circle: ${names}.`,
        [{ path: 'prerequisites', message: `Circular: ${names}.` }],
      )
    }
    await tx
      .delete(elementPrerequisites)
      .where(
        and(eq(elementPrerequisites.clubId, access.clubId), eq(elementPrerequisites.elementId, id)),
      )
    if (list.length > 0) {
      await tx.insert(elementPrerequisites).values(
        list.map((p) => ({
          clubId: access.clubId,
          elementId: id,
          requiresElementId: p.elementId,
          stepIndex: p.stepIndex,
        })),
      )
    }
  })
  return getElement(db, access.clubId, id)
}

/**
 * Validates every row, against the schema, the rest of the file and the catalogue; saves all of
 * them in one transaction only when none has a problem.
 */
export async function importElements(
  db: DbOrTx,
  access: ClubAccess,
  rows: Record<string, unknown>[],
  dryRun: boolean,
): Promise<ImportResult> {
  const errors: ImportIssue[] = []
  const valid: ElementInput[] = []
  const existing = await db
    .select({
      name: elements.name,
      apparatus: elements.apparatus,
      descriptionKey: elements.descriptionKey,
    })
    .from(elements)
    .where(eq(elements.clubId, access.clubId))
  const keys = new Map(existing.map((e) => [e.descriptionKey, `the catalogue’s “${e.name}”`]))
  const names = new Map(
    existing.map((e) => [`${e.apparatus}|${e.name.toLowerCase()}`, 'the catalogue']),
  )
  rows.forEach((raw, i) => {
    const row = i + 1
    const parsed = elementInputSchema.safeParse(elementFromCsvRow(raw))
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        errors.push({ row, field: String(issue.path[0] ?? ''), message: issue.message })
      return
    }
    const input = parsed.data
    const key = deriveElement(input).descriptionKey
    const nameKey = `${input.apparatus}|${input.name.toLowerCase()}`
    if (keys.has(key))
      errors.push({ row, field: 'name', message: `Same element as ${keys.get(key)}.` })
    else if (names.has(nameKey))
      errors.push({
        row,
        field: 'name',
        message: `The name is already used in ${names.get(nameKey)}.`,
      })
    else {
      keys.set(key, `row ${row}`)
      names.set(nameKey, `row ${row}`)
      valid.push(input)
    }
  })
  if (errors.length > 0 || dryRun) return { valid: errors.length === 0, errors, created: 0 }
  await db.transaction(async (tx) => {
    const families = new Map<string, ProgressionStep[]>()
    for (const input of valid) {
      const family = templateFamilyFor(input)
      if (!families.has(family))
        families.set(family, await templateSteps(tx, access.clubId, family))
    }
    const inserted = await tx
      .insert(elements)
      .values(
        valid.map((input) => ({
          clubId: access.clubId,
          ...elementColumns(input),
          templateFamily: templateFamilyFor(input),
        })),
      )
      .returning({ id: elements.id, templateFamily: elements.templateFamily })
    const steps = inserted.flatMap((row) =>
      families.get(row.templateFamily)!.map((step, position) => ({
        clubId: access.clubId,
        elementId: row.id,
        position,
        name: step.name,
        modality: step.modality,
        criterion: step.criterion,
        minDays: step.minDays ?? null,
      })),
    )
    await tx.insert(elementSteps).values(steps)
  })
  return { valid: true, errors: [], created: valid.length }
}

export async function exportCsv(db: DbOrTx, clubId: string) {
  const list = await listElements(db, clubId)
  return toCsv(
    elementCsvColumns,
    list.map((e) => elementToCsvRow(e)),
  )
}

export async function listTemplates(
  db: DbOrTx,
  clubId: string,
): Promise<ProgressionTemplateView[]> {
  const rows = await db
    .select()
    .from(progressionTemplates)
    .where(eq(progressionTemplates.clubId, clubId))
    .orderBy(asc(progressionTemplates.family))
  return rows.map((r) => ({
    family: r.family,
    label: r.label,
    steps: progressionStepsSchema.parse(r.steps),
  }))
}

/** New steps for a template: elements created from now on start from them. */
export async function updateTemplate(
  db: DbOrTx,
  access: ClubAccess,
  family: string,
  steps: ProgressionStep[],
) {
  const [row] = await db
    .update(progressionTemplates)
    .set({ steps, updatedAt: new Date() })
    .where(
      and(eq(progressionTemplates.clubId, access.clubId), eq(progressionTemplates.family, family)),
    )
    .returning()
  if (!row) throw notFound('No such progression template.')
  return { family: row.family, label: row.label, steps: progressionStepsSchema.parse(row.steps) }
}

/**
 * Gives a new club the standard catalogue and the progression templates, in the caller's
 * transaction: a few multi-row inserts, not one per element.
 */
export async function installStandardCatalogue(tx: DbOrTx, clubId: string) {
  await tx.insert(progressionTemplates).values(
    Object.values(standardTemplates).map((t) => ({
      clubId,
      family: t.family,
      label: t.label,
      steps: t.steps,
    })),
  )
  const inserted = await tx
    .insert(elements)
    .values(
      standardCatalogue.map((input) => ({
        clubId,
        ...elementColumns(input),
        templateFamily: templateFamilyFor(input),
      })),
    )
    .returning({ id: elements.id, templateFamily: elements.templateFamily })
  const steps = inserted.flatMap((row) =>
    standardTemplates[row.templateFamily as keyof typeof standardTemplates].steps.map(
      (step, position) => ({
        clubId,
        elementId: row.id,
        position,
        name: step.name,
        modality: step.modality,
        criterion: step.criterion,
        minDays: step.minDays ?? null,
      }),
    ),
  )
  await tx.insert(elementSteps).values(steps)
  return inserted.length
}
