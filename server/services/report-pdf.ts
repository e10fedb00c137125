import PDFDocument from 'pdfkit'
import { createRequire } from 'node:module'
import type { CatalogueGap, CoverageCell } from '../../shared/domain/audit/types.ts'
import { rotationClassLabels, safetyCaution, twistBandLabels } from '../../shared/domain/element.ts'
import { stepOf } from '../../shared/domain/progress.ts'
import type { AuditReport } from '../../shared/schemas/audits.ts'

const pct = (n: number | null) => (n === null ? 'no data' : `${(n * 100).toFixed(1)} %`)
const ratio = (n: number | null) => (n === null ? '—' : n.toFixed(2))

/** How many gap and readiness rows the PDF lists; the CSV export has them all. */
const listed = 40

/**
 * What the PDF draws: the report cut down to the rows it lists, so that handing it to the
 * drawing thread copies kilobytes, not a large club's megabytes.
 */
export interface ReportPdfInput {
  report: AuditReport
  clubName: string
  gapTotal: number
}

export function reportPdfInput(report: AuditReport, clubName: string): ReportPdfInput {
  // The athletes' gaps only: those waiting for a forward element in the catalogue are listed by
  // element in their own section (the result's catalogueGaps), not athlete by athlete.
  const athleteGaps = report.result.gaps.filter((g) => !g.counterpartMissing)
  const gaps = athleteGaps.slice(0, listed)
  const readiness = report.result.readiness.filter((r) => r.missingCount > 0).slice(0, listed)
  const named = new Set([...gaps.map((g) => g.athleteId), ...readiness.map((r) => r.athleteId)])
  return {
    clubName,
    gapTotal: athleteGaps.length,
    report: {
      ...report,
      result: { ...report.result, gaps, readiness },
      athleteNames: Object.fromEntries(
        Object.entries(report.athleteNames).filter(([id]) => named.has(id)),
      ),
    },
  }
}

/** Backward elements with no forward element in the catalogue: the director's to add. */
function catalogueGapSection(doc: PDFKit.PDFDocument, gaps: readonly CatalogueGap[]) {
  doc.font('bold').fontSize(12).text(`Catalogue gaps (${gaps.length})`)
  doc.font('regular').fontSize(9)
  if (gaps.length === 0)
    doc.text('Every backward element has its forward element in the catalogue.')
  else
    doc.text('Backward elements with no forward element in the catalogue, for the director to add:')
  for (const g of gaps) {
    const athletes =
      g.athleteCount === undefined
        ? ''
        : ` · ${g.athleteCount} ${g.athleteCount === 1 ? 'athlete' : 'athletes'} working it`
    doc.text(`${g.elementName}${athletes}`)
  }
}

// createRequire resolves the same way on the request thread and on the drawing thread.
const resolve = createRequire(import.meta.url).resolve
const font = (weight: 400 | 600) =>
  resolve(`@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-${weight}-normal.woff`)

const forwardColour = '#2f7d6d'
const backwardColour = '#b5622d'

/** The coverage chart drawn in the PDF itself: forward beside backward for each cell. */
/**
 * The coverage chart as on screen: per cell, forward beside backward, the mean best proficiency
 * on a 0–100 % scale. Cells without any element in either direction are left out.
 */
function coverageChart(doc: PDFKit.PDFDocument, cells: CoverageCell[]) {
  const shown = cells.filter((c) => c.forward.elementCount + c.backward.elementCount > 0)
  const axis = 24
  const left = doc.page.margins.left + axis
  const width = doc.page.width - left - doc.page.margins.right
  const barArea = 120
  const top = doc.y + 10
  const slot = width / Math.max(1, shown.length)
  doc.save()
  doc.fillColor('#555').fontSize(6.5)
  for (const tick of [0, 50, 100]) {
    const y = top + barArea - (tick / 100) * barArea
    doc.text(`${tick}%`, doc.page.margins.left, y - 3, { width: axis - 4, align: 'right' })
    doc
      .moveTo(left, y)
      .lineTo(left + width, y)
      .strokeColor(tick === 0 ? '#888' : '#ddd')
      .stroke()
  }
  shown.forEach((cell, i) => {
    const x = left + i * slot + slot * 0.15
    const w = slot * 0.33
    const f = cell.forward.mean * barArea
    const b = cell.backward.mean * barArea
    doc.rect(x, top + barArea - f, w, f).fill(forwardColour)
    doc.rect(x + w, top + barArea - b, w, b).fill(backwardColour)
    doc
      .fillColor('#333')
      .fontSize(6.5)
      .text(
        `${rotationClassLabels[cell.rotationClass]}\n${twistBandLabels[cell.twistBand]}`,
        left + i * slot,
        top + barArea + 3,
        { width: slot, align: 'center' },
      )
  })
  doc.restore()
  doc.y = top + barArea + 34
  doc.x = doc.page.margins.left
  const legendY = doc.y
  doc.rect(left, legendY + 1, 7, 7).fill(forwardColour)
  doc.rect(left + 70, legendY + 1, 7, 7).fill(backwardColour)
  doc
    .fillColor('#333')
    .fontSize(8)
    .text('Forward', left + 10, legendY)
  doc.text('Backward', left + 80, legendY)
  doc.text('Mean best proficiency in each rotation class · twist band', left + 160, legendY)
  doc.x = doc.page.margins.left
  doc.fillColor('#000')
}

