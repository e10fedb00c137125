import type { RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/domain/club'
import type { NavItem } from './navigation'

// The session planner: coaches plan their squads' sessions, the director any squad's.

const planners: Role[] = ['director', 'coach']

export const plannerRoutes: RouteRecordRaw[] = [
  {
    path: '/planner',
    name: 'planner',
    component: () => import('@/views/PlannerView.vue'),
    meta: { title: 'Session planner', roles: planners },
  },
  {
    path: '/planner/plans/:planId',
    name: 'planner-plan',
    component: () => import('@/views/PlanView.vue'),
    props: true,
    meta: { title: 'Session plan', roles: planners, nav: 'planner' },
  },
]

/** The planner's entry of the main navigation, for those who plan sessions. */
export function plannerNavItems(role: Role | null | undefined): NavItem[] {
  return role && planners.includes(role)
    ? [{ key: 'planner', label: 'Plan a session', to: { name: 'planner' } }]
    : []
}
