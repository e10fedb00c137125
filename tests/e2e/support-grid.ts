import { expect, type Locator } from '@playwright/test'

/**
 * The squad grid draws only the columns on screen: scrolls it sideways, a screen at a time, until
 * `selector` is drawn, and answers its locator.
 */
export async function scrollToCell(grid: Locator, selector: string): Promise<Locator> {
  const cell = grid.locator(selector).first()
  await grid.evaluate((el) => el.scrollTo({ left: 0 }))
  await expect(async () => {
    if ((await cell.count()) > 0) return
    const moved = await grid.evaluate((el) => {
      const before = el.scrollLeft
      el.scrollBy({ left: el.clientWidth / 2 })
      return el.scrollLeft !== before
    })
    if (!moved) await grid.evaluate((el) => el.scrollTo({ left: 0 }))
    expect(await cell.count()).toBeGreaterThan(0)
  }).toPass({ timeout: 15_000 })
  await cell.scrollIntoViewIfNeeded()
  return cell
}
