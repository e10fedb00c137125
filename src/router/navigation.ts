import type { RouteLocationRaw } from 'vue-router'
import type { Me, MembershipView } from '@shared/schemas/auth'
import { auditNavItems } from './auditRoutes'
import { progressNavItems } from './progressRoutes'

export interface NavItem {
  key: string
  label: string
  to: RouteLocationRaw
}

/**
 * The main navigation for the person's role in the club they work in: only what the role may
 * use, and only features that are built.
 */
export function navigationItems(me: Me | null, membership: MembershipView | null): NavItem[] {
  if (!me || !membership || !membership.accessOpen) return []
  // A clinician's and a board member's own page is their visit and the board summary (the
  // router sends them there from home), so an Overview entry would lead to the same page twice.
  const items: NavItem[] =
    membership.role === 'clinician'
      ? [{ key: 'visit', label: 'Your visit', to: { name: 'visit' } }]
      : membership.role === 'board'
        ? []
        : [{ key: 'home', label: 'Overview', to: { name: 'home' } }]
  // Board members see aggregates only; the catalogue is the working tool of the gym floor.
  if (membership.role !== 'board') {
    items.push({ key: 'catalogue', label: 'Catalogue', to: { name: 'catalogue' } })
  }
  items.push(...progressNavItems(membership.role), ...auditNavItems(membership.role))
  if (membership.role === 'director') {
    items.push({ key: 'visits', label: 'Visits', to: { name: 'visits' } })
    items.push({ key: 'members', label: 'Members', to: { name: 'members' } })
    items.push({ key: 'club-settings', label: 'Club', to: { name: 'club-settings' } })
  }
  return items
}
