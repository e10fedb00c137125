import { expect, test } from '@playwright/test'

// The sign-in page is the first thing every person loads: its scripts and styles, as the server
// sends them (compressed), stay within 150 KB. Charts, date pickers and data tables load with
// the pages that use them. Bytes, not time: the figure is the same on every run.
export const signInBudgetBytes = 150 * 1024

test('the sign-in page loads at most 150 KB of compressed JavaScript and CSS', async ({ page }) => {
  const loaded: Promise<{ url: string; bytes: number }>[] = []
  page.on('response', (response) => {
    const type = response.request().resourceType()
    if (type !== 'script' && type !== 'stylesheet') return
    loaded.push(
      response
        .request()
        .sizes()
        .then((s) => ({ url: response.url(), bytes: s.responseBodySize })),
    )
  })
  await page.goto('/sign-in')
  await expect(page.getByRole('button', { name: 'Sign in' })).toBeVisible()
  await page.waitForLoadState('networkidle')
  const files = await Promise.all(loaded)
  const total = files.reduce((sum, f) => sum + f.bytes, 0)
  console.log(
    `sign-in page: ${files.length} files, ${total} bytes compressed (${(total / 1024).toFixed(1)} KB of ${signInBudgetBytes / 1024} KB)`,
  )
  expect(files.length).toBeGreaterThan(0)
  expect(total, files.map((f) => `${f.url} ${f.bytes}`).join('\n')).toBeLessThanOrEqual(
    signInBudgetBytes,
  )
})
