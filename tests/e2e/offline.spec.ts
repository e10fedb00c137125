import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { signedInTablet, signIn } from './support-auth.ts'

test('a tablet logs 5 entries offline, survives a reload, and the server gets exactly 5 events', async ({
  browser,
}) => {
  test.setTimeout(120_000)
  // The service worker is installed and in control before the tablet loses its network.
  const { context, page } = await signedInTablet(browser, 'coach@demo.example')

  await page.goto('/squads')
  await page.getByRole('link', { name: 'Kites' }).first().click()
  const grid = page.getByRole('region', { name: /^Progress grid of Kites/ })
  await expect(grid.locator('[data-test="grid-row"]').first()).toBeVisible()

  // An athlete who has not started an element that others in the squad have: five steps to go.
  const cell = grid.getByRole('button', { name: / not started$/ }).first()
  const label = (await cell.getAttribute('aria-label'))!
  const detailAnswer = page.waitForResponse((r) => /\/records\/[^/]+$/.test(r.url()))
  await cell.click()
  const answer = await detailAnswer
  const recordUrl = answer.url()
  const before = ((await answer.json()) as { events: unknown[] }).events.length
  const dialog = page.getByRole('dialog')
  const save = dialog.locator('[data-test="quick-save"]')
  await expect(save).toHaveText('Passed step 1')

  await context.setOffline(true)
  await expect(dialog.locator('[data-test="quick-offline"]')).toBeVisible()
  for (let step = 1; step <= 5; step++) {
    await expect(save).toHaveText(`Passed step ${step}`)
    await expect(save).toBeEnabled()
    await save.click()
    await expect(page.locator('[data-test="outbox-status"]')).toContainText(
      `${step} waiting to send`,
    )
  }
  await expect(dialog.locator('[data-test="quick-current"]')).toContainText('5/')

  // A reload offline: the app shell, the grid and the kept entries come from the tablet.
  await page.reload()
  await expect(page.locator('[data-test="outbox-status"]')).toContainText('5 waiting to send')
  await expect(grid.locator('[data-test="grid-row"]').first()).toBeVisible()
  const [who, element] = label.replace(/ not started$/, '').split(': ')
  await expect(grid.getByRole('button', { name: `${who}: ${element} step 5 of 6` })).toBeVisible()
  await screenshot(page, 'offline-waiting-to-send')

  await context.setOffline(false)
  await expect(page.locator('[data-test="outbox-status"]')).toHaveCount(0, { timeout: 30_000 })
  const events = async () =>
    ((await (await page.request.get(recordUrl)).json()) as { events: unknown[] }).events.length
  expect(await events()).toBe(before + 5)
  // Nothing is sent twice, however the sending went.
  await page.reload()
  await expect(grid.locator('[data-test="grid-row"]').first()).toBeVisible()
  expect(await events()).toBe(before + 5)
  await context.close()
})

test('sign-out warns of entries waiting, then leaves nothing about athletes on the tablet', async ({
  browser,
}) => {
  const context = await browser.newContext({ viewport: { width: 820, height: 1180 } })
  const page = await context.newPage()
  await signIn(page, 'coach@demo.example')
  await page.evaluate(() => navigator.serviceWorker.ready.then(() => true))
  await page.reload()
  await page.goto('/squads')
  await page.getByRole('link', { name: 'Kites' }).first().click()
  const grid = page.getByRole('region', { name: /^Progress grid of Kites/ })
  await grid
    .getByRole('button', { name: / not started$/ })
    .first()
    .click()
  const save = page.getByRole('dialog').locator('[data-test="quick-save"]')
  await expect(save).toHaveText('Passed step 1')
  await context.setOffline(true)
  await save.click()
  await expect(page.locator('[data-test="outbox-status"]')).toContainText('1 waiting to send')
  await page.keyboard.press('Escape')
  await context.setOffline(false)
  // Sent at once: nothing waits, so sign-out asks nothing; kept again offline, it warns.
  await expect(page.locator('[data-test="outbox-status"]')).toHaveCount(0, { timeout: 30_000 })
  await grid
    .getByRole('button', { name: / not started$/ })
    .first()
    .click()
  await expect(save).toHaveText('Passed step 1')
  await context.setOffline(true)
  await save.click()
  await expect(page.locator('[data-test="outbox-status"]')).toContainText('1 waiting to send')
  await page.keyboard.press('Escape')

  await page.getByRole('button', { name: /^Account of/ }).click()
  await page.getByText('Sign out').click()
  await expect(page.getByText('Entries not sent yet')).toBeVisible()
  await context.setOffline(false)
  await page.getByRole('button', { name: 'Sign out and delete them' }).click()
  await expect(page).toHaveURL(/\/sign-in/)
  const left = await page.evaluate(async () => {
    const cache = await caches.open('twofold-api')
    const databases = await indexedDB.databases()
    return {
      answers: (await cache.keys()).length,
      outbox: databases.some((d) => d.name === 'twofold-outbox'),
    }
  })
  expect(left).toEqual({ answers: 0, outbox: false })
  await context.close()
})
