import { NTag, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import type { ReadinessRow, RequirementStatus } from '@shared/domain/audit/types'
import { categoryLabels } from './auditFormat'

export interface AuditReadinessColumnContext {
  athleteName: (athleteId: string) => string
  squadName: (squadId: string) => string
}

const muted = 'color: var(--tf-muted)'

function forecastCell(r: RequirementStatus) {
  if (r.noMatchingElement) {
    return h('span', { style: muted }, 'no element in the catalogue meets it')
  }
  if (r.forecastOn === null) return h('span', 'no forecast at the current pace')
  // The verdict is a word as well as a colour.
  const verdict = r.onTime
    ? h(NTag, { size: 'small', type: 'success' }, () => 'on time')
    : h(NTag, { size: 'small', type: 'error' }, () => 'late')
  return h('span', [`forecast ${r.forecastOn} `, verdict])
}

function requirementsCell(row: ReadinessRow) {
  if (row.profileId === null) {
    return h('span', { style: muted }, 'No requirement profile for this category.')
  }
  const missing = row.requirements.filter((r) => !r.met)
  const met = row.requirements.length - missing.length
  const summary = h('div', { style: muted }, `${met} of ${row.requirements.length} met`)
  if (missing.length === 0) return summary
  return h('div', [
    summary,
    h(
      'ul',
      { style: 'margin: 0.25rem 0 0; padding-left: 1.1rem' },
      missing.map((r) =>
        h('li', { key: r.requirementId, title: r.source }, [
          h('strong', r.label),
          r.elementName
            ? h(
                'span',
                { style: muted },
                ` — nearest: ${r.elementName}, ${r.stepsNeeded} ${r.stepsNeeded === 1 ? 'step' : 'steps'} to go`,
              )
            : null,
          h('br'),
          forecastCell(r),
        ]),
      ),
    ),
  ])
}

/** Athletes changing age category within the horizon, against the next category's profile. */
export function auditReadinessColumns(
  context: AuditReadinessColumnContext,
): DataTableColumns<ReadinessRow> {
  return [
    {
      title: 'Athlete',
      key: 'athleteId',
      minWidth: 150,
      render: (r) => context.athleteName(r.athleteId),
    },
    {
      title: 'Squad',
      key: 'squadId',
      minWidth: 120,
      render: (r) => context.squadName(r.squadId),
    },
    {
      title: 'Category',
      key: 'to',
      width: 160,
      render: (r) => `${categoryLabels[r.from]} → ${categoryLabels[r.to]}`,
    },
    { title: 'Starts on', key: 'startsOn', width: 110 },
    {
      title: () =>
        h('abbr', { title: 'Progression steps per 30 days over the last 180 days' }, 'Pace'),
      key: 'pace',
      width: 90,
      align: 'right',
      render: (r) => r.pace.toFixed(1),
    },
    {
      title: 'Missing requirements and forecasts',
      key: 'requirements',
      minWidth: 320,
      render: requirementsCell,
    },
  ]
}
