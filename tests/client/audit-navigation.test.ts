import { describe, expect, it } from 'vitest'
import type { Role } from '@shared/domain/club'
import { auditNavItems, auditRoutes } from '@/router/auditRoutes'

describe('the audit feature in the navigation', () => {
  it.each<[Role, string[]]>([
    ['director', ['Audits', 'Board summary']],
    ['coach', ['Audits']],
    ['clinician', ['Audits']],
    ['board', ['Board summary']],
  ])('lists for the %s: %j', (role, labels) => {
    expect(auditNavItems(role).map((item) => item.label)).toEqual(labels)
  })

  it('keeps the board out of the audits, which name athletes', () => {
    const rolesOf = (name: string) => auditRoutes.find((r) => r.name === name)?.meta?.roles
    expect(rolesOf('audits')).not.toContain('board')
    expect(rolesOf('audit')).not.toContain('board')
    expect(rolesOf('audit-settings')).not.toContain('board')
    expect(rolesOf('board')).toEqual(['board', 'director'])
  })

  it('matches the settings page before an audit id', () => {
    const paths = auditRoutes.map((r) => r.path)
    expect(paths.indexOf('/audits/settings')).toBeLessThan(paths.indexOf('/audits/:id'))
  })
})
