import { spawnSync } from 'node:child_process'
import { readFileSync, writeFileSync } from 'node:fs'
import { expect, test, type Download, type Page } from '@playwright/test'
import Papa from 'papaparse'
import { demoClub, demoSquads } from '../../seed/demo.ts'
import { safetyCaution } from '../../shared/domain/element.ts'
import { slugify } from '../../shared/domain/slug.ts'
import { pngSize, readPdf } from './support-files.ts'
import { isDemoAthleteName, publishAudit, reportCard, runClubAudit } from './support-audit.ts'
import { mainNav, signIn } from './support-auth.ts'
import { expectNoSeriousAxeViolations, screenshot, screenshotDir } from './support.ts'

// The report as it leaves the screen: printed, exported to PDF and CSV, and the board's chart
// saved as an image. The demo club comes with a year of published quarterly audits; today's,
// run and published here, is compared with the last of them.

let reportPath = ''

test.beforeAll(async ({ browser }) => {
  const page = await browser.newPage()
  await signIn(page, 'director@demo.example')
  reportPath = await runClubAudit(page)
  await publishAudit(page)
  await page.close()
})

// A4 less the report's 14 mm margins, in CSS pixels: the width the printed report has.
const paperWidth = 688
const squadNames = demoSquads.map((s) => s.name)
const clubSlug = slugify(demoClub.name, 60)

async function openReport(page: Page) {
  await signIn(page, 'director@demo.example')
  await page.goto(reportPath)
  await expect(reportCard(page, 'Headline figures')).toBeVisible()
}

/** The number in the gap list's title, "Gaps (N)". */
async function gapCount(page: Page) {
  const title = await reportCard(page, /^Gaps \(\d+\)$/)
    .locator('h2')
    .innerText()
  return Number(title.match(/\((\d+)\)/)![1])
}

const figureValue = (page: Page, key: string) =>
  page.locator(`[data-test="figure-${key}"] .value`).innerText()

const gapRows = (page: Page) => reportCard(page, /^Gaps/).locator('tbody tr')
const readinessRows = (page: Page) => reportCard(page, /^Readiness/).locator('tbody tr')

/** The file behind a download, after checking the name the browser was told to save it as. */
async function downloaded(download: Download, name: RegExp) {
  expect(download.suggestedFilename()).toMatch(name)
  return readFileSync(await download.path())
}

