import { NTag, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { stepOf } from '@shared/domain/progress'
import type { RankedGap } from '@/stores/auditReport'

export interface AuditGapColumnContext {
  athleteName: (athleteId: string) => string
  squadName: (squadId: string) => string
}

const muted = 'color: var(--tf-muted)'

function counterpartCell(gap: RankedGap) {
  if (gap.counterpartMissing) {
    return h(NTag, { size: 'small', type: 'warning' }, () => 'not in the catalogue')
  }
  const name = gap.counterpartName ?? 'Counterpart'
  if (gap.counterpartNeverStarted || gap.counterpartStepIndex === null) {
    return h('span', [name, h('span', { style: muted }, ' · not started')])
  }
  return h('span', [
    name,
    h('span', { style: muted }, ` · ${stepOf(gap.counterpartStepIndex, gap.counterpartStepCount)}`),
  ])
}

/** The ranked gap list: backward elements whose forward counterpart trails. */
export function auditGapColumns(context: AuditGapColumnContext): DataTableColumns<RankedGap> {
  return [
    { title: 'Rank', key: 'rank', width: 70, align: 'right' },
    {
      title: 'Athlete',
      key: 'athleteId',
      minWidth: 150,
      render: (g) => context.athleteName(g.athleteId),
    },
    {
      title: 'Squad',
      key: 'squadId',
      minWidth: 120,
      render: (g) => context.squadName(g.squadId),
    },
    {
      title: 'Backward element',
      key: 'elementName',
      minWidth: 190,
      render: (g) =>
        h('span', [
          g.elementName,
          h('span', { style: muted }, ` · ${stepOf(g.stepIndex, g.stepCount)}`),
        ]),
    },
    {
      title: 'Forward counterpart',
      key: 'counterpartName',
      minWidth: 200,
      render: counterpartCell,
    },
    {
      // The rank follows the weighted figure, so it is shown, not left to a tooltip that a
      // tablet never opens.
      title: 'Deficit (steps × weight)',
      key: 'weightedDeficit',
      width: 170,
      align: 'right',
      render: (g) =>
        h('span', [
          `${g.deficitSteps}`,
          h('span', { style: muted }, ` × ${g.weight} = `),
          `${g.weightedDeficit}`,
        ]),
    },
  ]
}
