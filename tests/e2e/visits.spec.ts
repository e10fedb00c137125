import { expect, test, type Page } from '@playwright/test'
import { expectNoSeriousAxeViolations, screenshot } from './support.ts'
import { reportCard, runClubAudit } from './support-audit.ts'
import { mainNav, signIn, signOut } from './support-auth.ts'

const isoDay = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10)
const recommendationText = 'Hold the tuck to the top of the rotation before opening (browser test).'

/** Types a date into a Naive UI date picker whose input is not read-only. */
async function typeDate(page: Page, testId: string, day: string) {
  const input = page.locator(`[data-test="${testId}"] input`)
  await input.fill(day)
  await input.press('Enter')
  await input.press('Tab')
}

test('the clinician watches a clip and recommends; the coach accepts and logs a step; the next audit shows it moved', async ({
  browser,
}) => {
  test.setTimeout(120_000)
  const context = await browser.newContext({
    viewport: { width: 1024, height: 1366 },
    hasTouch: true,
  })
  let page = await context.newPage()

  // The clinician, inside the demo visit of the Kites: the clips waiting for review.
  await signIn(page, 'clinician@demo.example')
  await page.goto('/visit')
  const waiting = page.locator('[data-test="clips-waiting"]')
  const clip = waiting.locator('[data-test="clip"]').filter({ hasText: 'Ada Dewhurst' })
  await expect(clip).toBeVisible()
  const title = (await clip.locator('strong').first().textContent())!.trim()
  const elementName = title.split(' · ')[1]!
  await clip.getByRole('button', { name: 'Watch' }).click()
  const video = clip.locator('[data-test="clip-player"]')
  await expect(video).toBeVisible()
  // It plays: metadata read through range requests, then the time moves on.
  const played = await video.evaluate(async (v: HTMLVideoElement) => {
    v.muted = true
    await v.play()
    await new Promise((resolve) => setTimeout(resolve, 600))
    return { readyState: v.readyState, duration: v.duration, currentTime: v.currentTime }
  })
  expect(played.readyState).toBeGreaterThanOrEqual(1)
  expect(played.duration).toBeGreaterThan(0)
  expect(played.currentTime).toBeGreaterThan(0)
  await expectNoSeriousAxeViolations(page)
  await screenshot(page, 'clinician-clip-player')

  // A recommendation on that athlete's element, from the clip: the safety caution shows.
  await clip.getByRole('button', { name: 'Recommend…' }).click()
  const dialog = page.getByRole('dialog')
  await dialog.getByLabel('Step to aim for').click()
  await page.locator('.n-base-select-option:visible').nth(1).click()
  await expect(dialog.locator('[data-test="safety-note"]')).toBeVisible()
  await dialog.getByLabel('Recommendation').fill(recommendationText)
  await typeDate(page, 'recommendation-due', isoDay(14))
  await dialog.getByRole('button', { name: 'Save recommendation' }).click()
  await expect(page.getByText(/Recommendation saved/)).toBeVisible()
  await clip.getByRole('button', { name: 'Mark reviewed' }).click()
  await expect(
    waiting.locator('[data-test="clip"]').filter({ hasText: 'Ada Dewhurst' }),
  ).toHaveCount(0)
  await signOut(page)

  // The coach sees it on the log screen for that athlete and element, accepts it, logs a step.
  await signIn(page, 'coach@demo.example')
  await page.goto('/log')
  await page.getByLabel('Squad', { exact: true }).first().click()
  await page.locator('.n-base-select-option:visible', { hasText: 'Kites' }).first().click()
  await page.getByLabel('Athlete', { exact: true }).first().click()
  await page.keyboard.press('Enter')
  await expect(page.getByText('Ada Dewhurst').first()).toBeVisible()
  await page.getByLabel('Element', { exact: true }).first().click()
  await page.keyboard.type(elementName)
  await page.keyboard.press('Enter')
  const recs = page.locator('[data-test="log-recommendations"]')
  const mine = recs.locator('li').filter({ hasText: recommendationText })
  await expect(mine).toBeVisible()
  await expect(recs.locator('[data-test="safety-note"]')).toBeVisible()
  await mine.getByRole('button', { name: 'Accept' }).click()
  await expect(recs.locator('li').filter({ hasText: recommendationText })).toHaveAttribute(
    'data-test',
    'recommendation-accepted',
  )
  // The coach attaches another clip of the record (the file input a tablet's camera roll fills).
  const logClips = page.locator('[data-test="log-clips"] [data-test="clip"]')
  await expect(logClips).toHaveCount(1)
  await page.locator('[data-test="clip-file"]').setInputFiles('seed/clips/attempt-2.webm')
  await expect(page.getByText('attempt-2.webm uploaded.')).toBeVisible()
  await expect(logClips).toHaveCount(2)
  await page.getByRole('button', { name: /save/i }).first().click()
  await expect(page.getByText(/^Saved\./)).toBeVisible()
  await screenshot(page, 'coach-log-recommendation')
  await context.close()

  // The next audit, run by the director at a desk, shows the recommendation moved.
  const desk = await browser.newContext()
  page = await desk.newPage()
  await signIn(page, 'director@demo.example')
  await runClubAudit(page)
  const outcomes = reportCard(page, 'What the visit changed')
  await expect(outcomes).toBeVisible()
  const row = outcomes
    .getByRole('row')
    .filter({ hasText: 'Ada Dewhurst' })
    .filter({ hasText: 'accepted' })
  await expect(row).toContainText('moved')
  await expect(outcomes.locator('[data-test="visit-outcomes-summary"]')).toContainText(
    /moved at least one step: \d+ of \d+/,
  )
  await screenshot(page, 'audit-visit-outcomes')
  await desk.close()
})

test('a director schedules a visit for a clinician invited by e-mail, covering the Kites', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Visits' }).click()
  await page.getByRole('button', { name: 'Schedule a visit' }).click()
  const form = page.locator('[data-test="visit-form"]')
  await form.getByLabel('…or invite by e-mail').fill('visiting-e2e@test.example')
  await typeDate(page, 'visit-first-day', isoDay(30))
  await typeDate(page, 'visit-last-day', isoDay(32))
  await form.getByLabel('Squads covered').click()
  await page.locator('.n-base-select-option:visible', { hasText: 'Kites' }).first().click()
  await page.keyboard.press('Escape')
  await form.getByRole('button', { name: 'Schedule visit' }).click()
  const card = page
    .locator('[data-test^="visit-"]')
    .filter({ hasText: 'visiting-e2e@test.example' })
  await expect(card).toBeVisible()
  await expect(card).toContainText('Kites')
  await expect(card).toContainText(isoDay(30))
  await expectNoSeriousAxeViolations(page)
})
