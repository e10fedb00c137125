import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { mainNav, signIn } from './support-auth.ts'

test('a director creates a requirement profile for tumbling juniors, then deletes it', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Audits' }).click()
  await page.getByRole('link', { name: 'Requirement profiles and age bands' }).click()
  await expect(page.getByRole('heading', { name: 'Requirement profiles' }).first()).toBeVisible()

  await page.locator('[data-test="new-profile"]').click()
  const form = page.locator('[data-test="new-profile-form"]')
  // the name field has the focus: typing goes straight into it
  await page.keyboard.type('Tumbling: junior passes')
  await form.getByRole('button', { name: 'Continue to the requirements' }).click()
  // nothing chosen yet: the form names what is missing and goes no further
  await expect(form.getByText('Choose at least one category.')).toBeVisible()

  await form.getByLabel('Profile source').fill('From memory: club practice')
  await form.getByText('Tumbling', { exact: true }).click()
  await form.locator('[data-test="new-profile-junior"]').click()
  await form.getByRole('button', { name: 'Continue to the requirements' }).click()

  const draft = page.locator('[data-test="profile-draft"]')
  await expect(draft).toBeVisible()
  const first = draft.locator('[data-test="requirement-0"] input')
  await first.nth(0).fill('A double salto backward')
  await first.nth(1).fill('From memory')
  await draft.getByRole('button', { name: 'Create profile' }).click()

  const created = page.locator('[data-test="profile-tumbling-junior-passes"]')
  await expect(created).toBeVisible()
  await expect(created.getByText('Tumbling', { exact: true })).toBeVisible()
  // the discipline suggested its own apparatus: the requirements are met on tumbling
  await expect(created.locator('[data-test="profile-apparatus"]')).toHaveText('On tumbling')
  await expect(draft).toHaveCount(0)
  await screenshot(page, 'requirement-profile-created')

  // it is stored: a reload shows it again
  await page.reload()
  await expect(created).toBeVisible()

  await created.locator('[data-test="delete-profile"]').click()
  const dialog = page.getByRole('dialog')
  await expect(dialog).toContainText('Audits already stored keep their results')
  await dialog.getByRole('button', { name: 'Delete profile' }).click()
  await expect(created).toHaveCount(0)
  await page.reload()
  await expect(page.locator('[data-test="profile-fig-wag-floor-2022"]')).toBeVisible()
  await expect(created).toHaveCount(0)
})
