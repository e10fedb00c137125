import { describe, expect, it } from 'vitest'
import { roles } from '@shared/domain/club'
import { routes } from '@/router'
import { signedInVisits, signedOutVisits, skippedRoutes } from '../e2e/a11y-routes'

// The browser scan (tests/e2e/accessibility.spec.ts) visits the pages listed in a11y-routes.ts;
// this holds that list to the router, so that a new page cannot go unscanned.
describe('the accessibility scan covers every route', () => {
  const named = routes.map((r) => String(r.name))

  it('visits or skips, with a reason, every named route', () => {
    const covered = [
      ...Object.keys(signedOutVisits),
      ...Object.keys(signedInVisits),
      ...Object.keys(skippedRoutes),
    ]
    expect(named.filter((name) => !covered.includes(name))).toEqual([])
    expect(covered.filter((name) => !named.includes(name))).toEqual([])
    for (const reason of Object.values(skippedRoutes)) expect(reason.length).toBeGreaterThan(10)
  })

  it.each(routes.map((r) => [String(r.name), r] as const))(
    'visits %s as the roles the router lets in',
    (name, route) => {
      if (route.meta?.public) {
        expect(signedOutVisits[name] ?? skippedRoutes[name]).toBeDefined()
        return
      }
      const visit = signedInVisits[name]
      if (!visit) return expect(skippedRoutes[name]).toBeDefined()
      expect([...visit.roles].sort()).toEqual([...(route.meta?.roles ?? roles)].sort())
    },
  )
})
