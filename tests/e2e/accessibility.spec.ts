import { AxeBuilder } from '@axe-core/playwright'
import { expect, test, type Page } from '@playwright/test'
import {
  fillPath,
  signedInVisits,
  signedOutVisits,
  type DemoRole,
  type VisitIds,
} from './a11y-routes.ts'
import { signIn } from './support-auth.ts'

// Every page of every role, scanned by axe once its content has loaded: a critical or serious
// violation anywhere fails, naming the page, the rule and the elements.

const accounts: Record<DemoRole, string> = {
  director: 'director@demo.example',
  coach: 'coach@demo.example',
  clinician: 'clinician@demo.example',
  board: 'board@demo.example',
}

/** Waits for the page's heading, its requests to settle and its skeletons and spinners to go. */
async function settle(page: Page, name: string) {
  await expect(page.locator('main').getByRole('heading').first(), name).toBeVisible()
  await page.waitForLoadState('networkidle')
  await expect(page.locator('.n-skeleton, .n-spin-body'), name).toHaveCount(0, {
    timeout: 15_000,
  })
}

/** The critical and serious violations on the page as it is, one line each. */
async function seriousViolations(page: Page, label: string) {
  const { violations } = await new AxeBuilder({ page }).analyze()
  return violations
    .filter((v) => v.impact === 'critical' || v.impact === 'serious')
    .map(
      (v) =>
        `${label}: ${v.id} (${v.impact}) ${v.help}: ${v.nodes
          .slice(0, 3)
          .map(
            (n) =>
              `${n.target.join(' ')}${v.id === 'color-contrast' ? ` [${n.any[0]?.message}]` : ` ${n.html.slice(0, 160)}`}`,
          )
          .join(', ')}${v.nodes.length > 3 ? ` and ${v.nodes.length - 3} more` : ''}`,
    )
}

/** A squad the person can read, one of its athletes, an element and the latest audit. */
async function demoIds(page: Page): Promise<VisitIds> {
  const api = async <T>(path: string) => {
    const res = await page.request.get(path)
    expect(res.status(), path).toBe(200)
    return (await res.json()) as T
  }
  const me = await api<{ activeClubId: string }>('/api/auth/me')
  const club = `/api/clubs/${me.activeClubId}`
  const [squad] = await api<{ id: string }[]>(`${club}/squads`)
  const [athlete] = await api<{ id: string }[]>(`${club}/athletes?squadId=${squad!.id}`)
  const [element] = await api<{ id: string }[]>(`${club}/elements`)
  const [audit] = await api<{ id: string }[]>(`${club}/audits`)
  return { squadId: squad!.id, athleteId: athlete!.id, elementId: element!.id, auditId: audit!.id }
}

test('the signed-out pages have no critical or serious violations', async ({ page }) => {
  const found: string[] = []
  for (const [name, path] of Object.entries(signedOutVisits)) {
    await page.goto(path)
    await settle(page, name)
    found.push(...(await seriousViolations(page, name)))
  }
  expect(found).toEqual([])
})

for (const role of Object.keys(accounts) as DemoRole[]) {
  test(`every page the ${role} can open has no critical or serious violations`, async ({
    page,
  }) => {
    test.setTimeout(360_000)
    await signIn(page, accounts[role])
    const ids = role === 'board' ? null : await demoIds(page)
    const found: string[] = []
    for (const [name, visit] of Object.entries(signedInVisits)) {
      if (!visit.roles.includes(role)) continue
      const path = ids ? fillPath(visit.path, ids) : visit.path
      await page.goto(path)
      await settle(page, name)
      const expected = visit.sends?.[role] ?? path.replace(/[?#].*$/, '')
      expect(new URL(page.url()).pathname, name).toBe(expected)
      found.push(...(await seriousViolations(page, name)))
    }
    expect(found).toEqual([])
  })
}
