import { expect, test } from '@playwright/test'
import { recordRequests, screenshot } from './support.ts'

test('the app opens in IBM Plex Sans from its own origin and requests nothing from elsewhere', async ({
  page,
  baseURL,
}) => {
  const urls = recordRequests(page)
  await page.goto('/')
  await expect(page).toHaveURL(/\/sign-in/)
  await expect(page.getByText('Sign in to Twofold')).toBeVisible()

  const fontFamily = await page.evaluate(() => getComputedStyle(document.body).fontFamily)
  expect(fontFamily).toContain('IBM Plex Sans')
  await page.evaluate(() => document.fonts.ready)
  const loaded = await page.evaluate(
    () =>
      [...document.fonts].filter((f) => f.family.includes('IBM Plex Sans') && f.status === 'loaded')
        .length,
  )
  expect(loaded).toBeGreaterThan(0)

  const fontRequests = urls.filter((u) => /\.woff2?(\?|$)/.test(u))
  expect(fontRequests.length).toBeGreaterThan(0)
  for (const url of urls) {
    const host = new URL(url).hostname
    expect(url.startsWith('data:') || host === '127.0.0.1', `request to ${url}`).toBe(true)
  }
  expect(urls.every((u) => u.startsWith('data:') || u.startsWith(baseURL!))).toBe(true)
  await screenshot(page, 'home')
})

test('an unknown page shows a way back instead of a blank screen', async ({ page }) => {
  await page.goto('/no/such/page')
  await expect(page.getByText('Page not found')).toBeVisible()
  await page.getByRole('button', { name: 'Back to the overview' }).click()
  // the overview needs a signed-in person
  await expect(page).toHaveURL(/\/sign-in/)
})
