import { describe, expect, it } from 'vitest'
import type { Role } from '@shared/domain/club'
import type { Me, MembershipView } from '@shared/schemas/auth'
import { routes } from '@/router'
import { navigationItems } from '@/router/navigation'

function as(role: Role): [Me, MembershipView] {
  const membership: MembershipView = {
    clubId: '11111111-1111-4111-8111-111111111111',
    clubName: 'Demo club',
    role,
    accessStartsOn: null,
    accessEndsOn: null,
    accessOpen: true,
  }
  const me: Me = {
    user: { id: 'u1', email: `${role}@demo.example`, name: 'Sam' },
    memberships: [membership],
    activeClubId: membership.clubId,
  }
  return [me, membership]
}

describe('the catalogue in the navigation', () => {
  it.each<[Role, boolean]>([
    ['director', true],
    ['coach', true],
    ['clinician', true],
    ['board', false],
  ])('is listed for the %s: %s', (role, listed) => {
    const labels = navigationItems(...as(role)).map((item) => item.label)
    expect(labels.includes('Catalogue')).toBe(listed)
  })

  // The router sends a clinician from home to their visit and a board member to the board
  // summary: each entry of their navigation leads to a page of its own.
  it.each<[Role, string[], string[]]>([
    ['director', ['Overview'], []],
    ['coach', ['Overview'], []],
    ['clinician', ['Your visit'], ['Overview']],
    ['board', ['Board summary'], ['Overview']],
  ])('gives the %s %j and no %j leading to the same page again', (role, listed, absent) => {
    const labels = navigationItems(...as(role)).map((item) => item.label)
    for (const label of listed) expect(labels).toContain(label)
    for (const label of absent) expect(labels).not.toContain(label)
  })

  it('lets only the director open the element form', () => {
    const rolesOf = (name: string) => routes.find((r) => r.name === name)?.meta?.roles
    expect(rolesOf('catalogue')).toEqual(['director', 'coach', 'clinician'])
    expect(rolesOf('element')).toEqual(['director', 'coach', 'clinician'])
    expect(rolesOf('element-new')).toEqual(['director'])
    expect(rolesOf('element-edit')).toEqual(['director'])
  })
})
