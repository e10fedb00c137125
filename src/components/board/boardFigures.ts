import type { BoardSummary } from '@shared/schemas/audits'
import { reportFigures, type HeadlineFigure } from '@/components/audit/auditFormat'

/**
 * The latest published audit's headline figures, each with the change the server computed for
 * it: the same comparison as the director's report shows for that audit (with the latest
 * published audit of an earlier date).
 */
export function boardFigures(summary: BoardSummary): HeadlineFigure[] {
  const latest = summary.latest
  if (!latest) return []
  return reportFigures(latest, latest.comparison)
}

/**
 * The title drawn on the saved chart image, so that it still says what it shows once pasted into
 * slides or minutes: what the chart is, the club, and the date of the latest audit in it.
 */
export function chartImageTitle(clubName: string, asOf: string): string[] {
  return ['Forward/backward balance over time', `${clubName} · audit as of ${asOf}`]
}
