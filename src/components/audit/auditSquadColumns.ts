import type { DataTableColumns } from 'naive-ui'
import type { SquadBreakdown } from '@shared/domain/audit/types'
import { compareLags, formatPercent, formatRatio } from './auditFormat'

export interface AuditSquadColumnContext {
  squadName: (squadId: string) => string
}

/** The per-squad breakdown of an audit: aggregates only, so every reader sees every squad. */
export function auditSquadColumns(
  context: AuditSquadColumnContext,
): DataTableColumns<SquadBreakdown> {
  return [
    {
      title: 'Squad',
      key: 'squadId',
      minWidth: 150,
      sorter: (a, b) => context.squadName(a.squadId).localeCompare(context.squadName(b.squadId)),
      render: (s) => context.squadName(s.squadId),
    },
    { title: 'Athletes', key: 'athleteCount', width: 90, align: 'right' },
    {
      title: 'Front-lag',
      key: 'frontLag',
      width: 100,
      align: 'right',
      sorter: (a, b) => compareLags(a.frontLag, b.frontLag),
      render: (s) => formatPercent(s.frontLag),
    },
    {
      title: 'Back-lag',
      key: 'backLag',
      width: 100,
      align: 'right',
      render: (s) => formatPercent(s.backLag),
    },
    {
      title: 'Balance ratio',
      key: 'balanceRatio',
      width: 115,
      align: 'right',
      render: (s) => formatRatio(s.balanceRatio),
    },
    { title: 'Gaps', key: 'gapCount', width: 80, align: 'right', sorter: 'default' },
    { title: 'Athletes with gaps', key: 'athletesWithGaps', width: 130, align: 'right' },
    { title: 'Readiness alerts', key: 'readinessAlerts', width: 130, align: 'right' },
  ]
}
