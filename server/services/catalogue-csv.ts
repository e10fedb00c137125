import { eq } from 'drizzle-orm'
import { deriveElement } from '../../shared/domain/catalogue.ts'
import {
  elementCsvColumns,
  elementFromCsvRow,
  elementToCsvRow,
} from '../../shared/domain/catalogue-csv.ts'
import { templateFamilyFor } from '../../shared/domain/progression-templates.ts'
import type { ImportIssue, ImportResult } from '../../shared/schemas/catalogue.ts'
import { elementInputSchema, type ElementInput } from '../../shared/schemas/elements.ts'
import type { ProgressionStep } from '../../shared/schemas/progressions.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { elements, elementSteps } from '../db/schema-catalogue.ts'
import { toCsv } from '../http/csv.ts'
import { elementColumns, listElements, stepRows } from './catalogue.ts'
import { templateSteps } from './catalogue-templates.ts'

// The catalogue as CSV: a whole file imported at once, and the export in the same columns.

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
      stepRows(access.clubId, row.id, families.get(row.templateFamily)!),
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
