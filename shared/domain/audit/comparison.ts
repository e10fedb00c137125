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
  const figure = (key: Exclude<keyof AuditHeadline, 'squadFrontLags'>) =>
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
