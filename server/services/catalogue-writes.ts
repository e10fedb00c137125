import { and, eq, or, sql } from 'drizzle-orm'
import { deriveElement } from '../../shared/domain/catalogue.ts'
import { templateFamilyFor } from '../../shared/domain/progression-templates.ts'
import { elementInputSchema, type ElementInput } from '../../shared/schemas/elements.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { elements } from '../db/schema-catalogue.ts'
import { clips } from '../db/schema-visits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { athletesWithRecords, elementColumns, selectElements } from './catalogue.ts'
import { insertSteps } from './catalogue-steps.ts'
import { templateSteps } from './catalogue-templates.ts'

// Creating, editing and deleting one element of a club's catalogue.

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
