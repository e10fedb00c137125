import { count, eq } from 'drizzle-orm'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { ArchivePhase } from '../../shared/schemas/archives.ts'
import type { DbOrTx } from '../db/client.ts'
import { toCsv, type CsvCell } from '../http/csv.ts'

/** A piece of a file and the data rows it holds. */
export interface ArchiveChunk {
  text: string
  rows: number
}

/** One file of the archive, written chunk by chunk (a page of a large table is one chunk). */
export interface ArchiveFile {
  name: string
  phase: ArchivePhase
  /** How many chunks `chunks()` yields: what the progress counts. */
  parts: number
  chunks(): AsyncGenerator<ArchiveChunk>
}

export type Row = Record<string, CsvCell>

export const iso = (d: Date | null) => (d ? d.toISOString() : null)
export const flag = (b: boolean) => (b ? 'true' : 'false')
export const json = (value: unknown) =>
  value === null || value === undefined ? null : JSON.stringify(value)

/**
 * CSV pages as chunks: the header with the first page (alone when there are no rows), then each
 * further page's rows. Every page goes through `toCsv`, so every cell is formula-escaped alike.
 */
async function* csvChunks(fields: readonly string[], pages: AsyncIterable<Row[]>) {
  let first = true
  for await (const rows of pages) {
    const csv = toCsv(fields, rows)
    if (first) yield { text: csv, rows: rows.length }
    else if (rows.length > 0) yield { text: csv.slice(csv.indexOf('\r\n')), rows: rows.length }
    first = false
  }
  if (first) yield { text: toCsv(fields, []), rows: 0 }
}

async function* onePage(rows: Promise<Row[]>) {
  yield await rows
}

export const csvFile = (
  name: string,
  phase: ArchivePhase,
  fields: readonly string[],
  rows: () => Promise<Row[]>,
): ArchiveFile => ({ name, phase, parts: 1, chunks: () => csvChunks(fields, onePage(rows())) })

/** A JSON file; `compact` for one that runs to megabytes (a large club's audit result). */
export const jsonFile = (
  name: string,
  phase: ArchivePhase,
  value: () => Promise<unknown>,
  options: { compact?: boolean } = {},
): ArchiveFile => ({
  name,
  phase,
  parts: 1,
  async *chunks() {
    const data = await value()
    const text = JSON.stringify(data, null, options.compact ? undefined : 2)
    yield { text, rows: Array.isArray(data) ? data.length : 1 }
  },
})

/**
 * A large table read in pages ordered by its key (keyset: each page starts after the last key
 * of the one before), so that memory holds one page whatever the club's size.
 */
export function pagedCsvFile<T>(options: {
  name: string
  phase: ArchivePhase
  fields: readonly string[]
  rowCount: number
  pageSize: number
  page: (after: T | null, limit: number) => Promise<T[]>
  toRow: (row: T) => Row
}): ArchiveFile {
  const { pageSize } = options
  async function* pages() {
    let after: T | null = null
    for (;;) {
      const rows = await options.page(after, pageSize)
      yield rows.map(options.toRow)
      if (rows.length < pageSize) return
      after = rows[rows.length - 1]!
    }
  }
  return {
    name: options.name,
    phase: options.phase,
    parts: Math.max(1, Math.ceil(options.rowCount / pageSize)),
    chunks: () => csvChunks(options.fields, pages()),
  }
}

export async function countOf(db: DbOrTx, table: PgTable & { clubId: PgColumn }, clubId: string) {
  const [row] = await db.select({ n: count() }).from(table).where(eq(table.clubId, clubId))
  return row?.n ?? 0
}
