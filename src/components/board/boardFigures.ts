import type { FigureChange } from '@shared/domain/audit/comparison'
import type { BoardSummary } from '@shared/schemas/audits'
import { reportFigures, type HeadlineFigure } from '@/components/audit/auditFormat'

const change = (previous: number | null, current: number | null): FigureChange => ({
  previous,
  current,
  change: previous === null || current === null ? null : current - previous,
})

/**
 * The latest published audit's headline figures. The lags and the ratio are compared with the
 * published audit before it (from the trend); the counts have no earlier value in the summary,
 * so they are shown without a change.
 */
export function boardFigures(summary: BoardSummary): HeadlineFigure[] {
  const latest = summary.latest
  if (!latest) return []
  const last = summary.trend.at(-1)
  const before = summary.trend.length > 1 ? summary.trend.at(-2) : undefined
  const backLag = last?.clubBackLag ?? 0
  const figures = reportFigures({ ...latest, clubBackLag: backLag })
  const changes: Record<string, FigureChange | undefined> = before
    ? {
        'front-lag': change(before.clubFrontLag, latest.clubFrontLag),
        'back-lag': change(before.clubBackLag, backLag),
        'balance-ratio': change(before.balanceRatio, latest.balanceRatio),
      }
    : {}
  return figures.map((f) => ({ ...f, change: changes[f.key] }))
}
