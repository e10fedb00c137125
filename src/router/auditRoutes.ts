import type { RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/domain/club'
import type { NavItem } from './navigation'

// The audit, its settings and the board's summary: the routes and the navigation entries of the
// feature, for the router and the main navigation to take in. The server checks every role again.

const readers: Role[] = ['director', 'coach', 'clinician']
const boardReaders: Role[] = ['board', 'director']

export const auditRoutes: RouteRecordRaw[] = [
  {
    path: '/audits',
    name: 'audits',
    component: () => import('@/views/AuditsView.vue'),
    meta: { title: 'Audits', roles: readers },
  },
  // Before '/audits/:id' so that the settings page is never read as an audit id.
  {
    path: '/audits/settings',
    name: 'audit-settings',
    component: () => import('@/views/RequirementProfilesView.vue'),
    meta: { title: 'Requirement profiles', roles: readers, nav: 'audits' },
  },
  {
    path: '/audits/:id',
    name: 'audit',
    component: () => import('@/views/AuditReportView.vue'),
    props: true,
    meta: { title: 'Audit report', roles: readers, nav: 'audits' },
  },
  {
    path: '/board',
    name: 'board',
    component: () => import('@/views/BoardSummaryView.vue'),
    meta: { title: 'Board summary', roles: boardReaders },
  },
]

/**
 * The feature's entries of the main navigation for a role: the audits for those who work with
 * the athletes, the board's summary (aggregates only) for the board and the director.
 */
export function auditNavItems(role: Role | null | undefined): NavItem[] {
  if (!role) return []
  const items: NavItem[] = []
  if (readers.includes(role)) items.push({ key: 'audits', label: 'Audits', to: { name: 'audits' } })
  if (boardReaders.includes(role))
    items.push({ key: 'board', label: 'Board summary', to: { name: 'board' } })
  return items
}
