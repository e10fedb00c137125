// Every page of the app, as the accessibility scan visits it. `tests/client/a11y-routes.test.ts`
// holds this list to the router: a route added without a visit here (or a reason to skip it)
// fails there, and so do roles that differ from the route's own.

export type DemoRole = 'director' | 'coach' | 'clinician' | 'board'

/** The ids the signed-in visits fill in, read from the demo club through the API. */
export type VisitIds = Record<'squadId' | 'athleteId' | 'elementId' | 'auditId', string>

export interface SignedInVisit {
  /** The address, with `:squadId`, `:athleteId`, `:elementId` or `:auditId` to fill in. */
  path: string
  /** The roles that may open it (the route's `meta.roles`, or every role). */
  roles: DemoRole[]
  /** Where a role is sent instead (the board's overview is its summary). */
  sends?: Partial<Record<DemoRole, string>>
}

const everyone: DemoRole[] = ['director', 'coach', 'clinician', 'board']
const staff: DemoRole[] = ['director', 'coach', 'clinician']

/** Pages reachable signed out; the links of e-mails carry a made-up token after `#`. */
export const signedOutVisits: Record<string, string> = {
  'sign-in': '/sign-in',
  'forgot-password': '/forgot-password',
  'reset-password': '/reset-password#token=not-a-real-token',
  'accept-invitation': '/accept-invitation#token=not-a-real-token',
  'start-club': '/start-club',
  'confirm-club': '/confirm-club#token=not-a-real-token',
  'not-found': '/no/such/page',
}

export const signedInVisits: Record<string, SignedInVisit> = {
  home: { path: '/', roles: everyone, sends: { board: '/board', clinician: '/visit' } },
  account: { path: '/account', roles: everyone },
  'no-access': { path: '/no-access?reason=role', roles: everyone },
  members: { path: '/members', roles: ['director'] },
  'club-settings': { path: '/club', roles: ['director'] },
  catalogue: { path: '/catalogue', roles: staff },
  'catalogue-templates': { path: '/catalogue/templates', roles: staff },
  'element-new': { path: '/catalogue/new', roles: ['director'] },
  'element-edit': { path: '/catalogue/:elementId/edit', roles: ['director'] },
  element: { path: '/catalogue/:elementId', roles: staff },
  squads: { path: '/squads', roles: staff },
  squad: { path: '/squads/:squadId', roles: staff },
  'progress-log': { path: '/log', roles: ['director', 'coach'] },
  'squad-log': {
    path: '/log/squad?squadId=:squadId&elementId=:elementId&pair=1',
    roles: ['director', 'coach'],
  },
  athlete: { path: '/athletes/:athleteId', roles: staff },
  'missing-skills': { path: '/missing-skills', roles: staff },
  audits: { path: '/audits', roles: staff },
  'audit-settings': { path: '/audits/settings', roles: staff },
  audit: { path: '/audits/:auditId', roles: staff },
  board: { path: '/board', roles: ['board', 'director'] },
  visits: { path: '/visits', roles: ['director'] },
  visit: { path: '/visit', roles: ['clinician'] },
}

/** Routes the scan does not visit, each with the reason. */
export const skippedRoutes: Record<string, string> = {}

/** The address of a visit with the demo club's ids filled in. */
export function fillPath(path: string, ids: VisitIds): string {
  return path.replace(
    /:(squadId|athleteId|elementId|auditId)/g,
    (_, key: keyof VisitIds) => ids[key],
  )
}