test('the printed report keeps the figures, charts, squads, every gap and readiness row, and drops the navigation, actions and filters', async ({
  page,
}) => {
  await openReport(page)
  const onScreenOnly = [
    mainNav(page),
    page.getByRole('link', { name: '← All audits' }),
    page.getByRole('button', { name: 'PDF report' }),
    page.getByRole('link', { name: 'Gaps CSV' }),
    page.getByRole('link', { name: 'Headline CSV' }),
    page.getByRole('button', { name: 'Print' }),
    page.getByRole('button', { name: 'Recheck inputs' }),
    page.locator('[data-test="gap-squad-filter"]'),
    page.getByRole('button', { name: /^Account of/ }),
  ]
  // On screen (at a width that shows the whole navigation) all of them are there, and the
  // gap list is paginated.
  for (const element of onScreenOnly) await expect(element).toBeVisible()
  const gaps = await gapCount(page)
  expect(gaps).toBeGreaterThan(20)
  await expect(gapRows(page)).toHaveCount(20)

  await page.emulateMedia({ media: 'print' })
  for (const element of onScreenOnly) await expect(element).toBeHidden()
  await expect(page.locator('.n-data-table__pagination').first()).toBeHidden()

  await expect(
    page.getByRole('heading', { level: 1, name: /^Audit of the whole club/ }),
  ).toBeVisible()
  for (const key of [
    'front-lag',
    'back-lag',
    'balance-ratio',
    'catalogue-gaps',
    'athletes-with-gaps',
    'readiness-alerts',
  ]) {
    await expect(page.locator(`[data-test="figure-${key}"]`)).toBeVisible()
  }
  for (const title of ['Coverage', 'Trend of this scope']) {
    const canvas = reportCard(page, title).locator('canvas')
    await expect(canvas).toBeVisible()
    const box = (await canvas.boundingBox())!
    expect(box.width).toBeGreaterThan(200)
    expect(box.height).toBeGreaterThan(150)
  }
  const squadRows = reportCard(page, 'Squads').locator('tbody tr')
  await expect(squadRows).toHaveCount(squadNames.length)
  // Every gap is printed, not the first page of the list.
  await expect(gapRows(page)).toHaveCount(gaps)
  await expect(readinessRows(page).first()).toBeVisible()
  await expect(reportCard(page, /^Gaps/).getByText(safetyCaution)).toBeVisible()

  // On paper-wide pages no table runs past its card: the right-hand columns are printed.
  await page.setViewportSize({ width: paperWidth, height: 1000 })
  for (const title of ['Squads', /^Gaps/, /^Readiness/]) {
    const card = reportCard(page, title)
    const cardBox = (await card.boundingBox())!
    const lastHeader = card.locator('thead th').last()
    await expect(lastHeader).toBeVisible()
    for (const box of [await card.locator('table').boundingBox(), await lastHeader.boundingBox()]) {
      expect(box!.x + box!.width).toBeLessThanOrEqual(cardBox.x + cardBox.width + 0.5)
    }
  }
  await screenshot(page, 'audit-report-print')
  await page.screenshot({
    path: `${screenshotDir}/audit-report-print-top.png`,
    clip: { x: 0, y: 0, width: paperWidth, height: 2600 },
  })

  const lastGapAthlete = await gapRows(page).last().locator('td').nth(1).innerText()
  const readinessAthletes = await readinessRows(page).locator('td:first-child').allInnerTexts()
  const frontLag = await figureValue(page, 'front-lag')
  const pdf = await page.pdf({ format: 'A4', printBackground: true })
  writeFileSync(`${screenshotDir}/audit-report-print.pdf`, pdf)
  expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-')
  const printed = readPdf(pdf)
  // 20 gap rows or so fit on a page; the figures, charts and squads take two more.
  expect(printed.pageCount).toBeGreaterThanOrEqual(Math.ceil(gaps / 30) + 2)
  const shown = [
    'Headline figures',
    frontLag,
    'Coverage',
    'Trend of this scope',
    ...squadNames,
    `Gaps (${gaps})`,
    safetyCaution,
    lastGapAthlete,
    'Readiness for the next category',
    ...readinessAthletes,
  ].map((text) => text.replace(/\s+/g, ' '))
  expect(shown.filter((text) => !printed.text.includes(text))).toEqual([])
  // Every rank, down to the last: a table clipped at its screen height would lose the end.
  const cells = new Set(printed.pages.flatMap((p) => p.split('\n').map((line) => line.trim())))
  const missingRanks = Array.from({ length: gaps }, (_, i) => String(i + 1)).filter(
    (rank) => !cells.has(rank),
  )
  expect(missingRanks).toEqual([])
  // What follows the gap list starts after its last row, not over it.
  const lastRankPage = printed.pages.findLastIndex((p) => p.split('\n').includes(String(gaps)))
  const readinessPage = printed.pages.findIndex((p) => p.includes('Readiness for the next'))
  expect(readinessPage).toBeGreaterThanOrEqual(lastRankPage)
  const screenOnly = ['PDF report', 'Gaps CSV', 'Recheck inputs', 'All audits', 'Board summary']
  expect(screenOnly.filter((text) => printed.text.includes(text))).toEqual([])
})

