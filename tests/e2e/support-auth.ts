import { expect, type Page } from '@playwright/test'

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
