import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { demoAthleteNamesIn, isDemoAthleteName, reportCard } from './support-audit.ts'
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
  // The gap rows name demo athletes: a given and a family name from the seed's lists.
  const gapAthletes = await reportCard(page, /^Gaps \(\d+\)$/)
    .locator('tbody tr td:nth-child(2)')
    .allInnerTexts()
  expect(gapAthletes.length).toBeGreaterThan(0)
  expect(gapAthletes.filter((name) => !isDemoAthleteName(name))).toEqual([])
  // The board's check below recognises every one of them.
  for (const name of gapAthletes) expect(demoAthleteNamesIn(name), name).not.toEqual([])
  await signOut(page)

  await signIn(page, 'board@demo.example')
  await mainNav(page).getByRole('link', { name: 'Board summary' }).click()
  await expect(page.getByRole('heading', { name: 'Balance over time' }).first()).toBeVisible()
  await expect(page.locator('canvas').first()).toBeVisible()
  // No demo athlete's given or family name reaches the board.
  expect(demoAthleteNamesIn(await page.locator('body').innerText())).toEqual([])
  await screenshot(page, 'board-summary')
})