test('the Print button lays out every gap before the print dialog opens', async ({ page }) => {
  await openReport(page)
  const gaps = await gapCount(page)
  // The dialog itself cannot be driven; what the page holds at the moment it opens can.
  await page.evaluate(() => {
    const w = window as unknown as { print: () => void; rowsAtPrint?: number }
    w.print = () => {
      const gapTable = [...document.querySelectorAll('.n-card')].find((card) =>
        /^Gaps \(/.test(card.querySelector('h2')?.textContent ?? ''),
      )
      w.rowsAtPrint = gapTable?.querySelectorAll('tbody tr').length ?? 0
    }
  })
  await page.getByRole('button', { name: 'Print' }).click()
  await expect
    .poll(() => page.evaluate(() => (window as { rowsAtPrint?: number }).rowsAtPrint))
    .toBe(gaps)
  // Back on screen afterwards, the list is paginated again.
  await expect(gapRows(page)).toHaveCount(20)
})

test('the PDF report downloads with the club, its headline figures, the largest gaps and the caution', async ({
  page,
}) => {
  await openReport(page)
  const figures = {
    frontLag: await figureValue(page, 'front-lag'),
    backLag: await figureValue(page, 'back-lag'),
    ratio: await figureValue(page, 'balance-ratio'),
    catalogueGaps: await figureValue(page, 'catalogue-gaps'),
    athletesWithGaps: await figureValue(page, 'athletes-with-gaps'),
    readinessAlerts: await figureValue(page, 'readiness-alerts'),
  }
  const firstGapAthlete = await gapRows(page).first().locator('td').nth(1).innerText()
  const asOf = (await page.locator('h1').innerText()).match(/as of (\d{4}-\d{2}-\d{2})/)![1]!

  // Asked for by keyboard: the worker draws it while the page shows its progress, then the
  // browser saves it without another click.
  const downloading = page.waitForEvent('download')
  await page.getByRole('button', { name: 'PDF report' }).focus()
  await page.keyboard.press('Enter')
  await expect(page.getByRole('button', { name: 'Preparing PDF…' })).toBeVisible()
  const download = await downloading
  await expect(page.locator('[data-test="pdf-download"]')).toBeVisible()
  // The actions, the PDF's among them. The whole page is not checked: its card headers carry
  // Naive UI's role="heading" without a level (axe: aria-required-attr), a finding of its own.
  await expectNoSeriousAxeViolations(page, '.audit-report .tf-no-print')
  const pdf = await downloaded(download, new RegExp(`^audit-${asOf}\\.pdf$`))
  writeFileSync(`${screenshotDir}/audit-export.pdf`, pdf)
  expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-')
  // Two subset fonts, a drawn chart and pages of text: some ten kilobytes and more; an empty
  // document is under two, and a runaway one megabytes.
  expect(pdf.length).toBeGreaterThan(8_000)
  expect(pdf.length).toBeLessThan(2_000_000)

  const { text, pageCount } = readPdf(pdf)
  expect(pageCount).toBeGreaterThanOrEqual(2)
  // The PDF writes "46.6 %" where the screen shows "46.6%".
  const spaced = (percent: string) => percent.replace('%', ' %')
  const expected = [
    `${demoClub.name}: forward/backward audit`,
    `as of ${asOf}`,
    `Front-lag: ${spaced(figures.frontLag)}`,
    `Back-lag: ${spaced(figures.backLag)}`,
    `Balance ratio (forward / backward): ${figures.ratio}`,
    `Catalogue gaps: ${figures.catalogueGaps} · athletes with gaps: ${figures.athletesWithGaps} · readiness alerts: ${figures.readinessAlerts}`,
    // the demo's published quarters and this audit make a trend: the chart is drawn
    'Trend across the audits of this scope',
    'Front-lag (%)',
    ...squadNames.map((name) => `${name}: front-lag`),
    `1. ${firstGapAthlete}:`,
    safetyCaution,
  ]
  expect(expected.filter((line) => !text.includes(line))).toEqual([])

  // For people to look at, where poppler is installed (it is not needed for the checks above).
  if (spawnSync('pdftoppm', ['-v']).status === 0) {
    const rendered = spawnSync('pdftoppm', [
      '-png',
      '-r',
      '80',
      '-f',
      '1',
      '-l',
      '1',
      '-singlefile',
      `${screenshotDir}/audit-export.pdf`,
      `${screenshotDir}/audit-export-page1`,
    ])
    expect(rendered.status).toBe(0)
  }
})

test('the gap list and the headline figures download as CSV with a header and the figures shown', async ({
  page,
}) => {
  await openReport(page)
  const gaps = await gapCount(page)
  const firstGap = await gapRows(page).first().locator('td').allInnerTexts()
  const frontLag = await figureValue(page, 'front-lag')
  const squadLags = await reportCard(page, 'Squads')
    .locator('tbody tr')
    .evaluateAll((rows) =>
      rows.map((row) => [...row.querySelectorAll('td')].map((td) => td.textContent!.trim())),
    )
  const athletes = Number(
    (await page.locator('.audit-report .meta').first().innerText()).match(/^(\d+) athletes?/)![1],
  )

  const [gapsDownload] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Gaps CSV' }).click(),
  ])
  const gapsCsv = Papa.parse<Record<string, string>>(
    (
      await downloaded(gapsDownload, new RegExp(`^gaps-${clubSlug}-\\d{4}-\\d{2}-\\d{2}\\.csv$`))
    ).toString('utf8'),
    { header: true, skipEmptyLines: true },
  )
  expect(gapsCsv.errors).toEqual([])
  expect(gapsCsv.meta.fields).toEqual([
    'rank',
    'athlete',
    'squad',
    'backwardElement',
    'backwardStep',
    'forwardElement',
    'forwardStep',
    'deficitSteps',
    'weightedDeficit',
  ])
  // Every gap, not the page on screen; the first is the one ranked first on screen. The gaps
  // waiting for the catalogue are ranked after the athletes' own, which the title counts.
  const waiting = (row: Record<string, string>) => row.forwardElement === '(not in the catalogue)'
  expect(gapsCsv.data.filter((row) => !waiting(row))).toHaveLength(gaps)
  expect(gapsCsv.data.findIndex(waiting)).not.toBeLessThan(gaps)
  const [first] = gapsCsv.data
  expect(first!.rank).toBe('1')
  expect(first!.athlete).toBe(firstGap[1])
  expect(isDemoAthleteName(first!.athlete!)).toBe(true)
  expect(squadNames).toContain(first!.squad)
  expect(firstGap[3]).toContain(first!.backwardElement)
  expect(Number(first!.deficitSteps)).toBeGreaterThanOrEqual(1)
  expect(Number(first!.weightedDeficit)).toBeGreaterThanOrEqual(Number(first!.deficitSteps))

  const [headlineDownload] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Headline CSV' }).click(),
  ])
  const headline = Papa.parse<string[]>(
    (
      await downloaded(
        headlineDownload,
        new RegExp(`^headline-${clubSlug}-\\d{4}-\\d{2}-\\d{2}\\.csv$`),
      )
    ).toString('utf8'),
    { skipEmptyLines: true },
  )
  expect(headline.errors).toEqual([])
  expect(headline.data[0]).toEqual(['figure', 'value', 'unit', 'changeSincePrevious', 'changeUnit'])
  const value = (figure: string) => headline.data.find((row) => row[0] === figure)?.[1]
  expect(Number(value('athletes'))).toBe(athletes)
  // The CSV holds the percentages the screen shows, rounded the same way, with their unit.
  const percent = (shown: string) => Number(shown.replace('%', ''))
  const unit = (figure: string) => headline.data.find((row) => row[0] === figure)?.[2]
  expect(Number(value('front-lag'))).toBe(percent(frontLag))
  expect(unit('front-lag')).toBe('%')
  expect(squadLags.map(([name]) => name).sort()).toEqual([...squadNames].sort())
  for (const [squad, , squadFrontLag] of squadLags) {
    expect(Number(value(`front-lag ${squad}`))).toBe(percent(squadFrontLag!))
  }
})

