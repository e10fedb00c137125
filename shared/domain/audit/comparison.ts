// The change of each headline figure from one audit to the next.

import { compareText } from './formulas.ts'
import type { AuditHeadline, AuditResult } from './types.ts'

export interface FigureChange {
  previous: number | null
  current: number | null
  /** current − previous; null when either is missing. */
  change: number | null
}

export interface AuditComparison {
  athleteCount: FigureChange
  clubFrontLag: FigureChange
  clubBackLag: FigureChange
  balanceRatio: FigureChange
  catalogueGaps: FigureChange
  gapCount: FigureChange
  athletesWithGaps: FigureChange
  readinessAlerts: FigureChange
  /** Every squad in either audit; a squad in only one of them has a null side. */
  squadFrontLags: Record<string, FigureChange>
}

function figureChange(previous: number | null, current: number | null): FigureChange {
  return {
    previous,
    current,
    change: previous === null || current === null ? null : current - previous,
  }
}

/**
 * The change of each headline figure from the previous audit of the same scope to the current
 * one. With no previous audit every `previous` and `change` is null.
 */
export function compareAudits(
  previous: Pick<AuditResult, 'headline'> | null,
  current: Pick<AuditResult, 'headline'>,
): AuditComparison {
  const before = previous?.headline ?? null
  const now = current.headline
  const figure = (key: Exclude<keyof AuditHeadline, 'squadFrontLags' | 'squadsWithoutRecords'>) =>
    figureChange(before === null ? null : before[key], now[key])
  const squadIds = [
    ...new Set([...Object.keys(before?.squadFrontLags ?? {}), ...Object.keys(now.squadFrontLags)]),
  ].sort(compareText)
  return {
    athleteCount: figure('athleteCount'),
    clubFrontLag: figure('clubFrontLag'),
    clubBackLag: figure('clubBackLag'),
    balanceRatio: figure('balanceRatio'),
    catalogueGaps: figure('catalogueGaps'),
    gapCount: figure('gapCount'),
    athletesWithGaps: figure('athletesWithGaps'),
    readinessAlerts: figure('readinessAlerts'),
    squadFrontLags: Object.fromEntries(
      squadIds.map((id) => [
        id,
        figureChange(before?.squadFrontLags[id] ?? null, now.squadFrontLags[id] ?? null),
      ]),
    ),
  }
}

/** What choosing a baseline needs to know of a stored audit of one scope. */
export interface AuditListing {
  asOf: string
  /** Creation time, comparable as text or as a number (ISO text or epoch milliseconds). */
  createdAt: string | number
  published: boolean
}

const byDateThenCreation = (a: AuditListing, b: AuditListing) =>
  compareText(a.asOf, b.asOf) ||
  (a.createdAt < b.createdAt ? -1 : a.createdAt > b.createdAt ? 1 : 0)

/**
 * The audit a headline figure's change is measured from: the latest audit of the same scope as
 * of an earlier date (the last one run for that date), never one of the same date, which is a
 * re-run and not a change over time. A published audit is measured from the published ones
 * only, so the board and the director read the same change for it; a draft from any.
 *
 * `scope` holds the audits of one scope (the club, or one squad), `audit` among them.
 */
export function baselineAudit<T extends AuditListing>(scope: readonly T[], audit: T): T | null {
  let best: T | null = null
  for (const candidate of scope) {
    if (candidate.asOf >= audit.asOf) continue
    if (audit.published && !candidate.published) continue
    if (best === null || byDateThenCreation(candidate, best) > 0) best = candidate
  }
  return best
}

/**
 * Whether `audit` re-runs an earlier one: another audit of the same scope and date was created
 * before it.
 */
export function isRerun(scope: readonly AuditListing[], audit: AuditListing): boolean {
  return scope.some((other) => other.asOf === audit.asOf && other.createdAt < audit.createdAt)
}

/**
 * One audit per date, the last one created for it, in date order: the points of a trend, where
 * a re-run of a date replaces the earlier run instead of adding a point.
 */
export function onePerDate<T extends AuditListing>(scope: readonly T[]): T[] {
  const sorted = [...scope].sort(byDateThenCreation)
  return sorted.filter((a, i) => sorted[i + 1]?.asOf !== a.asOf)
}
