// How the squad grid lays its columns out: families of pairs, a pair being a backward element
// beside its forward mirror. Pure, so that the grid component only draws what this decides.

import {
  rotationClasses,
  rotationClassLabels,
  twistBandLabels,
  twistBands,
  type RotationClass,
  type TwistBand,
} from './element.ts'

/** What the layout needs of a grid column. */
export interface LayoutColumn {
  elementId: string
  name: string
  apparatus: string
  rotationClass: string
  twistBand: TwistBand
  /** Columns of one pair share it (the server puts a backward element before its mirror). */
  pairKey: string
}

/** A run of consecutive displayed columns: a family or a pair. */
export interface LayoutSpan {
  key: string
  label: string
  /** Position of its first column in `order`. */
  start: number
  /** Number of displayed columns it covers. */
  span: number
}

export interface GridLayout {
  /** Indices into the given columns, in the order they are shown. */
  order: number[]
  /** Rotation class, then twist band, then apparatus. */
  families: LayoutSpan[]
  pairs: LayoutSpan[]
  /** Pairs left out because no athlete has started any of their elements. */
  hiddenPairs: number
}

/** The family a column belongs to: rotation class, twist band, apparatus. */
export function familyOf(column: Pick<LayoutColumn, 'rotationClass' | 'twistBand' | 'apparatus'>) {
  return `${column.rotationClass}|${column.twistBand}|${column.apparatus}`
}

/** "Single · Full twist · trampoline". */
export function familyLabel(
  column: Pick<LayoutColumn, 'rotationClass' | 'twistBand' | 'apparatus'>,
): string {
  const rotation =
    rotationClassLabels[column.rotationClass as RotationClass] ?? column.rotationClass
  return `${rotation} · ${twistBandLabels[column.twistBand] ?? column.twistBand} · ${column.apparatus}`
}

const rank = (list: readonly string[], value: string) => {
  const i = list.indexOf(value)
  return i === -1 ? list.length : i
}

/**
 * Orders the grid's columns by family — rotation class (none, single, double, triple), then twist
 * band (none, half, full, more), then apparatus by name — keeping each pair's columns together
 * and in the order given (backward first), and pairs of one family in the order given. With
 * `hideUnstarted`, a pair none of whose columns is `started` is left out.
 */
export function layoutGridColumns(
  columns: readonly LayoutColumn[],
  started: readonly boolean[],
  options: { hideUnstarted: boolean },
): GridLayout {
  const pairs: { key: string; columns: number[] }[] = []
  const byKey = new Map<string, { key: string; columns: number[] }>()
  columns.forEach((column, index) => {
    const known = byKey.get(column.pairKey)
    if (known) known.columns.push(index)
    else {
      const pair = { key: column.pairKey, columns: [index] }
      byKey.set(column.pairKey, pair)
      pairs.push(pair)
    }
  })

  // A pair's family is its first (backward) column's: its mirror shares rotations, twists and
  // apparatus by definition of the counterpart.
  const head = (pair: { columns: number[] }) => columns[pair.columns[0]!]!
  const visible = options.hideUnstarted
    ? pairs.filter((pair) => pair.columns.some((i) => started[i] === true))
    : pairs
  const sorted = visible
    .map((pair, position) => ({ pair, position }))
    .sort((a, b) => {
      const x = head(a.pair)
      const y = head(b.pair)
      return (
        rank(rotationClasses, x.rotationClass) - rank(rotationClasses, y.rotationClass) ||
        rank(twistBands, x.twistBand) - rank(twistBands, y.twistBand) ||
        (x.apparatus < y.apparatus ? -1 : x.apparatus > y.apparatus ? 1 : 0) ||
        a.position - b.position
      )
    })
    .map((s) => s.pair)

  const order: number[] = []
  const families: LayoutSpan[] = []
  const pairSpans: LayoutSpan[] = []
  for (const pair of sorted) {
    const first = head(pair)
    const family = familyOf(first)
    const last = families[families.length - 1]
    if (last && last.key === family) last.span += pair.columns.length
    else
      families.push({
        key: family,
        label: familyLabel(first),
        start: order.length,
        span: pair.columns.length,
      })
    pairSpans.push({
      key: pair.key,
      label: pair.columns.map((i) => columns[i]!.name).join(' / '),
      start: order.length,
      span: pair.columns.length,
    })
    order.push(...pair.columns)
  }
  return { order, families, pairs: pairSpans, hiddenPairs: pairs.length - visible.length }
}

/** Which columns any athlete has started: a step reached, or a pause on the record. */
export function startedColumns(
  cells: readonly (readonly { step: number | null; paused: boolean }[])[],
  columnCount: number,
): boolean[] {
  const started = Array.from({ length: columnCount }, () => false)
  for (const row of cells)
    row.forEach((cell, j) => {
      if (cell.step !== null || cell.paused) started[j] = true
    })
  return started
}

/**
 * The spans clipped to the displayed positions [from, to): what a header row draws when only
 * part of the columns is rendered.
 */
export function clipSpans(spans: readonly LayoutSpan[], from: number, to: number): LayoutSpan[] {
  const clipped: LayoutSpan[] = []
  for (const s of spans) {
    const start = Math.max(s.start, from)
    const end = Math.min(s.start + s.span, to)
    if (end > start) clipped.push({ ...s, start, span: end - start })
  }
  return clipped
}
