import { type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { RouterLink } from 'vue-router'
import type { MissingSkill } from '@shared/schemas/progress'
import { stepOf } from '@shared/domain/progress'

const muted = 'color: var(--tf-muted)'

/** Missing from the catalogue sorts last: the director's to add, not the coach's to train. */
const trailOrder = (m: MissingSkill) => m.trailBy ?? -1

export function missingSkillColumns(): DataTableColumns<MissingSkill> {
  return [
    {
      title: 'Athlete',
      key: 'athleteName',
      minWidth: 150,
      sorter: (a, b) => a.athleteName.localeCompare(b.athleteName),
      render: (m) =>
        h(
          RouterLink,
          { to: { name: 'athlete', params: { athleteId: m.athleteId } } },
          () => m.athleteName,
        ),
    },
    {
      title: 'Backward',
      key: 'backward',
      minWidth: 170,
      render: (m) =>
        h('span', [
          m.backward.name,
          h('span', { style: muted }, ` · ${stepOf(m.backward.stepIndex, m.backward.stepCount)}`),
        ]),
    },
    {
      title: 'Forward',
      key: 'forward',
      minWidth: 180,
      render: (m) => {
        if (!m.forward) return h('em', 'not in the catalogue')
        return h('span', [
          m.forward.name,
          h(
            'span',
            { style: muted },
            m.forward.stepIndex === null
              ? ' · not started'
              : ` · ${stepOf(m.forward.stepIndex, m.forward.stepCount)}`,
          ),
        ])
      },
    },
    {
      title: 'Trails by',
      key: 'trailBy',
      width: 120,
      defaultSortOrder: 'descend',
      sorter: (a, b) => trailOrder(a) - trailOrder(b),
      render: (m) =>
        m.trailBy === null
          ? '— (no forward)'
          : `${m.trailBy} ${m.trailBy === 1 ? 'step' : 'steps'}`,
    },
    {
      title: 'Squad',
      key: 'squadName',
      width: 120,
      sorter: (a, b) => a.squadName.localeCompare(b.squadName),
    },
  ]
}
