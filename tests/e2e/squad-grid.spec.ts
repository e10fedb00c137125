import { expect, test } from '@playwright/test'
import { expectNoSeriousAxeViolations, screenshot } from './support.ts'
import { signIn } from './support-auth.ts'

// A cell's accessible name: "Given Family: Element step 2 of 6", then any marks.
const openStep = /^(.+): (.+) step (\d+) of (\d+)$/

test('a coach logs "passed the next step" from the squad grid on a tablet, by keyboard', async ({
  browser,
}) => {
  const context = await browser.newContext({
    viewport: { width: 820, height: 1180 },
    hasTouch: true,
  })
  const page = await context.newPage()
  await signIn(page, 'coach@demo.example')
  await page.goto('/squads')
  await page.getByRole('link', { name: 'Kites' }).first().click()
  const grid = page.getByRole('region', { name: /^Progress grid of Kites/ })
  await expect(grid.locator('[data-test="grid-row"]').first()).toBeVisible()
  await expect(page.getByRole('switch', { name: 'Hide pairs nobody has started' })).toBeChecked()
  await expect(grid.locator('[data-test="grid-family"]').first()).toBeVisible()

  // The athlete column stays put while the pairs scroll sideways.
  const name = grid.locator('tbody th[scope="row"]').first()
  const before = await name.boundingBox()
  await grid.evaluate((el) => el.scrollBy({ left: 600 }))
  await expect(grid.locator('[data-test="grid-row"]').first()).toBeVisible()
  expect((await name.boundingBox())!.x).toBeCloseTo(before!.x, 0)
  await grid.evaluate((el) => el.scrollTo({ left: 0 }))

  // A started, unpaused cell below its last step: its name says where the athlete stands.
  const labels = await grid
    .locator('button[data-cell]')
    .evaluateAll((buttons) => buttons.map((b) => b.getAttribute('aria-label') ?? ''))
  const label = labels.find((l) => {
    const m = openStep.exec(l)
    return m !== null && Number(m[3]) < Number(m[4])
  })
  expect(label, 'a cell with a next step').toBeDefined()
  const [, who, element, step, of] = openStep.exec(label!)!
  const cell = grid.getByRole('button', { name: label!, exact: true })
  await cell.focus()
  await page.keyboard.press('Enter')

  const dialog = page.getByRole('dialog')
  await expect(dialog.getByText(`${who} · ${element}`)).toBeVisible()
  await expect(dialog.locator('[data-test="quick-current"]')).toContainText(`${step}/${of}`)
  await expect(dialog.locator('[data-test="quick-criterion"]')).not.toContainText('No criterion')
  await expect(dialog.getByText(/qualified coaches/)).toHaveCount(1)
  const save = dialog.locator('[data-test="quick-save"]')
  await expect(save).toHaveText(`Passed step ${Number(step) + 1}`)
  await expect(dialog.locator('[data-test="checks-clear"], [data-test="checks"]')).toBeVisible()
  await expect(save).toBeEnabled()
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'squad-grid-quick-log-tablet')

  await save.click()
  await expect(page.getByText(/^Saved\./)).toBeVisible()
  await page.keyboard.press('Escape')
  await expect(dialog).toBeHidden()
  const next = `${who}: ${element} step ${Number(step) + 1} of ${of}`
  await expect(grid.getByRole('button', { name: next, exact: false }).first()).toBeVisible()
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'squad-grid-tablet-820')
  await context.close()
})
