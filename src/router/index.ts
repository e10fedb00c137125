import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/domain/club'
import { useSessionStore } from '@/stores/session'
import { auditRoutes } from './auditRoutes'
import { plannerRoutes } from './plannerRoutes'
import { progressRoutes } from './progressRoutes'

declare module 'vue-router' {
  interface RouteMeta {
    title?: string
    /** Reachable signed out (sign-in, invitation, password reset, starting a club). */
    public?: boolean
    /** Roles that may open the page; absent means every signed-in role. */
    roles?: Role[]
    /** The navigation entry to highlight, when it is not the route's own name. */
    nav?: string
  }
}

export const routes: RouteRecordRaw[] = [
  {
    path: '/',
    name: 'home',
    component: () => import('@/views/HomeView.vue'),
    meta: { title: 'Overview' },
  },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { title: 'Sign in', public: true },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { title: 'Forgotten password', public: true },
  },
  {
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { title: 'New password', public: true },
  },
  {
    path: '/accept-invitation',
    name: 'accept-invitation',
    component: () => import('@/views/AcceptInvitationView.vue'),
    meta: { title: 'Accept invitation', public: true },
  },
  {
    path: '/start-club',
    name: 'start-club',
    component: () => import('@/views/StartClubView.vue'),
    meta: { title: 'Start a club', public: true },
  },
  {
    path: '/confirm-club',
    name: 'confirm-club',
    component: () => import('@/views/ConfirmClubView.vue'),
    meta: { title: 'Confirm your club', public: true },
  },
  {
    path: '/members',
    name: 'members',
    component: () => import('@/views/MembersView.vue'),
    meta: { title: 'Members', roles: ['director'] },
  },
  {
    path: '/club',
    name: 'club-settings',
    component: () => import('@/views/ClubSettingsView.vue'),
    meta: { title: 'Club', roles: ['director'] },
  },
  {
    path: '/catalogue',
    name: 'catalogue',
    component: () => import('@/views/CatalogueView.vue'),
    meta: { title: 'Catalogue', roles: ['director', 'coach', 'clinician'] },
  },
  {
    path: '/catalogue/templates',
    name: 'catalogue-templates',
    component: () => import('@/views/CatalogueTemplatesView.vue'),
    meta: {
      nav: 'catalogue',
      title: 'Progression templates',
      roles: ['director', 'coach', 'clinician'],
    },
  },
  {
    path: '/catalogue/new',
    name: 'element-new',
    component: () => import('@/views/ElementFormView.vue'),
    meta: { nav: 'catalogue', title: 'New element', roles: ['director'] },
  },
  {
    path: '/catalogue/:id/edit',
    name: 'element-edit',
    component: () => import('@/views/ElementFormView.vue'),
    props: true,
    meta: { nav: 'catalogue', title: 'Edit element', roles: ['director'] },
  },
  {
    path: '/catalogue/:id',
    name: 'element',
    component: () => import('@/views/ElementView.vue'),
    props: true,
    meta: { nav: 'catalogue', title: 'Element', roles: ['director', 'coach', 'clinician'] },
  },
  {
    path: '/account',
    name: 'account',
    component: () => import('@/views/AccountView.vue'),
    meta: { title: 'Account' },
  },
  {
    path: '/no-access',
    name: 'no-access',
    component: () => import('@/views/NoAccessView.vue'),
    meta: { title: 'No access' },
  },
  {
    path: '/visits',
    name: 'visits',
    component: () => import('@/views/VisitsView.vue'),
    meta: { title: 'Visits', roles: ['director'] },
  },
  {
    path: '/visit',
    name: 'visit',
    component: () => import('@/views/VisitView.vue'),
    meta: { title: 'Your visit', roles: ['clinician'] },
  },
  ...progressRoutes,
  ...plannerRoutes,
  ...auditRoutes,
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { title: 'Page not found', public: true },
  },
]

const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
})

// The one guard: sign-in, role and visit window. The server checks all of it again.
router.beforeEach(async (to) => {
  const session = useSessionStore()
  if (!session.ready) await session.load().catch(() => undefined)
  if (to.meta.public) return true
  if (!session.signedIn)
    return { name: 'sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} }
  if (to.name === 'no-access' || to.name === 'account') return true
  const membership = session.membership
  if (!membership) return { name: 'no-access', query: { reason: 'no-club' } }
  if (!membership.accessOpen) return { name: 'no-access', query: { reason: 'window' } }
  if (to.meta.roles && !to.meta.roles.includes(membership.role))
    return { name: 'no-access', query: { reason: 'role' } }
  // The board's page of its own is its summary; a clinician's is their visit.
  if (to.name === 'home' && membership.role === 'board') return { name: 'board' }
  if (to.name === 'home' && membership.role === 'clinician') return { name: 'visit' }
  return true
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Twofold` : 'Twofold'
})

export default router
