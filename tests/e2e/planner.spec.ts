import { expect, test } from '@playwright/test'
import { expectNoSeriousAxeViolations, screenshot } from './support.ts'
import { signIn } from './support-auth.ts'

test('a coach plans a session for a demo squad on a tablet, prints it, saves it and records it', async ({
  browser,
}) => {
  const context = await browser.newContext({
    viewport: { width: 820, height: 1180 },
    hasTouch: true,
  })
  const page = await context.newPage()
  await signIn(page, 'coach@demo.example')
  // At tablet width the navigation sits behind the menu button.
  await page.getByRole('button', { name: 'Open the menu' }).click()
  await page.getByRole('link', { name: 'Plan a session' }).last().click()
  await expect(page.getByRole('heading', { name: 'Session planner' })).toBeVisible()
  await expect(page.getByText('Trampoline 1').first()).toBeVisible()
  await expectNoSeriousAxeViolations(page)

  await page.getByLabel('Squad', { exact: true }).first().click()
  await page.locator('.n-base-select-option:visible', { hasText: 'Kites' }).first().click()
  await expect(page.getByRole('checkbox').first()).toBeVisible()
  // The demo's stations: choose them all, the default focus being the audit's forward gaps.
  for (const name of [
    'Tumble track',
    'Mini-tramp into the pit',
    'Floor drills corner',
    'Twisting belt',
    'Coach spot on the floor',
    'Landing mat strip',
    'Floor, solo',
    'Trampoline 2',
  ]) {
    const box = page.getByRole('checkbox', { name })
    if (!(await box.isChecked())) await box.check()
  }
  await page.getByRole('button', { name: 'Plan the session' }).click()
  // The first plan after start-up warms the solver's thread up first (about a second idle, several
  // on a busy two-core machine).
  await expect(page.getByText(/qualified coaches/).first()).toBeVisible({ timeout: 30_000 })
  await expect(page.getByRole('table').first()).toBeVisible()
  await expect(page.getByText(/Focus: the largest forward gaps/)).toBeVisible()
  await screenshot(page, 'planner-plan-tablet')
  await expectNoSeriousAxeViolations(page)

  // Take the first athlete placed in block 1 out of it: their figures change at once.
  const name = (await page
    .locator('.plan-grid tbody tr')
    .first()
    .locator('td li strong')
    .first()
    .textContent())!
  const turns = page.locator('table.athletes').getByRole('row', { name }).locator('td').first()
  const before = await turns.textContent()
  await page.getByLabel('Athlete to move').click()
  await page.keyboard.type(name)
  await page.keyboard.press('Enter')
  await page.getByLabel('Move to station').click()
  await page
    .locator('.n-base-select-option:visible', { hasText: 'Not placed in this block' })
    .click()
  await page.getByRole('button', { name: 'Move', exact: true }).click()
  await expect(page.getByText(/moved; the figures are updated/)).toBeVisible()
  await expect(turns).not.toHaveText(before ?? '')
  await expect(page.locator('.plan-grid tbody tr').first().locator('td').last()).toContainText(name)

  await page.getByRole('button', { name: 'Save the plan' }).click()
  await expect(page).toHaveURL(/\/planner\/plans\//)
  await expect(page.getByRole('heading', { name: 'Session plan' })).toBeVisible()
  await expect(page.getByRole('table').first()).toBeVisible()
  // A notice fading in or out is half transparent: scan once it has gone.
  await expect(page.getByText(/Plan saved for/)).toBeHidden()
  await expectNoSeriousAxeViolations(page)

  // Printed: one page on A4, one on letter.
  await page.emulateMedia({ media: 'print' })
  await screenshot(page, 'planner-print')
  for (const format of ['A4', 'Letter'] as const) {
    const pdf = await page.pdf({ format, preferCSSPageSize: false })
    const pages = pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []
    expect(pages.length, `${format} pages`).toBe(1)
  }
  await page.emulateMedia({ media: 'screen' })

  // After the session: tick the first athlete's next step and record it.
  const tick = page.getByRole('checkbox', { name: /passed .* step \d+/ }).first()
  await tick.check()
  await page.getByRole('button', { name: 'Record the session' }).click()
  await expect(page.getByText(/Session recorded: 1 step passed/)).toBeVisible()
  await expect(page.getByText(/Recorded on/)).toBeVisible()
  await context.close()
})
