import type { AuditReport } from '../../shared/schemas/audits.ts'
import { slugify } from '../../shared/domain/slug.ts'
import { toCsv, type CsvCell } from '../http/csv.ts'

/**
 * The name an export is saved under, saying what it covers: the squad for a squad audit, the
 * club for a club audit, then the date ("gaps-falcons-2026-09-30.csv").
 */
export function exportFileName(kind: string, scopeName: string, asOf: string, ext: string) {
  const scope = slugify(scopeName, 60) || 'audit'
  return `${kind}-${scope}-${asOf}.${ext}`
}

type FigureUnit = 'percent' | 'ratio' | 'count'

const round = (value: number, decimals: number) => {
  const scale = 10 ** decimals
  // Half away from zero, as the figures on screen read (toFixed), without float noise.
  return (Math.sign(value) * Math.round(Math.abs(value) * scale + 1e-9)) / scale
}

/**
 * A headline figure as a spreadsheet cell and its unit, rounded as it is shown: a share as a
 * percentage with one decimal (0.12345 → 12.3, "%"), its change in percentage points; a ratio
 * with two decimals; a count as it is. The value stays a number so a spreadsheet can use it.
 */
export function headlineCells(
  unit: FigureUnit,
  value: number | null | undefined,
  change: number | null | undefined,
): CsvCell[] {
  const cell = (v: number | null | undefined) =>
    v === null || v === undefined
      ? null
      : unit === 'percent'
        ? round(v * 100, 1)
        : unit === 'ratio'
          ? round(v, 2)
          : v
  const units = { percent: ['%', 'pts'], ratio: ['ratio', 'ratio'], count: ['', ''] }[unit]
  return [cell(value), units[0], cell(change), change === null ? '' : units[1]]
}

/** The ranked gap list as CSV, with names for people and the figures for spreadsheets. */
export function gapsCsv(report: AuditReport) {
  return toCsv(
    [
      'rank',
      'athlete',
      'squad',
      'backwardElement',
      'backwardStep',
      'forwardElement',
      'forwardStep',
      'deficitSteps',
      'weightedDeficit',
    ],
    report.result.gaps.map((g, i) => ({
      rank: i + 1,
      athlete: report.athleteNames[g.athleteId] ?? g.athleteId,
      squad: report.squadNames[g.squadId] ?? g.squadId,
      backwardElement: g.elementName,
      backwardStep: g.stepIndex + 1,
      forwardElement: g.counterpartName ?? '(not in the catalogue)',
      forwardStep: g.counterpartStepIndex === null ? '' : g.counterpartStepIndex + 1,
      deficitSteps: g.deficitSteps,
      weightedDeficit: g.weightedDeficit,
    })),
  )
}

export function headlineCsv(report: AuditReport) {
  const h = report.result.headline
  const c = report.comparison
  // Figures stay numbers: only text is escaped, so a negative change is read as a number.
  const row = (
    figure: string,
    unit: FigureUnit,
    value: number | null | undefined,
    change: number | null | undefined,
  ): CsvCell[] => [figure, ...headlineCells(unit, value, change ?? null)]
  const rows: CsvCell[][] = [
    row('athletes', 'count', h.athleteCount, c.athleteCount.change),
    row('front-lag', 'percent', h.clubFrontLag, c.clubFrontLag.change),
    row('back-lag', 'percent', h.clubBackLag, c.clubBackLag.change),
    row('balance ratio', 'ratio', h.balanceRatio, c.balanceRatio.change),
    row('catalogue gaps', 'count', h.catalogueGaps, c.catalogueGaps.change),
    row('gaps', 'count', h.gapCount, c.gapCount.change),
    row('athletes with gaps', 'count', h.athletesWithGaps, c.athletesWithGaps.change),
    row('readiness alerts', 'count', h.readinessAlerts, c.readinessAlerts.change),
    row('squads without records', 'count', h.squadsWithoutRecords ?? null, null),
    ...Object.entries(h.squadFrontLags).map(([id, v]) =>
      row(
        `front-lag ${report.squadNames[id] ?? id}`,
        'percent',
        v,
        c.squadFrontLags[id]?.change ?? null,
      ),
    ),
  ]
  return toCsv(['figure', 'value', 'unit', 'changeSincePrevious', 'changeUnit'], rows)
}
