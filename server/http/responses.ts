import type { Response } from 'express'
import type { ImportResult } from '../../shared/schemas/catalogue.ts'
import { AppError } from './errors.ts'

/**
 * Answers an all-or-nothing CSV import: a dry run always with its per-row errors (200), a real
 * import 201 when saved, or 422 naming each row and field when nothing was saved.
 */
export function sendImportResult(res: Response, result: ImportResult, dryRun: boolean) {
  if (!dryRun && !result.valid) {
    throw new AppError(
      422,
      'invalid_rows',
      `${new Set(result.errors.map((e) => e.row)).size} rows have problems: nothing was imported.`,
      result.errors.map((e) => ({ path: `rows.${e.row}.${e.field}`, message: e.message })),
      { rows: result.errors },
    )
  }
  res.status(dryRun ? 200 : 201).json(result)
}

/** Sends text as a CSV file download. */
export function sendCsv(res: Response, filename: string, csv: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8')
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`)
  res.send(csv)
}
