import { expect, test, type Page } from '@playwright/test'
import { screenshot } from './support.ts'
import { signIn } from './support-auth.ts'

// A coach records "passed the next step" for the 15 athletes of a demo squad on one element,
// on a tablet, through the squad logging screen. Every tap and keystroke is counted (a typed
// text counts one per character); the budget is 20 in all.

interface Detail {
  stepIndex: number | null
  steps: unknown[]
  events: unknown[]
}

test('a coach logs the next step for a squad of 15 in at most 20 taps and keystrokes', async ({
  browser,
}) => {
  const context = await browser.newContext({
    viewport: { width: 820, height: 1180 },
    hasTouch: true,
  })
  const page = await context.newPage()
  await signIn(page, 'coach@demo.example')
  const api = async <T>(path: string) => {
    const res = await page.request.get(path)
    expect(res.ok(), path).toBe(true)
    return (await res.json()) as T
  }
  const me = await api<{ activeClubId: string }>('/api/auth/me')
  const club = `/api/clubs/${me.activeClubId}`
  const squad = (await api<{ id: string; name: string }[]>(`${club}/squads`)).find(
    (s) => s.name === 'Kites',
  )!
  const roster = await api<{ id: string }[]>(`${club}/athletes?squadId=${squad.id}`)
  expect(roster).toHaveLength(15)

  let taps = 0
  const tap = async (page: Page, locator: ReturnType<Page['locator']>) => {
    taps += 1
    await locator.click()
  }
  const type = async (page: Page, text: string) => {
    taps += text.length
    await page.keyboard.type(text)
  }
  const press = async (page: Page, key: string) => {
    taps += 1
    await page.keyboard.press(key)
  }

  // The coach starts on the squad's page.
  await page.goto(`/squads/${squad.id}`)
  await tap(page, page.getByRole('link', { name: 'Log the whole squad' }))
  await expect(page.getByRole('heading', { name: 'Log a whole squad' })).toBeVisible()
  await tap(page, page.getByLabel('Element', { exact: true }).first())
  await type(page, 'aerial c')
  await press(page, 'Enter')
  await expect(page.locator('[data-test="batch-row"]')).toHaveCount(15)
  const elementId = new URL(page.url()).searchParams.get('elementId')!

  // Where the squad stands before: every athlete has a next step on this element.
  const before = await Promise.all(
    roster.map((a) => api<Detail>(`${club}/athletes/${a.id}/records/${elementId}`)),
  )
  for (const record of before) expect(record.stepIndex ?? -1).toBeLessThan(record.steps.length - 1)

  await expect(page.getByText(/Pass when:/).first()).toBeVisible()
  await expect(page.getByText(/qualified coaches/)).toHaveCount(1)
  await tap(page, page.locator('[data-test="batch-select-all"]'))
  await expect(page.locator('[data-test="batch-save"]')).toHaveText(/Save 15 entries/)
  await expect(page.locator('[data-test="batch-save"]')).toBeInViewport()
  await screenshot(page, 'squad-log-tablet')
  await tap(page, page.locator('[data-test="batch-save"]'))
  await expect(page.getByText('Saved 15 entries.')).toBeVisible()

  expect(taps).toBeLessThanOrEqual(20)
  const after = await Promise.all(
    roster.map((a) => api<Detail>(`${club}/athletes/${a.id}/records/${elementId}`)),
  )
  const added = after.reduce((n, r, i) => n + r.events.length - before[i]!.events.length, 0)
  expect(added).toBe(15)
  after.forEach((r, i) => expect(r.stepIndex).toBe((before[i]!.stepIndex ?? -1) + 1))
  await context.close()
})
