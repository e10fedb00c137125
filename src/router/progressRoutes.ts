import type { RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/domain/club'
import type { NavItem } from './navigation'

// Squads, athletes and progress: the routes and the navigation entries of the feature, for the
// router and the main navigation to take in. The server checks every role again.

const readers: Role[] = ['director', 'coach', 'clinician']
const writers: Role[] = ['director', 'coach']

export const progressRoutes: RouteRecordRaw[] = [
  {
    path: '/squads',
    name: 'squads',
    component: () => import('@/views/SquadsView.vue'),
    meta: { title: 'Squads', roles: readers },
  },
  {
    path: '/squads/:squadId',
    name: 'squad',
    component: () => import('@/views/SquadView.vue'),
    props: true,
    meta: { title: 'Squad', roles: readers, nav: 'squads' },
  },
  {
    path: '/log',
    name: 'progress-log',
    component: () => import('@/views/ProgressLogView.vue'),
    meta: { title: 'Log progress', roles: writers },
  },
  {
    path: '/log/squad',
    name: 'squad-log',
    component: () => import('@/views/SquadLogView.vue'),
    meta: { title: 'Log a whole squad', roles: writers, nav: 'progress-log' },
  },
  {
    path: '/athletes/:athleteId',
    name: 'athlete',
    component: () => import('@/views/AthleteView.vue'),
    props: true,
    meta: { title: 'Athlete', roles: readers, nav: 'squads' },
  },
  {
    path: '/missing-skills',
    name: 'missing-skills',
    component: () => import('@/views/MissingSkillsView.vue'),
    meta: { title: 'Missing skills', roles: readers },
  },
]

/**
 * The feature's entries of the main navigation for a role: board members see aggregates only,
 * clinicians read, and only those who write records log progress.
 */
export function progressNavItems(role: Role | null | undefined): NavItem[] {
  if (!role || !readers.includes(role)) return []
  const items: NavItem[] = [{ key: 'squads', label: 'Squads', to: { name: 'squads' } }]
  if (writers.includes(role))
    items.push({ key: 'progress-log', label: 'Log progress', to: { name: 'progress-log' } })
  items.push({ key: 'missing-skills', label: 'Missing skills', to: { name: 'missing-skills' } })
  return items
}
