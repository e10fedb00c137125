import Papa from 'papaparse'

/** A cell the server writes: numbers stay numbers, so a spreadsheet can compute with them. */
export type CsvCell = string | number | null | undefined

/**
 * A text cell starting with one of these is run as a formula by a spreadsheet (=, +, -, @, tab,
 * carriage return). papaparse's default pattern for `escapeFormulae` stops at a line break, so a
 * formula on two lines would slip through; this one looks only at the first character.
 */
const formulaStart = /^[=+\-@\t\r]/

/**
 * Every CSV the server sends, written with the same options: a text cell that a spreadsheet would
 * run as a formula gets a leading single quote and is shown as the text it is. Only text cells
 * are escaped, never numbers, so figures such as a change of -0.12 must be passed as numbers.
 */
export function toCsv(
  fields: readonly string[],
  rows: readonly (Readonly<Record<string, CsvCell>> | readonly CsvCell[])[],
) {
  return Papa.unparse({ fields: [...fields], data: [...rows] }, { escapeFormulae: formulaStart })
}