test('the board downloads the balance chart as a PNG the size of the chart, on white, with the front-lag line', async ({
  page,
}) => {
  await signIn(page, 'board@demo.example')
  await mainNav(page).getByRole('link', { name: 'Board summary' }).click()
  const panel = reportCard(page, 'Balance over time')
  const canvas = panel.locator('canvas')
  await expect(canvas).toBeVisible()
  const drawn = await canvas.evaluate((c: HTMLCanvasElement) => ({
    width: c.width,
    height: c.height,
  }))

  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.locator('[data-test="download-chart"]').click(),
  ])
  const slug = demoClub.name.replace(/[^\p{L}\p{N}]+/gu, '-')
  const png = await downloaded(download, new RegExp(`^${slug}-balance-\\d{4}-\\d{2}-\\d{2}\\.png$`))
  writeFileSync(`${screenshotDir}/board-chart.png`, png)
  const size = pngSize(png)
  expect(size).toEqual(drawn)
  expect(size.width).toBeGreaterThan(400)
  expect(size.height).toBeGreaterThanOrEqual(300)

  // Decoded by the browser: an opaque white background (a transparent PNG shows black in some
  // viewers) and the front-lag line in its colour.
  const pixels = await page.evaluate(
    async (dataUrl) => {
      const image = new Image()
      image.src = dataUrl
      await image.decode()
      const c = document.createElement('canvas')
      c.width = image.width
      c.height = image.height
      const ctx = c.getContext('2d')!
      ctx.drawImage(image, 0, 0)
      const { data } = ctx.getImageData(0, 0, c.width, c.height)
      const near = (i: number, [r, g, b]: number[]) =>
        Math.abs(data[i]! - r!) < 12 &&
        Math.abs(data[i + 1]! - g!) < 12 &&
        Math.abs(data[i + 2]! - b!) < 12
      let lag = 0
      for (let i = 0; i < data.length; i += 4) if (near(i, [0x1d, 0x4e, 0x5f])) lag++
      return { corner: [...data.subarray(0, 4)], lag }
    },
    `data:image/png;base64,${png.toString('base64')}`,
  )
  expect(pixels.corner).toEqual([255, 255, 255, 255])
  expect(pixels.lag).toBeGreaterThan(100)
})
