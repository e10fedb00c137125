import { expect, test } from '@playwright/test'
import type { BatchPreview } from '../../shared/schemas/progress-batch.ts'
import { screenshot } from './support.ts'
import { signedInTablet } from './support-auth.ts'

// A coach opens a squad's logging list once online; the tablet then loses its network, reloads,
// still shows the list (kept by the service worker), logs 3 athletes' next steps there, and the
// server gets exactly those 3 entries once the network returns.

interface Detail {
  stepIndex: number | null
  events: unknown[]
}

test('a coach logs 3 athletes of a squad offline from a list opened online, and the server gets exactly 3 events', async ({
  browser,
}) => {
  test.setTimeout(120_000)
  // The service worker is installed and in control before the tablet loses its network.
  const { context, page } = await signedInTablet(browser, 'coach@demo.example')

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
  // An element (not the one the online squad test logs) on which at least 3 athletes have a
  // next step whose checks ask for no reason.
  const catalogue = await api<{ id: string; name: string }[]>(`${club}/elements`)
  const open = (list: BatchPreview) =>
    list.rows.filter((r) => r.nextStep && !r.checks.some((c) => c.severity === 'requires-reason'))
  let element: { id: string; name: string } | undefined
  let before: BatchPreview | undefined
  for (const candidate of catalogue.filter((e) => !/aerial/i.test(e.name))) {
    const list = await api<BatchPreview>(
      `${club}/squads/${squad.id}/progress-batch?elementId=${candidate.id}`,
    )
    if (open(list).length >= 3) {
      element = candidate
      before = list
      break
    }
  }
  expect(element, 'an element with 3 athletes to log').toBeDefined()
  const chosen = open(before!).slice(0, 3)
  const positions = chosen.map((r) => before!.rows.indexOf(r))
  const record = (athleteId: string) =>
    api<Detail>(`${club}/athletes/${athleteId}/records/${element!.id}`)
  const eventsBefore = await Promise.all(chosen.map((r) => record(r.athleteId)))

  // Opened once online: the service worker keeps the list.
  await page.goto(`/log/squad?squadId=${squad.id}&elementId=${element!.id}`)
  const rows = page.locator('[data-test="batch-row"]')
  await expect(rows).toHaveCount(before!.rows.length)

  await context.setOffline(true)
  await page.reload()
  await expect(page.getByRole('heading', { name: 'Log a whole squad' })).toBeVisible()
  await expect(rows).toHaveCount(before!.rows.length)
  await expect(page.locator('[data-test="batch-offline"]')).toBeVisible()
  const stepCount = before!.elements[0]!.stepCount
  const now = (stepIndex: number | null) =>
    stepIndex === null ? 'not started' : `now ${stepIndex + 1}/${stepCount}`
  for (const [i, row] of chosen.entries())
    await expect(rows.nth(positions[i]!)).toContainText(now(row.stepIndex))
  await expect(page.getByText(/qualified coaches/)).toHaveCount(1)
  await screenshot(page, 'squad-log-offline')

  for (const position of positions) await rows.nth(position).getByRole('checkbox').click()
  await expect(page.locator('[data-test="batch-save"]')).toHaveText(/Save 3 entries/)
  await page.locator('[data-test="batch-save"]').click()
  await expect(page.getByText('Kept on this tablet, waiting to send: 3 entries')).toBeVisible()
  await expect(page.locator('[data-test="outbox-status"]')).toContainText('3 waiting to send')
  for (const [i, row] of chosen.entries()) {
    const shown = rows.nth(positions[i]!)
    await expect(shown).toContainText(now((row.stepIndex ?? -1) + 1))
    await expect(shown).toContainText('entry kept on this tablet')
    const next = before!.elements[0]!.steps[(row.stepIndex ?? -1) + 2]
    if (next) await expect(shown).toContainText(`Next: step ${next.index + 1} · ${next.name}`)
  }
  await screenshot(page, 'squad-log-offline-kept')

  // A list never opened online cannot be shown offline, and the screen says why.
  const other = catalogue.find((e) => e.id !== element!.id)!
  await page.goto(`/log/squad?squadId=${squad.id}&elementId=${other.id}`)
  await expect(page.getByText(/has not been opened on this tablet while online/)).toBeVisible()
  await expect(page.locator('[data-test="outbox-status"]')).toContainText('3 waiting to send')

  await context.setOffline(false)
  await expect(page.locator('[data-test="outbox-status"]')).toHaveCount(0, { timeout: 30_000 })
  const expectThreeNew = async () => {
    const after = await Promise.all(chosen.map((r) => record(r.athleteId)))
    after.forEach((r, i) => {
      expect(r.events.length).toBe(eventsBefore[i]!.events.length + 1)
      expect(r.stepIndex).toBe((chosen[i]!.stepIndex ?? -1) + 1)
    })
    const list = await api<BatchPreview>(
      `${club}/squads/${squad.id}/progress-batch?elementId=${element!.id}`,
    )
    const moved = list.rows.filter((r, i) => r.lastEventId !== before!.rows[i]!.lastEventId)
    expect(moved.map((r) => r.athleteId)).toEqual(chosen.map((r) => r.athleteId))
  }
  await expectThreeNew()
  // Nothing is sent twice, however the sending went.
  await page.goto(`/log/squad?squadId=${squad.id}&elementId=${element!.id}`)
  await expect(rows).toHaveCount(before!.rows.length)
  for (const [i, row] of chosen.entries())
    await expect(rows.nth(positions[i]!)).toContainText(now((row.stepIndex ?? -1) + 1))
  await expectThreeNew()
  await context.close()
})
