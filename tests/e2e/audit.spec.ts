import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { mainNav, signIn, signOut } from './support-auth.ts'

test('a director runs an audit of the demo club and sees the coverage chart and the gap list; the board sees the summary and no names', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Audits' }).click()
  await page.locator('[data-test="run-audit"]').click()
  await expect(page.getByRole('heading', { name: 'Headline figures' }).first()).toBeVisible({
    timeout: 30_000,
  })
  await expect(page.getByRole('heading', { name: 'Coverage' }).first()).toBeVisible()
  await expect(page.locator('canvas').first()).toBeVisible()
  await expect(page.getByRole('heading', { name: /^Gaps \(\d+\)$/ }).first()).toBeVisible()
  // the gap list names demo athletes and their backward elements
  await expect(page.getByText(/Double back layout, 1½ out|Triple back tuck/).first()).toBeVisible()
  await screenshot(page, 'audit-report')

  await page
    .getByRole('button', { name: /publish/i })
    .first()
    .click()
  await page
    .getByRole('dialog')
    .getByRole('button', { name: /publish/i })
    .click()
  await expect(page.getByText(/published/i).first()).toBeVisible()
  const someAthlete =
    (await page.locator('table').filter({ hasText: 'Triple back tuck' }).first().innerText())
      .length > 0
  expect(someAthlete).toBe(true)
  await signOut(page)

  await signIn(page, 'board@demo.example')
  await mainNav(page).getByRole('link', { name: 'Board summary' }).click()
  await expect(page.getByRole('heading', { name: 'Balance over time' }).first()).toBeVisible()
  await expect(page.locator('canvas').first()).toBeVisible()
  const text = await page.locator('body').innerText()
  // demo athletes' family names never reach the board
  for (const name of [
    'Ashcombe',
    'Brackenridge',
    'Dewhurst',
    'Eskdale',
    'Foxcote',
    'Hollowby',
    'Nettlebed',
  ]) {
    expect(text).not.toContain(name)
  }
  await screenshot(page, 'board-summary')
})
