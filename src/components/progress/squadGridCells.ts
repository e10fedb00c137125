import type { Grid } from '@shared/schemas/progress'
import { forwardTrail, stepFraction, trailThreshold } from './progressFormat'

// What one grid cell shows, computed only for the cells on screen.

export type GridColumn = Grid['columns'][number]

export interface CellView {
  text: string
  started: boolean
  paused: boolean
  flagged: boolean
  /** Steps the forward cell trails its backward neighbour by, when it is the threshold or more. */
  trail: number | null
  /** The cell's accessible name: who, which element, where they stand. */
  label: string
}

/** For each forward column in a pair: the index of its backward column. */
export function backwardColumns(columns: readonly GridColumn[]): Map<number, number> {
  const back = new Map<string, number>()
  columns.forEach((c, i) => {
    if (c.direction === 'backward') back.set(c.pairKey, i)
  })
  const map = new Map<number, number>()
  columns.forEach((c, i) => {
    const b = back.get(c.pairKey)
    if (c.direction === 'forward' && b !== undefined) map.set(i, b)
  })
  return map
}

/** The view of athlete i's cell in column j. */
export function cellView(
  grid: Grid,
  backwardOf: ReadonlyMap<number, number>,
  i: number,
  j: number,
): CellView {
  const column = grid.columns[j]!
  const athlete = grid.athletes[i]!
  const cell = grid.cells[i]?.[j] ?? { step: null, paused: false, flagged: false }
  const back = backwardOf.get(j)
  const backColumn = back === undefined ? undefined : grid.columns[back]
  const backStep = back === undefined ? null : (grid.cells[i]?.[back]?.step ?? null)
  const gap = backColumn
    ? forwardTrail(
        { stepIndex: backStep, stepCount: backColumn.stepCount },
        { stepIndex: cell.step, stepCount: column.stepCount },
      )
    : null
  const trail = gap !== null && gap >= trailThreshold ? gap : null
  const parts = [
    cell.step === null
      ? `${athlete.givenName} ${athlete.familyName}: ${column.name} not started`
      : `${athlete.givenName} ${athlete.familyName}: ${column.name} step ${cell.step + 1} of ${column.stepCount}`,
  ]
  if (cell.paused) parts.push('paused')
  if (cell.flagged) parts.push('flagged by a check')
  if (trail !== null) parts.push(`forward trails the backward element by ${trail} steps`)
  return {
    text: stepFraction(cell.step, column.stepCount),
    started: cell.step !== null,
    paused: cell.paused,
    flagged: cell.flagged,
    trail,
    label: parts.join(', '),
  }
}
