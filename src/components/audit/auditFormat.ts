import type { AgeCategory } from '@shared/domain/age-categories'
import type { AuditComparison, FigureChange } from '@shared/domain/audit/comparison'
import { quarterEnd, quarterOf } from '@shared/domain/quarters'

// How the audit's figures are put on screen. Lags are stored as fractions and shown as
// percentages; their changes are in percentage points, so that "+2.0 pts" is never read as a
// relative change of 2 %.

/**
 * A fraction 0..1 as a percentage with one decimal: 0.123 → "12.3%". A missing one is no data
 * (a scope without records), never shown as 0.
 */
export const formatPercent = (fraction: number | null | undefined) =>
  fraction === null || fraction === undefined ? 'no data' : `${(fraction * 100).toFixed(1)}%`

/**
 * Squads without records, counted apart from the ones ranked: "2 squads without records" (no
 * data, left out of the rankings); empty when there are none.
 */
export function withoutRecordsText(squads: number | undefined): string {
  if (!squads) return ''
  return `${squads} ${squads === 1 ? 'squad' : 'squads'} without records (no data, not ranked)`
}

/**
 * Orders lags for a ranking, those without data last whatever the direction asked: a table
 * sorter given `order` ('ascend' or 'descend').
 */
export const compareLags = (a: number | null, b: number | null) =>
  a === null || b === null ? (a === null ? 1 : 0) - (b === null ? 1 : 0) : a - b

/** The balance ratio with two decimals; without backward progress it has no value. */
export const formatRatio = (ratio: number | null | undefined) =>
  ratio === null || ratio === undefined ? '—' : ratio.toFixed(2)

export type FigureKind = 'percent' | 'ratio' | 'count'

/**
 * Which way a figure improves: lags and gap counts should fall, the balance ratio should come
 * closer to 1.00 from either side.
 */
export type FigureAim = 'lower' | 'balanced'

export const formatFigure = (kind: FigureKind, value: number | null | undefined) =>
  kind === 'percent'
    ? formatPercent(value)
    : kind === 'ratio'
      ? formatRatio(value)
      : value === null || value === undefined
        ? '—'
        : String(value)

const sign = (n: number) => (n > 0 ? '+' : n < 0 ? '−' : '±')

/** A change with its sign and unit: "+2.5 pts", "−0.08", "+3". */
export function formatSignedChange(kind: FigureKind, change: number): string {
  const size = Math.abs(change)
  if (kind === 'percent') return `${sign(change)}${(size * 100).toFixed(1)} pts`
  if (kind === 'ratio') return `${sign(change)}${size.toFixed(2)}`
  return `${sign(change)}${size}`
}

export type ChangeVerdict = 'better' | 'worse' | 'same'

/** Whether the change is an improvement, by the figure's aim; null without a previous value. */
export function changeVerdict(aim: FigureAim, figure: FigureChange): ChangeVerdict | null {
  if (figure.previous === null || figure.current === null || figure.change === null) return null
  const before = aim === 'balanced' ? Math.abs(figure.previous - 1) : figure.previous
  const now = aim === 'balanced' ? Math.abs(figure.current - 1) : figure.current
  // Rounding noise below what is shown must not read as a change.
  if (Math.abs(now - before) < 1e-9) return 'same'
  return now < before ? 'better' : 'worse'
}

export interface ChangeText {
  arrow: '▲' | '▼' | '=' | ''
  signed: string
  /** The whole change in words, for screen readers and for anyone who does not read colour. */
  words: string
  verdict: ChangeVerdict | null
}

/** The change of one headline figure since the previous audit, in symbols and in words. */
export function describeChange(kind: FigureKind, aim: FigureAim, figure: FigureChange): ChangeText {
  const verdict = changeVerdict(aim, figure)
  if (figure.change === null || verdict === null) {
    const words =
      figure.previous === null ? 'no previous audit of this scope' : 'no value to compare'
    return { arrow: '', signed: '', words, verdict: null }
  }
  const shown = formatSignedChange(kind, figure.change)
  // A change that rounds to zero as shown reads as none, whatever its sign or its verdict.
  const unchanged = verdict === 'same' || !/[1-9]/.test(shown)
  if (unchanged) {
    return {
      arrow: '=',
      signed: '±0',
      words: 'unchanged since the previous audit',
      verdict: 'same',
    }
  }
  const arrow = figure.change > 0 ? '▲' : '▼'
  const direction = figure.change > 0 ? 'up' : 'down'
  return {
    arrow,
    signed: shown,
    words: `${direction} ${shown.slice(1)} since the previous audit (${verdict})`,
    verdict,
  }
}

export const categoryLabels: Record<AgeCategory, string> = {
  'age-group': 'Age group',
  junior: 'Junior',
  senior: 'Senior',
}