/**
 * The trend across the audits of the report's scope, as on screen: the front-lag (solid, left
 * scale in %) and the balance ratio (dashed, right scale, 1.00 is balanced) at each as-of date.
 */
function trendChart(doc: PDFKit.PDFDocument, trend: AuditReport['trend']) {
  const margin = doc.page.margins.left
  const left = margin + 28
  const width = doc.page.width - left - doc.page.margins.right - 28
  const height = 110
  const top = doc.y + 10
  const ratioTop = Math.max(1.2, ...trend.map((p) => p.balanceRatio ?? 0))
  const x = (i: number) =>
    left + (trend.length === 1 ? width / 2 : (i / (trend.length - 1)) * width)
  const yLag = (lag: number) => top + height - lag * height
  const yRatio = (r: number) => top + height - (r / ratioTop) * height
  doc.save()
  doc.fontSize(6.5).fillColor('#555')
  for (const tick of [0, 0.5, 1]) {
    doc
      .moveTo(left, yLag(tick))
      .lineTo(left + width, yLag(tick))
      .strokeColor(tick === 0 ? '#888' : '#ddd')
      .stroke()
    doc.text(`${tick * 100}%`, margin, yLag(tick) - 3, { width: 24, align: 'right' })
    doc.text((tick * ratioTop).toFixed(2), left + width + 4, yLag(tick) - 3, { width: 24 })
  }
  // Every date when they fit, else about eight of them.
  const every = Math.max(1, Math.ceil(trend.length / 8))
  trend.forEach((p, i) => {
    if (i % every !== 0 && i !== trend.length - 1) return
    // the end labels keep inside the plot, clear of the scales' labels
    const first = i === 0 && trend.length > 1
    const last = i === trend.length - 1 && trend.length > 1
    const at = first ? x(i) : last ? x(i) - 50 : x(i) - 25
    doc.text(p.asOf, at, top + height + 5, {
      width: 50,
      align: first ? 'left' : last ? 'right' : 'center',
    })
  })
  const line = (points: [number, number][], dash: boolean) => {
    if (points.length === 0) return
    doc.moveTo(...points[0]!)
    for (const point of points.slice(1)) doc.lineTo(...point)
    if (dash) doc.dash(3, { space: 2 })
    doc
      .lineWidth(1.5)
      .strokeColor(dash ? forwardColour : '#1d4e5f')
      .stroke()
    doc.undash().lineWidth(1)
    for (const point of points)
      doc.circle(point[0], point[1], 1.8).fill(dash ? forwardColour : '#1d4e5f')
  }
  line(
    trend.flatMap((p, i) => (p.clubFrontLag === null ? [] : [[x(i), yLag(p.clubFrontLag)]])) as [
      number,
      number,
    ][],
    false,
  )
  line(
    trend.flatMap((p, i) => (p.balanceRatio === null ? [] : [[x(i), yRatio(p.balanceRatio)]])) as [
      number,
      number,
    ][],
    true,
  )
  doc.restore()
  doc.y = top + height + 18
  const legendY = doc.y
  doc.rect(left, legendY + 3, 12, 1.5).fill('#1d4e5f')
  doc.rect(left + 90, legendY + 3, 12, 1.5).fill(forwardColour)
  doc
    .fillColor('#333')
    .fontSize(8)
    .text('Front-lag (%)', left + 16, legendY)
  doc.text('Balance ratio (forward ÷ backward, right scale)', left + 106, legendY)
  doc.x = margin
  doc.fillColor('#000')
}

/**
 * The report as a PDF: headline figures with their change, the coverage and trend charts,
 * squads, gaps, readiness.
 */
