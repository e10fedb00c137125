import { NSelect, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { RouterLink } from 'vue-router'
import { disciplineLabels } from '@shared/domain/club'
import type { SquadView } from '@shared/schemas/squads'
import { squadLevelLabels } from '@/components/progress/progressFormat'

export interface SquadColumnContext {
  /** Directors assign coaches; everyone else sees how many there are. */
  canAssign: boolean
  coachOptions: { label: string; value: string }[]
  /** A coach's name by user id, when the person may list members. */
  coachName: (userId: string) => string | undefined
  onCoaches: (squad: SquadView, userIds: string[]) => void
}

function coachText(squad: SquadView, context: SquadColumnContext) {
  const names = squad.coachIds.map((id) => context.coachName(id)).filter((n) => n !== undefined)
  if (names.length === squad.coachIds.length && names.length > 0) return names.join(', ')
  const n = squad.coachIds.length
  return n === 0 ? 'No coach yet' : `${n} ${n === 1 ? 'coach' : 'coaches'}`
}

export function squadColumns(context: SquadColumnContext): DataTableColumns<SquadView> {
  return [
    {
      title: 'Squad',
      key: 'name',
      sorter: (a, b) => a.name.localeCompare(b.name),
      minWidth: 160,
      render: (s) =>
        h(RouterLink, { to: { name: 'squad', params: { squadId: s.id } } }, () => s.name),
    },
    { title: 'Level', key: 'level', width: 110, render: (s) => squadLevelLabels[s.level] },
    {
      title: 'Discipline',
      key: 'discipline',
      width: 150,
      render: (s) => disciplineLabels[s.discipline],
    },
    {
      title: 'Athletes',
      key: 'athleteCount',
      width: 90,
      sorter: (a, b) => a.athleteCount - b.athleteCount,
    },
    {
      title: 'Coaches',
      key: 'coachIds',
      minWidth: 240,
      render: (s) =>
        context.canAssign
          ? h(NSelect, {
              value: s.coachIds,
              options: context.coachOptions,
              multiple: true,
              filterable: true,
              placeholder: 'Assign coaches',
              'aria-label': `Coaches of ${s.name}`,
              'onUpdate:value': (ids: string[]) => context.onCoaches(s, ids),
            })
          : coachText(s, context),
    },
  ]
}
