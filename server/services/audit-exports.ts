import type { AuditReport } from '../../shared/schemas/audits.ts'
import { toCsv, type CsvCell } from '../http/csv.ts'

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
  const rows: CsvCell[][] = [
    ['athletes', h.athleteCount, c.athleteCount.change],
    ['front-lag', h.clubFrontLag, c.clubFrontLag.change],
    ['back-lag', h.clubBackLag, c.clubBackLag.change],
    ['balance ratio', h.balanceRatio, c.balanceRatio.change],
    ['catalogue gaps', h.catalogueGaps, c.catalogueGaps.change],
    ['gaps', h.gapCount, c.gapCount.change],
    ['athletes with gaps', h.athletesWithGaps, c.athletesWithGaps.change],
    ['readiness alerts', h.readinessAlerts, c.readinessAlerts.change],
    ['squads without records', h.squadsWithoutRecords ?? null, null],
    ...Object.entries(h.squadFrontLags).map(([id, v]) => [
      `front-lag ${report.squadNames[id] ?? id}`,
      v,
      c.squadFrontLags[id]?.change ?? null,
    ]),
  ]
  return toCsv(['figure', 'value', 'changeSincePrevious'], rows)
}
