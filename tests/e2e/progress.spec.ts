import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { signIn } from './support-auth.ts'
import { scrollToCell } from './support-grid.ts'

test('a coach logs a step on a tablet and sees the squad grid update', async ({ browser }) => {
  const context = await browser.newContext({
    viewport: { width: 768, height: 1024 },
    hasTouch: true,
  })
  const page = await context.newPage()
  await signIn(page, 'coach@demo.example')
  await page.goto('/log')

  await page.getByLabel('Squad', { exact: true }).first().click()
  await page.locator('.n-base-select-option:visible', { hasText: 'Kites' }).first().click()
  await page.getByLabel('Athlete', { exact: true }).first().click()
  // the option list is virtual: the keyboard picks the first athlete
  await page.keyboard.press('Enter')
  await expect(page.getByText('Ada Dewhurst').first()).toBeVisible()
  await page.getByLabel('Element', { exact: true }).first().click()
  await page.keyboard.type('Aerial cartwheel')
  await page.keyboard.press('Enter')

  await expect(page.locator('[data-test="record-step"]')).toContainText(/not started/i)
  await expect(page.getByText(/qualified coaches/).first()).toBeVisible()
  await screenshot(page, 'log-progress-tablet')
  await page.getByRole('button', { name: /save/i }).first().click()
  await expect(page.getByText(/^Saved\./)).toBeVisible()
  await expect(page.locator('[data-test="record-step"]')).toContainText('1/')

  await page.goto('/squads')
  await page.getByRole('link', { name: 'Kites' }).first().click()
  const grid = page.getByRole('region', { name: /^Progress grid of Kites/ })
  const cell = await scrollToCell(grid, '[title^="Ada Dewhurst: Aerial cartwheel step 1 of"]')
  await expect(cell).toBeVisible()
  await screenshot(page, 'squad-grid-tablet')
  await context.close()
})
