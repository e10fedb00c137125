// The form an audit result is stored in (audits.result): the gaps packed as tuples.

import type { AuditResult, GapEntry } from '../../shared/domain/audit/types.ts'
import type { RotationClass } from '../../shared/domain/element.ts'

/** What every gap on one backward element shares, stored once per element. */
export interface StoredGapElement {
  id: string
  name: string
  rotationClass: RotationClass
  counterpartId: string | null
  counterpartName: string | null
  /** Absent from results computed before gaps carried their progressions' lengths. */
  stepCount?: number
  counterpartStepCount?: number | null
}

/**
 * One gap as stored: the athlete's position in the result's `athletes`, the element's position
 * in `gapElements`, then the figures that differ from gap to gap.
 */
export type StoredGap = [
  athlete: number,
  element: number,
  stepIndex: number,
  counterpartStepIndex: number | null,
  deficitSteps: number,
]

/**
 * The form an audit result is stored in. A large club's gap list runs to tens of thousands of
 * entries that mostly repeat what the athletes, the element and the options already say; here
 * each gap keeps only its own figures, in rank order, and the rest is derived again on reading.
 */
export interface StoredAuditResult extends Omit<AuditResult, 'gaps'> {
  /** Tells the stored form from a full result written before it existed (which has no format). */
  format: 2
  gaps: StoredGap[]
  gapElements: StoredGapElement[]
}

/**
 * The stored form of a result (see {@link StoredAuditResult}); {@link unpackAuditResult} gives
 * back a result equal to this one, gaps in the same order.
 *
 * @throws RangeError when a gap holds anything the stored form would not give back: an athlete
 * not in the result's athletes, or a field that differs from what runAudit derives it from.
 */
export function packAuditResult(result: AuditResult): StoredAuditResult {
  const athleteAt = new Map(result.athletes.map((a, i) => [a.athleteId, i]))
  const weights = result.options.rotationWeights
  const gapElements: StoredGapElement[] = []
  const elementAt = new Map<string, number>()
  const gaps = result.gaps.map((g): StoredGap => {
    const athlete = athleteAt.get(g.athleteId)
    let element = elementAt.get(g.elementId)
    if (element === undefined) {
      element = gapElements.length
      elementAt.set(g.elementId, element)
      gapElements.push({
        id: g.elementId,
        name: g.elementName,
        rotationClass: g.rotationClass,
        counterpartId: g.counterpartId,
        counterpartName: g.counterpartName,
        ...(g.stepCount === undefined ? {} : { stepCount: g.stepCount }),
        ...(g.counterpartStepCount === undefined
          ? {}
          : { counterpartStepCount: g.counterpartStepCount }),
      })
    }
    // Checked here, once per audit, so that a stored result can never read back differently
    // from the one computed.
    const shared = gapElements[element]!
    const derivable =
      athlete !== undefined &&
      result.athletes[athlete]!.squadId === g.squadId &&
      shared.name === g.elementName &&
      shared.rotationClass === g.rotationClass &&
      shared.counterpartId === g.counterpartId &&
      shared.counterpartName === g.counterpartName &&
      shared.stepCount === g.stepCount &&
      shared.counterpartStepCount === g.counterpartStepCount &&
      weights[g.rotationClass] === g.weight &&
      g.deficitSteps * g.weight === g.weightedDeficit &&
      g.counterpartMissing === (g.counterpartName === null) &&
      g.counterpartNeverStarted === (!g.counterpartMissing && g.counterpartStepIndex === null)
    if (!derivable) {
      throw new RangeError(
        `The gap of ${g.athleteId} on ${g.elementId} cannot be stored compactly.`,
      )
    }
    return [athlete, element, g.stepIndex, g.counterpartStepIndex, g.deficitSteps]
  })
  // Spreading first keeps `gaps` where it was among the keys, so the unpacked result serialises
  // to the same text as the original.
  return { format: 2, ...result, gaps, gapElements }
}

/**
 * The full result from its stored form. A result stored whole, before the compact form existed,
 * is returned as it is.
 *
 * @throws RangeError on a stored form of a format this code does not know.
 */
export function unpackAuditResult(stored: StoredAuditResult | AuditResult): AuditResult {
  if (!('format' in stored)) return stored
  if (stored.format !== 2) {
    throw new RangeError(`Unknown stored audit format ${String(stored.format)}.`)
  }
  const { format: _format, gapElements, ...rest } = stored
  const weights = stored.options.rotationWeights
  const unpacked = stored.gaps.map(
    ([a, e, stepIndex, counterpartStepIndex, deficitSteps]): GapEntry => {
      const athlete = stored.athletes[a]!
      const element = gapElements[e]!
      const weight = weights[element.rotationClass]
      // runAudit names the counterpart exactly when it found it in the catalogue, and every
      // catalogue element has a name (a string, never null), so a null name means missing.
      const counterpartMissing = element.counterpartName === null
      // Keys in runAudit's order, so that the API answers with the same text as before.
      return {
        athleteId: athlete.athleteId,
        squadId: athlete.squadId,
        elementId: element.id,
        elementName: element.name,
        rotationClass: element.rotationClass,
        counterpartId: element.counterpartId,
        counterpartName: element.counterpartName,
        stepIndex,
        counterpartStepIndex,
        deficitSteps,
        weight,
        // The same multiplication as runAudit's, so the same float.
        weightedDeficit: deficitSteps * weight,
        counterpartMissing,
        counterpartNeverStarted: !counterpartMissing && counterpartStepIndex === null,
        ...(element.stepCount === undefined ? {} : { stepCount: element.stepCount }),
        ...(element.counterpartStepCount === undefined
          ? {}
          : { counterpartStepCount: element.counterpartStepCount }),
      }
    },
  )
  // `rest` still has `gaps` in its original place, and assigning it keeps that place.
  return { ...rest, gaps: unpacked }
}
