import { expect, type Browser, type Page } from '@playwright/test'

export const demoPassword = 'twofold-demo-2026'

export async function signIn(page: Page, email: string) {
  await page.goto('/sign-in')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(demoPassword)
  await page.getByRole('button', { name: 'Sign in' }).click()
  // The sign-in page has a heading of its own: wait to have left it.
  await expect(page).not.toHaveURL(/\/sign-in/)
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible()
}

export async function signOut(page: Page) {
  await page.getByRole('button', { name: /^Account of/ }).click()
  await page.getByText('Sign out').click()
  await expect(page).toHaveURL(/\/sign-in/)
}

export const mainNav = (page: Page) => page.getByRole('navigation', { name: 'Main' }).first()

/**
 * A tablet (portrait, touch) signed in as `email`, whose service worker is installed and in
 * control, so that the app keeps working once the tablet loses its network.
 */
export async function signedInTablet(browser: Browser, email: string) {
  const context = await browser.newContext({
    viewport: { width: 820, height: 1180 },
    hasTouch: true,
  })
  const page = await context.newPage()
  await signIn(page, email)
  await page.evaluate(() => navigator.serviceWorker.ready.then(() => true))
  await page.reload()
  await expect
    .poll(() => page.evaluate(() => navigator.serviceWorker.controller !== null))
    .toBe(true)
  return { context, page }
}
