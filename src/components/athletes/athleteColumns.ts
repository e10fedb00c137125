import { NButton, NSwitch, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { RouterLink } from 'vue-router'
import { disciplineLabels } from '@shared/domain/club'
import type { AthleteView } from '@shared/schemas/athletes'

export interface AthleteColumnActions {
  /** Directors and the squad's coaches change the roster; clinicians only read it. */
  canWrite: boolean
  onArchive: (athlete: AthleteView, archived: boolean) => void
  onMove: (athlete: AthleteView) => void
}

export function athleteColumns(actions: AthleteColumnActions): DataTableColumns<AthleteView> {
  const columns: DataTableColumns<AthleteView> = [
    {
      title: 'Name',
      key: 'familyName',
      minWidth: 160,
      sorter: (a, b) =>
        a.familyName.localeCompare(b.familyName) || a.givenName.localeCompare(b.givenName),
      render: (a) =>
        h(
          RouterLink,
          { to: { name: 'athlete', params: { athleteId: a.id } } },
          () => `${a.familyName}, ${a.givenName}`,
        ),
    },
    { title: 'Birth year', key: 'birthYear', width: 100, sorter: 'default' },
    {
      title: 'Discipline',
      key: 'discipline',
      width: 150,
      render: (a) => disciplineLabels[a.discipline],
    },
  ]
  if (!actions.canWrite) {
    columns.push({
      title: 'Archived',
      key: 'archived',
      width: 100,
      render: (a) => (a.archived ? 'Archived' : '—'),
    })
    return columns
  }
  columns.push(
    {
      title: 'Archived',
      key: 'archived',
      width: 100,
      render: (a) =>
        h(NSwitch, {
          value: a.archived,
          'aria-label': `Archived: ${a.givenName} ${a.familyName}`,
          'onUpdate:value': (value: boolean) => actions.onArchive(a, value),
        }),
    },
    {
      title: '',
      key: 'actions',
      width: 130,
      render: (a) =>
        h(
          NButton,
          {
            size: 'small',
            secondary: true,
            disabled: a.archived,
            'aria-label': `Move ${a.givenName} ${a.familyName} to another squad`,
            onClick: () => actions.onMove(a),
          },
          () => 'Move…',
        ),
    },
  )
  return columns
}