const phaseLabels: Record<string, string> = {
  queued: 'Waiting to start',
  reading: 'Reading the catalogue, athletes and records',
  records: 'Taking in each record’s steps as of the date',
  athletes: 'Balancing each athlete',
  gaps: 'Ranking the gaps',
  readiness: 'Checking readiness for the next category',
  hashing: 'Hashing the inputs for re-checking',
  storing: 'Storing the result',
  done: 'Done',
}

/** A job phase in words; an unknown phase is shown as the server names it. */
export const phaseLabel = (phase: string) => phaseLabels[phase] ?? phase

/**
 * The last `count` quarters that have ended by `today`, newest first: an audit cannot describe
 * a day still to come, so the current quarter is offered only on its last day.
 */
export function endedQuarters(today: string, count = 8): { quarter: string; endsOn: string }[] {
  const quarters: { quarter: string; endsOn: string }[] = []
  let [year, q] = quarterOf(today).split('-Q').map(Number) as [number, number]
  while (quarters.length < count) {
    const quarter = `${year}-Q${q}`
    const endsOn = quarterEnd(quarter)
    if (endsOn <= today) quarters.push({ quarter, endsOn })
    q -= 1
    if (q === 0) {
      q = 4
      year -= 1
    }
  }
  return quarters
}

/** The first characters of a hash, enough to tell audits apart at a glance. */
export const hashPrefix = (hash: string) => hash.slice(0, 12)

/** An ISO timestamp as its date and minutes, in the browser's time zone. */
export function formatTimestamp(iso: string): string {
  const date = new Date(iso)
  if (Number.isNaN(date.getTime())) return iso
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())} ${pad(date.getHours())}:${pad(date.getMinutes())}`
}

/** One audit on a trend chart. */
export interface TrendPoint {
  asOf: string
  clubFrontLag: number | null
  balanceRatio: number | null
}

/** A headline figure as the figure tiles show it. */
export interface HeadlineFigure {
  key: string
  label: string
  kind: FigureKind
  aim: FigureAim
  value: number | null
  /** The change since the previous audit; absent when there is nothing to compare with. */
  change?: FigureChange
  /** What the figure means, in a sentence. */
  hint: string
}

/** The report's headline figures with their change since the previous audit of the scope. */
export function reportFigures(
  headline: {
    clubFrontLag: number | null
    clubBackLag: number | null
    balanceRatio: number | null
    catalogueGaps: number
    athletesWithGaps: number
    readinessAlerts: number
  },
  comparison?: Pick<
    AuditComparison,
    | 'clubFrontLag'
    | 'clubBackLag'
    | 'balanceRatio'
    | 'catalogueGaps'
    | 'athletesWithGaps'
    | 'readinessAlerts'
  >,
): HeadlineFigure[] {
  return [
    {
      key: 'front-lag',
      label: 'Front-lag',
      kind: 'percent',
      aim: 'lower',
      value: headline.clubFrontLag,
      change: comparison?.clubFrontLag,
      hint: 'How far the forward counterparts trail the backward elements.',
    },
    {
      key: 'back-lag',
      label: 'Back-lag',
      kind: 'percent',
      aim: 'lower',
      value: headline.clubBackLag,
      change: comparison?.clubBackLag,
      hint: 'The same the other way round: backward trailing forward.',
    },
    {
      key: 'balance-ratio',
      label: 'Balance ratio',
      kind: 'ratio',
      aim: 'balanced',
      value: headline.balanceRatio,
      change: comparison?.balanceRatio,
      hint:
        headline.balanceRatio === null
          ? 'No backward progress yet, so no ratio.'
          : 'Forward over backward proficiency; 1.00 is balanced.',
    },
    {
      key: 'catalogue-gaps',
      label: 'Catalogue gaps',
      kind: 'count',
      aim: 'lower',
      value: headline.catalogueGaps,
      change: comparison?.catalogueGaps,
      hint: 'Backward elements whose forward counterpart is not in the catalogue.',
    },
    {
      key: 'athletes-with-gaps',
      label: 'Athletes with gaps',
      kind: 'count',
      aim: 'lower',
      value: headline.athletesWithGaps,
      change: comparison?.athletesWithGaps,
      hint: 'Athletes with at least one forward counterpart trailing.',
    },
    {
      key: 'readiness-alerts',
      label: 'Readiness alerts',
      kind: 'count',
      aim: 'lower',
      value: headline.readinessAlerts,
      change: comparison?.readinessAlerts,
      hint: 'Athletes changing category soon with a requirement still unmet.',
    },
  ]
}

/**
 * Whether a seeded value says it was written from memory: those must be checked against the
 * current FIG rules before anyone relies on them.
 */
export const fromMemory = (source: string) => /from memory/i.test(source)
