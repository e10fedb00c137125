import { NButton, NSelect, NSpace, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { roleLabels, roles, type Role } from '@shared/domain/club'
import type { MemberView } from '@shared/schemas/auth'

export interface MemberColumnActions {
  currentUserId: string
  onRole: (member: MemberView, role: Role) => void
  onEnd: (member: MemberView) => void
}

const roleOptions = roles.map((r) => ({ label: roleLabels[r], value: r }))

export function memberColumns(actions: MemberColumnActions): DataTableColumns<MemberView> {
  return [
    { title: 'Name', key: 'name', sorter: 'default' },
    { title: 'E-mail', key: 'email' },
    {
      title: 'Role',
      key: 'role',
      render: (m) =>
        h(NSelect, {
          value: m.role,
          options: roleOptions,
          size: 'small',
          style: 'min-width: 11rem',
          'aria-label': `Role of ${m.name}`,
          'onUpdate:value': (role: Role) => actions.onRole(m, role),
        }),
    },
    {
      title: 'Visit window',
      key: 'window',
      render: (m) => (m.role === 'clinician' ? `${m.accessStartsOn} – ${m.accessEndsOn}` : '—'),
    },
    {
      title: '',
      key: 'actions',
      render: (m) =>
        h(NSpace, { justify: 'end' }, () =>
          m.userId === actions.currentUserId
            ? []
            : [
                h(
                  NButton,
                  { size: 'small', tertiary: true, type: 'error', onClick: () => actions.onEnd(m) },
                  () => 'End membership',
                ),
              ],
        ),
    },
  ]
}
