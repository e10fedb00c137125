import type { ElementInput } from '../schemas/elements.ts'

/** The columns of the catalogue's CSV, in file order; the same for export and import. */
export const elementCsvColumns = [
  'name',
  'apparatus',
  'direction',
  'quarterRotations',
  'twists',
  'shape',
  'takeOff',
  'difficultyLetter',
  'notes',
] as const

export type ElementCsvRow = Record<(typeof elementCsvColumns)[number], string>

/**
 * One element as a CSV row. Twists are written as half turns per salto separated by spaces
 * ("2 0" is a full-in double); an empty cell means no salto, hence no twist entries.
 */
export function elementToCsvRow(element: ElementInput): ElementCsvRow {
  return {
    name: element.name,
    apparatus: element.apparatus,
    direction: element.direction,
    quarterRotations: String(element.quarterRotations),
    twists: element.twists.join(' '),
    shape: element.shape ?? '',
    takeOff: element.takeOff,
    difficultyLetter: element.difficultyLetter ?? '',
    notes: element.notes ?? '',
  }
}

const cell = (row: Record<string, unknown>, key: string) => {
  const value = row[key]
  return typeof value === 'string'
    ? value.trim()
    : value === undefined || value === null
      ? ''
      : String(value)
}

/**
 * A CSV row turned into a candidate element for `elementInputSchema`, which then names the
 * field of every problem. Numbers that do not parse are passed on as text, so that the schema
 * reports them instead of this function guessing.
 */
export function elementFromCsvRow(row: Record<string, unknown>): Record<string, unknown> {
  const number = (text: string) =>
    text !== '' && Number.isFinite(Number(text)) ? Number(text) : text
  const twists = cell(row, 'twists')
  const letter = cell(row, 'difficultyLetter').toUpperCase()
  return {
    name: cell(row, 'name'),
    apparatus: cell(row, 'apparatus').toLowerCase(),
    direction: cell(row, 'direction').toLowerCase(),
    quarterRotations: number(cell(row, 'quarterRotations')),
    twists: twists === '' ? [] : twists.split(/[\s,;]+/).map(number),
    shape: cell(row, 'shape').toLowerCase() || null,
    takeOff: cell(row, 'takeOff').toLowerCase(),
    difficultyLetter: letter || null,
    notes: cell(row, 'notes') || null,
  }
}
