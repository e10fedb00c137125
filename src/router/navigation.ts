import type { RouteLocationRaw } from 'vue-router'

export interface NavItem {
  key: string
  label: string
  to: RouteLocationRaw
}

/** The app's main navigation; each feature adds its entry here when it is built. */
export function navigationItems(): NavItem[] {
  return [{ key: 'home', label: 'Overview', to: { name: 'home' } }]
}
