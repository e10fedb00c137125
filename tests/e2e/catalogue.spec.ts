import { expect, test } from '@playwright/test'
import { screenshot } from './support.ts'
import { mainNav, signIn } from './support-auth.ts'

test('the catalogue lists elements with notation and counterparts, and shows the demo club’s gaps', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Catalogue' }).click()
  await expect(page.getByRole('heading', { name: 'Catalogue', level: 1 })).toBeVisible()
  await expect(page.getByText('Double back layout, 1½ out').first()).toBeVisible()
  await screenshot(page, 'catalogue')
})

test('a director creates an element and sees its notation, difficulty and counterpart before saving', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await page.goto('/catalogue/new')
  await page.getByLabel('Name').fill('Double front layout, 1½ out')
  // floor is the default apparatus
  await page.getByLabel('Take-off').click()
  await page.locator('.n-base-select-option', { hasText: /punch/i }).first().click()
  await page.getByRole('radio', { name: 'Forward' }).check({ force: true })
  await page.getByLabel('Rotation (quarter saltos: 4 = single, 8 = double)').fill('8')
  await page.getByLabel('Rotation (quarter saltos: 4 = single, 8 = double)').blur()
  await page.getByLabel('Shape').click()
  await page
    .locator('.n-base-select-option', { hasText: /straight/i })
    .first()
    .click()
  await page.getByLabel('Twist in salto 2 (half turns)').fill('3')
  await page.getByLabel('Twist in salto 2 (half turns)').blur()

  // The preview, before anything is saved: FIG notation and the 2005 trampoline difficulty
  // (0.8 for 8 quarters + 0.2 for 2 saltos + 0.3 for 3 half twists + 0.2 straight double = 1.5).
  await expect(page.locator('[data-test="notation"]')).toHaveText('803/')
  await expect(page.locator('[data-test="trampoline-difficulty"]')).toContainText('1.5')
  await expect(page.locator('[data-test="counterpart"]')).toContainText(
    'Double back layout, 1½ out',
  )
  await screenshot(page, 'element-form-preview')

  await page
    .getByRole('button', { name: /save|create/i })
    .first()
    .click()
  await expect(page.getByRole('heading', { name: 'Double front layout, 1½ out' })).toBeVisible()
  await expect(page.locator('[data-test="counterpart"]')).toContainText(
    'Double back layout, 1½ out',
  )
  await screenshot(page, 'element-page')
})
