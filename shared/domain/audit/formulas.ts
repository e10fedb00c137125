// The audit's formulas, each on its own: proficiency, lags, balance, gap deficit, forecast.

import type { AuditElement, CatalogueGap } from './types.ts'
import { addDays } from '../progress.ts'

/**
 * Proficiency p(a,e) = (index of the highest step reached + 1) / number of steps, 0 with no
 * step. A step index beyond the progression counts as its last step, so p never exceeds 1.
 */
export function proficiency(stepIndex: number | null, stepCount: number): number {
  if (stepIndex === null || stepIndex < 0 || stepCount <= 0) return 0
  return Math.min(stepIndex + 1, stepCount) / stepCount
}

/**
 * A lag from its two sums: 1 − mirrored / total, where mirrored is Σ min(p(a,e), p(a,c(e))) and
 * total is Σ p(a,e) over the elements of one direction. 0 when there is no progress in that
 * direction, since there is nothing for the other direction to lag behind. Summing over several
 * athletes before dividing gives the mass-weighted squad lag.
 */
export function lagFrom(mirrored: number, total: number): number {
  return total > 0 ? 1 - mirrored / total : 0
}

/**
 * Σ forward proficiency / Σ backward proficiency; null when there is no backward proficiency,
 * where the ratio has no finite value (and no backward program to keep up with).
 */
export function balanceRatio(forward: number, backward: number): number | null {
  return backward > 0 ? forward / backward : null
}

/**
 * How many steps the counterpart must still climb to match the element's proficiency, counted
 * in the counterpart's own steps. With equal step counts this is the difference of step indices;
 * with different counts it compares like with like (competition-ready on both sides is no gap,
 * even when one progression is longer). A counterpart never started sits one below its first
 * step; one missing from the catalogue is measured as if it had the element's own progression.
 */
export function gapDeficit(
  element: { stepIndex: number; stepCount: number },
  counterpart: { stepIndex: number | null; stepCount: number } | null,
): number {
  const reached = Math.min(element.stepIndex + 1, element.stepCount)
  if (counterpart === null) return reached
  // Integer arithmetic until the one division, so equal fractions never land a hair above an
  // integer and round up a step.
  const target = Math.ceil((reached * counterpart.stepCount) / element.stepCount) - 1
  return target - (counterpart.stepIndex ?? -1)
}

/**
 * When `stepsNeeded` more steps would be climbed at `pace` steps per 30 days, counted from
 * `asOf` and rounded up to a whole day; null when the pace is not positive.
 */
export function forecastDate(asOf: string, stepsNeeded: number, pace: number): string | null {
  if (stepsNeeded <= 0) return asOf
  if (!(pace > 0) || !Number.isFinite(pace)) return null
  // The small tolerance keeps a float such as 60.00000000000001 from adding a day.
  return addDays(asOf, Math.ceil((stepsNeeded / pace) * 30 - 1e-9))
}

/** Backward elements whose counterpart is not in the catalogue: gaps in the catalogue itself. */
export function findCatalogueGaps(elements: readonly AuditElement[]): CatalogueGap[] {
  const ids = new Set(elements.map((e) => e.id))
  return elements
    .filter(
      (e) => e.direction === 'backward' && (e.counterpartId === null || !ids.has(e.counterpartId)),
    )
    .map((e) => ({ elementId: e.id, elementName: e.name, counterpartId: e.counterpartId }))
    .sort((a, b) => compareText(a.elementId, b.elementId))
}

/** Compares ids by UTF-16 code units, the order every audit list is sorted in. */
export function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0
}