export function reportPdf({ report, clubName, gapTotal }: ReportPdfInput): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({
      size: 'A4',
      margin: 48,
      info: { Title: `Twofold audit ${report.audit.asOf}` },
    })
    const chunks: Buffer[] = []
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
    doc.registerFont('regular', font(400))
    doc.registerFont('bold', font(600))

    const h = report.result.headline
    const c = report.comparison
    const change = (n: number | null, asPct = true) => {
      if (n === null) return ''
      const shown = asPct ? `${Math.abs(n * 100).toFixed(1)} pts` : Math.abs(n).toFixed(2)
      // as on screen: a change that rounds to nothing is no change
      if (!/[1-9]/.test(shown)) return ' (unchanged)'
      return ` (${n > 0 ? '+' : '−'}${shown})`
    }
    doc.font('bold').fontSize(18).text(`${clubName}: forward/backward audit`)
    doc.font('regular').fontSize(10).fillColor('#555')
    doc.text(
      `${report.audit.scopeName} · as of ${report.audit.asOf} · inputs hash ${report.audit.inputHash.slice(0, 16)}…`,
    )
    doc.fillColor('#000').moveDown()
    doc.font('bold').fontSize(12).text('Headline figures')
    doc.font('regular').fontSize(10)
    doc.text(`Front-lag: ${pct(h.clubFrontLag)}${change(c.clubFrontLag.change)}`)
    doc.text(`Back-lag: ${pct(h.clubBackLag)}${change(c.clubBackLag.change)}`)
    doc.text(
      `Balance ratio (forward / backward): ${ratio(h.balanceRatio)}${change(c.balanceRatio.change, false)}`,
    )
    doc.text(
      `Catalogue gaps: ${h.catalogueGaps} · athletes with gaps: ${h.athletesWithGaps} · readiness alerts: ${h.readinessAlerts}`,
    )
    doc.moveDown()
    doc.font('bold').fontSize(12).text('Coverage: mean best proficiency by rotation and twist')
    coverageChart(doc, report.result.coverage)
    doc.moveDown()
    doc.font('bold').fontSize(12).text('Trend across the audits of this scope')
    doc.font('regular').fontSize(10)
    if (report.trend.length < 2) doc.text('The first audit of this scope: no trend yet.')
    else trendChart(doc, report.trend)
    doc.moveDown()
    doc.font('bold').fontSize(12).text('Squads')
    doc.font('regular').fontSize(10)
    const squadName = (id: string) => report.squadNames[id] ?? 'Squad'
    const squads = [...report.result.squads].sort((a, b) =>
      squadName(a.squadId).localeCompare(squadName(b.squadId)),
    )
    for (const s of squads) {
      doc.text(
        `${squadName(s.squadId)}: front-lag ${pct(s.frontLag)}, balance ${ratio(s.balanceRatio)}, ${s.athletesWithGaps} of ${s.athleteCount} athletes with gaps`,
      )
    }
    doc.moveDown()
    doc.font('bold').fontSize(12).text('Largest gaps')
    doc.font('regular').fontSize(9)
    for (const [i, g] of report.result.gaps.slice(0, listed).entries()) {
      const forward = g.counterpartName
        ? `${g.counterpartName} ${g.counterpartStepIndex === null ? 'not started' : stepOf(g.counterpartStepIndex, g.counterpartStepCount)}`
        : 'no forward element in the catalogue'
      doc.text(
        `${i + 1}. ${report.athleteNames[g.athleteId] ?? ''}: ${g.elementName} ${stepOf(g.stepIndex, g.stepCount)} · ${forward} · ${g.deficitSteps} steps`,
      )
    }
    if (gapTotal === 0) doc.text('No gaps: every forward element keeps up.')
    if (gapTotal > listed) doc.text(`… and ${gapTotal - listed} more in the CSV export.`)
    doc.moveDown()
    catalogueGapSection(doc, report.result.catalogueGaps)
    doc.moveDown()
    doc.font('bold').fontSize(12).text('Readiness for the next age category')
    doc.font('regular').fontSize(9)
    for (const r of report.result.readiness.filter((x) => x.missingCount > 0).slice(0, listed)) {
      const missing = r.requirements
        .filter((q) => !q.met)
        .map((q) => `${q.label}${q.forecastOn ? ` (forecast ${q.forecastOn})` : ' (no forecast)'}`)
      doc.text(
        `${report.athleteNames[r.athleteId] ?? ''}: ${r.to} from ${r.startsOn}; missing ${missing.join('; ')}`,
      )
    }
    doc.moveDown()
    doc.fontSize(8).fillColor('#555').text(safetyCaution)
    doc.end()
  })
}
