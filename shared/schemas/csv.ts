import { z } from 'zod'

const controlNames: Record<string, string> = {
  '\t': 'a tab',
  '\n': 'a line break',
  '\r': 'a line break',
}

/** Why a cell cannot be imported, or null when it is plain text. */
function cellProblem(cell: unknown): string | null {
  if (typeof cell !== 'string') {
    const got =
      cell === null
        ? 'an empty value (null)'
        : Array.isArray(cell)
          ? 'a list'
          : typeof cell === 'object'
            ? 'an object'
            : `a ${typeof cell}`
    return `Send the cell as text, not ${got}.`
  }
  // A cell is one line of text: C0 controls (U+0000–U+001F, tab and line breaks included) and
  // DEL have no place in a name or a note, and would be stored and exported unseen.
  for (const ch of cell) {
    const code = ch.charCodeAt(0)
    if (code <= 0x1f || code === 0x7f) {
      const name =
        controlNames[ch] ??
        `the control character U+${code.toString(16).toUpperCase().padStart(4, '0')}`
      return `Remove ${name} from the cell: a cell is one line of text without control characters.`
    }
  }
  return null
}

/**
 * The rows of a CSV import, keyed by the file's header: every cell must be text without control
 * characters. Each problem is reported at `rows.<row>.<column>` with the row counted from 1 below
 * the header, as the import's own per-row errors are.
 */
export function csvRowsSchema(maxRows: number) {
  return z
    .array(z.record(z.string(), z.unknown()))
    .min(1, 'The file has no rows.')
    .max(maxRows, `At most ${maxRows} rows at once.`)
    .superRefine((rows, ctx) => {
      rows.forEach((row, i) => {
        for (const [column, cell] of Object.entries(row)) {
          const message = cellProblem(cell)
          if (message) ctx.addIssue({ code: 'custom', path: [i + 1, column], message })
        }
      })
    })
}
