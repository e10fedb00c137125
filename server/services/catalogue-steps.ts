import { and, asc, eq, sql } from 'drizzle-orm'
import { findPrerequisiteCycle } from '../../shared/domain/catalogue.ts'
import type { Prerequisite, StepsUpdate } from '../../shared/schemas/catalogue.ts'
import type { ProgressionStep } from '../../shared/schemas/progressions.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import {
  elementPrerequisites,
  elements,
  elementStepMaps,
  elementSteps,
} from '../db/schema-catalogue.ts'
import { AppError, conflict, notFound } from '../http/errors.ts'
import { athletesWithRecords, getElement, stepRows, stepsOf } from './catalogue.ts'
import { recomputeElementRecords } from './progress-records.ts'

// An element's progression and its prerequisites, each replaced as a whole.

/** Inserts the element's steps, numbered from 0 in the order given. */
export async function insertSteps(
  db: DbOrTx,
  clubId: string,
  elementId: string,
  steps: readonly ProgressionStep[],
) {
  await db.insert(elementSteps).values(stepRows(clubId, elementId, steps))
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
