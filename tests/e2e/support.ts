import { mkdirSync } from 'node:fs'
import { AxeBuilder } from '@axe-core/playwright'
import { expect, type Page } from '@playwright/test'

export const screenshotDir = 'tests/e2e/screenshots'

/** Writes a full-page screenshot for people to look at after the run. */
export async function screenshot(page: Page, name: string) {
  mkdirSync(screenshotDir, { recursive: true })
  await page.screenshot({ path: `${screenshotDir}/${name}.png`, fullPage: true })
}

/** Collects the URL of every request the page makes, to check that none leaves the machine. */
export function recordRequests(page: Page): string[] {
  const urls: string[] = []
  page.on('request', (req) => urls.push(req.url()))
  return urls
}

/**
 * Runs axe on the page as it is (or on the part matching `within`) and fails on any critical or
 * serious violation, naming them.
 */
export async function expectNoSeriousAxeViolations(page: Page, within?: string) {
  const builder = new AxeBuilder({ page })
  const { violations } = await (within ? builder.include(within) : builder).analyze()
  const serious = violations
    .filter((v) => v.impact === 'critical' || v.impact === 'serious')
    .map((v) => `${v.id}: ${v.help} (${v.nodes.length})`)
  expect(serious).toEqual([])
}

/**
 * Opens the local mail viewer at `viewerUrl` until a message to `email` is there (a worker sends
 * mail a moment after the request that causes it; the viewer is a plain page, reloaded here) and
 * answers that message.
 */
export async function openMailTo(page: Page, viewerUrl: string, email: string) {
  const message = page.locator('article', { hasText: email }).first()
  await expect(async () => {
    await page.goto(viewerUrl)
    await expect(message).toBeVisible({ timeout: 500 })
  }).toPass({ timeout: 15_000 })
  return message
}
