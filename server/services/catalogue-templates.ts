import { and, asc, eq } from 'drizzle-orm'
import {
  progressionTemplates as standardTemplates,
  templateFamilyFor,
} from '../../shared/domain/progression-templates.ts'
import { standardCatalogue } from '../../shared/domain/standard-catalogue.ts'
import type { ProgressionTemplateView } from '../../shared/schemas/catalogue.ts'
import { progressionStepsSchema, type ProgressionStep } from '../../shared/schemas/progressions.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { elements, elementSteps, progressionTemplates } from '../db/schema-catalogue.ts'
import { notFound } from '../http/errors.ts'
import { elementColumns, stepRows } from './catalogue.ts'

// Progression templates: the steps a new element starts from, the club's templates and their
// edits, and the standard catalogue a new club is given.

/** The club's steps for a template family, or the standard ones when the club has none. */
export async function templateSteps(
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
    stepRows(
      clubId,
      row.id,
      standardTemplates[row.templateFamily as keyof typeof standardTemplates].steps,
    ),
  )
  await tx.insert(elementSteps).values(steps)
  return inserted.length
}
