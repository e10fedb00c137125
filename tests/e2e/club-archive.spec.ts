import { readFileSync } from 'node:fs'
import { expect, test } from '@playwright/test'
import { demoClub } from '../../seed/demo.ts'
import { archiveManifestSchema } from '../../shared/schemas/archives.ts'
import { readZip } from '../support/zip.ts'
import { mainNav, signIn } from './support-auth.ts'

test('a director takes the club’s data away with the keyboard: the zip holds its manifest', async ({
  page,
}) => {
  await signIn(page, 'director@demo.example')
  await mainNav(page).getByRole('link', { name: 'Club' }).click()
  const card = page.locator('[data-test="club-archive"]')
  await expect(card).toContainText('Personal data of minors')
  await card.getByRole('button', { name: 'Make the archive' }).focus()
  await page.keyboard.press('Enter')
  const link = card.getByRole('link', { name: /Download the archive/ })
  await expect(link).toBeVisible({ timeout: 60_000 })

  await link.focus()
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.keyboard.press('Enter'),
  ])
  expect(download.suggestedFilename()).toMatch(/^[a-z0-9-]+-\d{4}-\d\d-\d\d\.zip$/)
  const files = readZip(readFileSync(await download.path()))
  const manifest = archiveManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString()))
  expect(manifest.club.name).toBe(demoClub.name)
  expect(manifest.files.map((f) => f.name)).toEqual(
    expect.arrayContaining(['members.csv', 'athletes.csv', 'progress-events.csv', 'audits.csv']),
  )
  for (const file of manifest.files) expect(files.has(file.name), file.name).toBe(true)
  expect(manifest.files.find((f) => f.name === 'progress-events.csv')!.rows).toBeGreaterThan(0)
})
