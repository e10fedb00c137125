// The quarterly audit: how far each athlete's forward repertoire keeps up with their backward
// one (and the reverse), per squad and for the scope, where the catalogue itself lacks forward
// counterparts, and who is about to change age category without the elements the next category
// asks for. Everything here is pure so that a stored result can be recomputed from its inputs and
// checked against their hash.

import type { Discipline } from './club.ts'
import {
  rotationClasses,
  twistBands,
  type Direction,
  type RotationClass,
  type TwistBand,
} from './element.ts'
import {
  categoryChangesWithin,
  defaultAgeThresholds,
  type AgeCategory,
  type AgeThresholdTable,
} from './age-categories.ts'
import { addDays } from './progress.ts'

export interface AuditElement {
  id: string
  name: string
  direction: Direction
  rotationClass: RotationClass
  twistBand: TwistBand
  /** The element of opposite direction with the same rotations, twists and shape, if known. */
  counterpartId: string | null
  /** Number of steps in the element's progression; the last one means competition-ready. */
  stepCount: number
}

export interface AuditAthlete {
  id: string
  squadId: string
  birthYear: number
  discipline: Discipline
}

export interface AuditRecord {
  athleteId: string
  elementId: string
  /** Highest step index reached (0-based); null when never started. */
  stepIndex: number | null
}

export interface RequirementMatch {
  /** One direction, or any of several (the floor code groups forward with sideward saltos). */
  direction?: Direction | readonly Direction[]
  minRotationClass?: RotationClass
  minTwistBand?: TwistBand
}

export interface Requirement {
  id: string
  label: string
  source: string
  matches: RequirementMatch
  /** The step an element must reach to meet the requirement. */
  minStepIndex: number | 'competition-ready'
}

export interface RequirementProfile {
  id: string
  label: string
  discipline: Discipline
  /** The categories the profile applies to, i.e. for athletes about to enter one of them. */
  categories: readonly AgeCategory[]
  source: string
  /** Listed in the order they are shown. */
  requirements: readonly Requirement[]
}

const wagFloorSource =
  "FIG Women's Artistic Gymnastics Code of Points 2022–2024, Section 13 Floor Exercise, Composition Requirements"

/**
 * Seeded from the published floor composition requirements. The dance passage (the first
 * requirement) is not an acrobatic element and is not in the catalogue, so it is left out.
 * Juniors compete under the same Code (from memory), so the profile serves both categories.
 */
export const womensArtisticFloorProfile: RequirementProfile = {
  id: 'fig-wag-floor-2022',
  label: "Women's artistic floor: acrobatic composition requirements",
  discipline: 'artistic-women',
  categories: ['junior', 'senior'],
  source: wagFloorSource,
  requirements: [
    {
      id: 'salto-full-twist',
      label: 'A salto with at least a full twist (360°)',
      source: wagFloorSource,
      matches: { minRotationClass: 'single', minTwistBand: 'full' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'double-salto',
      label: 'A double salto',
      source: wagFloorSource,
      matches: { minRotationClass: 'double' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'salto-forward-sideward',
      label: 'A salto forward or sideward',
      source: wagFloorSource,
      matches: { direction: ['forward', 'sideward'], minRotationClass: 'single' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'salto-backward',
      label: 'A salto backward',
      source: wagFloorSource,
      matches: { direction: 'backward', minRotationClass: 'single' },
      minStepIndex: 'competition-ready',
    },
  ],
}

export const defaultRequirementProfiles: readonly RequirementProfile[] = [
  womensArtisticFloorProfile,
]

export interface AuditInputs {
  /** ISO date the audit describes. */
  asOf: string
  elements: readonly AuditElement[]
  /** Every athlete in the audit's scope (a club or one squad). */
  athletes: readonly AuditAthlete[]
  records: readonly AuditRecord[]
  /** Recent pace by athlete id, in steps per 30 days (see `athletePace`); missing counts as 0. */
  paces?: Readonly<Record<string, number>>
  /** The club's requirement profiles; the seeded ones when absent. */
  profiles?: readonly RequirementProfile[]
  /** The club's age thresholds; the seeded ones when absent. */
  ageThresholds?: AgeThresholdTable
}

/**
 * Weights on a gap's deficit by the backward element's rotation class: a missing forward double
 * costs a routine more than a missing forward single. Common practice (no published source).
 */
export const defaultRotationWeights: Readonly<Record<RotationClass, number>> = {
  none: 0.5,
  single: 1,
  double: 2,
  triple: 3,
}

export interface AuditOptions {
  /** Counterpart steps behind at which a pair becomes a gap; 2 by default. */
  gapThresholdSteps?: number
  rotationWeights?: Readonly<Record<RotationClass, number>>
  /** How far ahead to look for age-category changes; 12 months by default. */
  horizonMonths?: number
}

export type ResolvedAuditOptions = Required<AuditOptions>

export interface AuditProgress {
  phase: 'records' | 'athletes' | 'gaps' | 'readiness' | 'done'
  done: number
  total: number
}

export interface AthleteBalance {
  athleteId: string
  squadId: string
  frontLag: number
  backLag: number
  forwardProficiency: number
  backwardProficiency: number
}

export interface SquadBreakdown {
  squadId: string
  athleteCount: number
  frontLag: number
  backLag: number
  forwardProficiency: number
  backwardProficiency: number
  balanceRatio: number | null
  gapCount: number
  athletesWithGaps: number
  readinessAlerts: number
}

export interface CoverageSide {
  /** Mean over every athlete in scope of their best proficiency in the cell (0 for none). */
  mean: number
  /** Catalogue elements in the cell for this direction; 0 explains a mean of 0. */
  elementCount: number
}

export interface CoverageCell {
  rotationClass: RotationClass
  twistBand: TwistBand
  forward: CoverageSide
  backward: CoverageSide
}

export interface GapEntry {
  athleteId: string
  squadId: string
  elementId: string
  elementName: string
  rotationClass: RotationClass
  counterpartId: string | null
  counterpartName: string | null
  stepIndex: number
  counterpartStepIndex: number | null
  /** Counterpart steps still to climb (see {@link gapDeficit}). */
  deficitSteps: number
  weight: number
  weightedDeficit: number
  /** The counterpart is not in the catalogue: a catalogue gap as well as the athlete's. */
  counterpartMissing: boolean
  counterpartNeverStarted: boolean
}

export interface CatalogueGap {
  elementId: string
  elementName: string
  counterpartId: string | null
}

export interface RequirementStatus {
  requirementId: string
  label: string
  source: string
  met: boolean
  /** The element that meets the requirement, or the nearest one to meeting it. */
  elementId: string | null
  elementName: string | null
  stepIndex: number | null
  targetStepIndex: number | null
  /** Steps still to climb on that element; 0 when met. */
  stepsNeeded: number
  /** When the requirement would be met at the athlete's pace; null when met, stalled or impossible. */
  forecastOn: string | null
  /** Whether the forecast falls on or before the new category starts; null without a forecast. */
  onTime: boolean | null
  /** No catalogue element can meet the requirement. */
  noMatchingElement: boolean
}

export interface ReadinessRow {
  athleteId: string
  squadId: string
  discipline: Discipline
  from: AgeCategory
  to: AgeCategory
  startsOn: string
  pace: number
  /** Null when the club has no profile for the next category. */
  profileId: string | null
  requirements: RequirementStatus[]
  missingCount: number
}

export interface AuditHeadline {
  athleteCount: number
  /** Front-lag over every athlete in scope (the club, or the squad for a squad audit). */
  clubFrontLag: number
  clubBackLag: number
  balanceRatio: number | null
  squadFrontLags: Record<string, number>
  catalogueGaps: number
  gapCount: number
  athletesWithGaps: number
  /** Athletes changing category within the horizon with at least one requirement unmet. */
  readinessAlerts: number
}

export interface AuditResult {
  asOf: string
  options: ResolvedAuditOptions
  headline: AuditHeadline
  athletes: AthleteBalance[]
  squads: SquadBreakdown[]
  coverage: CoverageCell[]
  catalogueGaps: CatalogueGap[]
  gaps: GapEntry[]
  readiness: ReadinessRow[]
}

/** The part of a result that lists, trends and the board summary read: no athlete in it. */
export type AuditFigures = Pick<AuditResult, 'headline' | 'squads'>

/** The figures of a result. */
export function auditFigures(result: AuditResult): AuditFigures {
  return { headline: result.headline, squads: result.squads }
}

/** What every gap on one backward element shares, stored once per element. */
export interface StoredGapElement {
  id: string
  name: string
  rotationClass: RotationClass
  counterpartId: string | null
  counterpartName: string | null
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
      }
    },
  )
  // `rest` still has `gaps` in its original place, and assigning it keeps that place.
  return { ...rest, gaps: unpacked }
}

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

/** Whether an element can meet a requirement, whatever the athlete's step on it. */
export function elementMatches(element: AuditElement, match: RequirementMatch): boolean {
  if (match.direction !== undefined) {
    const allowed: readonly Direction[] =
      typeof match.direction === 'string' ? [match.direction] : match.direction
    if (!allowed.includes(element.direction)) return false
  }
  if (
    match.minRotationClass !== undefined &&
    rotationClasses.indexOf(element.rotationClass) < rotationClasses.indexOf(match.minRotationClass)
  ) {
    return false
  }
  if (
    match.minTwistBand !== undefined &&
    twistBands.indexOf(element.twistBand) < twistBands.indexOf(match.minTwistBand)
  ) {
    return false
  }
  return true
}

/** Resolves the defaults, so that a stored result names every option it was computed with. */
export function resolveAuditOptions(options: AuditOptions = {}): ResolvedAuditOptions {
  return {
    gapThresholdSteps: options.gapThresholdSteps ?? 2,
    rotationWeights: options.rotationWeights ?? defaultRotationWeights,
    horizonMonths: options.horizonMonths ?? 12,
  }
}

function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0
}

interface SideSums {
  forward: number
  backward: number
  forwardMirrored: number
  backwardMirrored: number
}

const emptySums = (): SideSums => ({
  forward: 0,
  backward: 0,
  forwardMirrored: 0,
  backwardMirrored: 0,
})

function addSums(into: SideSums, from: SideSums) {
  into.forward += from.forward
  into.backward += from.backward
  into.forwardMirrored += from.forwardMirrored
  into.backwardMirrored += from.backwardMirrored
}

/**
 * Runs the audit. Athletes, elements and records are indexed once, then each athlete is visited
 * through their own records only, so the cost grows with the number of records (plus elements ×
 * requirements for readiness), never with athletes × elements.
 *
 * Only backward and forward elements enter the lags, the balance ratio and the coverage grid;
 * sideward ones count only towards requirements that ask for them. Records of athletes or
 * elements outside the inputs are ignored; several records of one pair count as the highest.
 * Results are sorted by id (gaps by rank), so they do not depend on the order of the inputs.
 *
 * @throws RangeError when two elements or two athletes share an id.
 */
export function runAudit(
  inputs: AuditInputs,
  options: AuditOptions = {},
  onProgress?: (progress: AuditProgress) => void,
): AuditResult {
  const resolved = resolveAuditOptions(options)
  const { asOf } = inputs
  const profiles = inputs.profiles ?? defaultRequirementProfiles
  const thresholds = inputs.ageThresholds ?? defaultAgeThresholds
  const elements = [...inputs.elements].sort((a, b) => compareText(a.id, b.id))
  const athletes = [...inputs.athletes].sort((a, b) => compareText(a.id, b.id))

  const elementAt = new Map<string, number>()
  elements.forEach((e, i) => {
    if (elementAt.has(e.id)) throw new RangeError(`Two elements share the id ${e.id}.`)
    elementAt.set(e.id, i)
  })
  const athleteAt = new Map<string, number>()
  athletes.forEach((a, i) => {
    if (athleteAt.has(a.id)) throw new RangeError(`Two athletes share the id ${a.id}.`)
    athleteAt.set(a.id, i)
  })
  const counterpartAt = elements.map((e) =>
    e.counterpartId === null ? -1 : (elementAt.get(e.counterpartId) ?? -1),
  )
  const cellOf = elements.map(
    (e) =>
      rotationClasses.indexOf(e.rotationClass) * twistBands.length +
      twistBands.indexOf(e.twistBand),
  )
  const cellCount = rotationClasses.length * twistBands.length

  onProgress?.({ phase: 'records', done: 0, total: inputs.records.length })
  const steps: Map<number, number>[] = athletes.map(() => new Map())
  for (const record of inputs.records) {
    if (record.stepIndex === null || record.stepIndex < 0) continue
    const a = athleteAt.get(record.athleteId)
    const e = elementAt.get(record.elementId)
    if (a === undefined || e === undefined) continue
    const byElement = steps[a]!
    const before = byElement.get(e)
    if (before === undefined || record.stepIndex > before) byElement.set(e, record.stepIndex)
  }
  onProgress?.({ phase: 'records', done: inputs.records.length, total: inputs.records.length })

  const weightOf = resolved.rotationWeights
  const athleteRows: AthleteBalance[] = []
  const athleteSums: SideSums[] = []
  const gaps: GapEntry[] = []
  const gapsByAthlete = new Array<number>(athletes.length).fill(0)
  const coverageSums = {
    forward: new Float64Array(cellCount),
    backward: new Float64Array(cellCount),
  }
  const best = { forward: new Float64Array(cellCount), backward: new Float64Array(cellCount) }
  const reportEvery = Math.max(1, Math.ceil(athletes.length / 20))

  athletes.forEach((athlete, a) => {
    const byElement = steps[a]!
    const p = (e: number) => {
      const s = byElement.get(e)
      return s === undefined ? 0 : proficiency(s, elements[e]!.stepCount)
    }
    const sums = emptySums()
    best.forward.fill(0)
    best.backward.fill(0)
    for (const [e, stepIndex] of byElement) {
      const element = elements[e]!
      const side = element.direction
      if (side !== 'forward' && side !== 'backward') continue
      const pe = proficiency(stepIndex, element.stepCount)
      const c = counterpartAt[e]!
      const mirrored = Math.min(pe, c === -1 ? 0 : p(c))
      const cell = cellOf[e]!
      if (pe > best[side][cell]!) best[side][cell] = pe
      if (side === 'forward') {
        sums.forward += pe
        sums.forwardMirrored += mirrored
        continue
      }
      sums.backward += pe
      sums.backwardMirrored += mirrored

      const counterpart = c === -1 ? null : elements[c]!
      const counterpartStep = c === -1 ? null : (byElement.get(c) ?? null)
      const deficit = gapDeficit(
        { stepIndex, stepCount: element.stepCount },
        counterpart === null
          ? null
          : { stepIndex: counterpartStep, stepCount: counterpart.stepCount },
      )
      const missing = counterpart === null
      const neverStarted = !missing && counterpartStep === null
      if (missing || neverStarted || deficit >= resolved.gapThresholdSteps) {
        const weight = weightOf[element.rotationClass]
        gaps.push({
          athleteId: athlete.id,
          squadId: athlete.squadId,
          elementId: element.id,
          elementName: element.name,
          rotationClass: element.rotationClass,
          counterpartId: element.counterpartId,
          counterpartName: counterpart?.name ?? null,
          stepIndex,
          counterpartStepIndex: counterpartStep,
          deficitSteps: deficit,
          weight,
          weightedDeficit: deficit * weight,
          counterpartMissing: missing,
          counterpartNeverStarted: neverStarted,
        })
        gapsByAthlete[a]!++
      }
    }
    for (let cell = 0; cell < cellCount; cell++) {
      coverageSums.forward[cell]! += best.forward[cell]!
      coverageSums.backward[cell]! += best.backward[cell]!
    }
    athleteSums.push(sums)
    athleteRows.push({
      athleteId: athlete.id,
      squadId: athlete.squadId,
      frontLag: lagFrom(sums.backwardMirrored, sums.backward),
      backLag: lagFrom(sums.forwardMirrored, sums.forward),
      forwardProficiency: sums.forward,
      backwardProficiency: sums.backward,
    })
    if ((a + 1) % reportEvery === 0 || a + 1 === athletes.length) {
      onProgress?.({ phase: 'athletes', done: a + 1, total: athletes.length })
    }
  })

  onProgress?.({ phase: 'gaps', done: 0, total: gaps.length })
  gaps.sort(
    (x, y) =>
      y.weightedDeficit - x.weightedDeficit ||
      y.deficitSteps - x.deficitSteps ||
      compareText(x.athleteId, y.athleteId) ||
      compareText(x.elementId, y.elementId),
  )
  onProgress?.({ phase: 'gaps', done: gaps.length, total: gaps.length })

  const elementCounts = {
    forward: new Array(cellCount).fill(0),
    backward: new Array(cellCount).fill(0),
  }
  elements.forEach((e, i) => {
    if (e.direction === 'forward' || e.direction === 'backward')
      elementCounts[e.direction][cellOf[i]!]++
  })
  const coverage: CoverageCell[] = []
  for (const [r, rotationClass] of rotationClasses.entries()) {
    for (const [t, twistBand] of twistBands.entries()) {
      const cell = r * twistBands.length + t
      const side = (direction: 'forward' | 'backward'): CoverageSide => ({
        mean: athletes.length === 0 ? 0 : coverageSums[direction][cell]! / athletes.length,
        elementCount: elementCounts[direction][cell] as number,
      })
      coverage.push({
        rotationClass,
        twistBand,
        forward: side('forward'),
        backward: side('backward'),
      })
    }
  }

  const readiness = readinessRows(
    athletes,
    steps,
    elements,
    profiles,
    thresholds,
    inputs.paces ?? {},
    asOf,
    resolved.horizonMonths,
    onProgress,
  )
  const alertAthletes = new Set(readiness.filter((r) => r.missingCount > 0).map((r) => r.athleteId))

  const squadIndex = new Map<string, { sums: SideSums; athletes: number[] }>()
  athletes.forEach((athlete, a) => {
    let squad = squadIndex.get(athlete.squadId)
    if (squad === undefined) {
      squad = { sums: emptySums(), athletes: [] }
      squadIndex.set(athlete.squadId, squad)
    }
    addSums(squad.sums, athleteSums[a]!)
    squad.athletes.push(a)
  })
  const squads: SquadBreakdown[] = [...squadIndex.entries()]
    .sort(([x], [y]) => compareText(x, y))
    .map(([squadId, { sums, athletes: members }]) => ({
      squadId,
      athleteCount: members.length,
      frontLag: lagFrom(sums.backwardMirrored, sums.backward),
      backLag: lagFrom(sums.forwardMirrored, sums.forward),
      forwardProficiency: sums.forward,
      backwardProficiency: sums.backward,
      balanceRatio: balanceRatio(sums.forward, sums.backward),
      gapCount: members.reduce((n, a) => n + gapsByAthlete[a]!, 0),
      athletesWithGaps: members.filter((a) => gapsByAthlete[a]! > 0).length,
      readinessAlerts: members.filter((a) => alertAthletes.has(athletes[a]!.id)).length,
    }))

  const total = emptySums()
  for (const sums of athleteSums) addSums(total, sums)
  const catalogueGaps = findCatalogueGaps(elements)

  const result: AuditResult = {
    asOf,
    options: resolved,
    headline: {
      athleteCount: athletes.length,
      clubFrontLag: lagFrom(total.backwardMirrored, total.backward),
      clubBackLag: lagFrom(total.forwardMirrored, total.forward),
      balanceRatio: balanceRatio(total.forward, total.backward),
      squadFrontLags: Object.fromEntries(squads.map((s) => [s.squadId, s.frontLag])),
      catalogueGaps: catalogueGaps.length,
      gapCount: gaps.length,
      athletesWithGaps: gapsByAthlete.filter((n) => n > 0).length,
      readinessAlerts: alertAthletes.size,
    },
    athletes: athleteRows,
    squads,
    coverage,
    catalogueGaps,
    gaps,
    readiness,
  }
  onProgress?.({ phase: 'done', done: 1, total: 1 })
  return result
}

function readinessRows(
  athletes: readonly AuditAthlete[],
  steps: readonly Map<number, number>[],
  elements: readonly AuditElement[],
  profiles: readonly RequirementProfile[],
  thresholds: AgeThresholdTable,
  paces: Readonly<Record<string, number>>,
  asOf: string,
  horizonMonths: number,
  onProgress: ((progress: AuditProgress) => void) | undefined,
): ReadinessRow[] {
  // Which elements can meet each requirement does not depend on the athlete: work it out once.
  const candidates = new Map<Requirement, number[]>()
  for (const profile of profiles) {
    for (const requirement of profile.requirements) {
      const matching: number[] = []
      elements.forEach((e, i) => {
        if (elementMatches(e, requirement.matches)) matching.push(i)
      })
      candidates.set(requirement, matching)
    }
  }

  const rows: ReadinessRow[] = []
  athletes.forEach((athlete, a) => {
    const change = categoryChangesWithin(
      athlete.birthYear,
      athlete.discipline,
      asOf,
      horizonMonths,
      thresholds,
    )
    if (change === null) return
    const profile = profiles.find(
      (p) => p.discipline === athlete.discipline && p.categories.includes(change.to),
    )
    const athletePace = paces[athlete.id] ?? 0
    const byElement = steps[a]!
    const requirements = (profile?.requirements ?? []).map((requirement): RequirementStatus => {
      let nearest: { e: number; stepIndex: number | null; target: number; needed: number } | null =
        null
      for (const e of candidates.get(requirement) ?? []) {
        const element = elements[e]!
        const last = element.stepCount - 1
        const target =
          requirement.minStepIndex === 'competition-ready'
            ? last
            : Math.min(requirement.minStepIndex, last)
        if (target < 0) continue
        const stepIndex = byElement.get(e) ?? null
        const needed = Math.max(0, target - (stepIndex ?? -1))
        // Candidates come in id order, so a tie goes to the lowest id.
        if (nearest === null || needed < nearest.needed) nearest = { e, stepIndex, target, needed }
        if (needed === 0) break
      }
      const met = nearest !== null && nearest.needed === 0
      const forecastOn =
        nearest === null || met ? null : forecastDate(asOf, nearest.needed, athletePace)
      return {
        requirementId: requirement.id,
        label: requirement.label,
        source: requirement.source,
        met,
        elementId: nearest === null ? null : elements[nearest.e]!.id,
        elementName: nearest === null ? null : elements[nearest.e]!.name,
        stepIndex: nearest?.stepIndex ?? null,
        targetStepIndex: nearest?.target ?? null,
        stepsNeeded: nearest?.needed ?? 0,
        forecastOn,
        onTime: forecastOn === null ? null : forecastOn <= change.startsOn,
        noMatchingElement: nearest === null,
      }
    })
    rows.push({
      athleteId: athlete.id,
      squadId: athlete.squadId,
      discipline: athlete.discipline,
      from: change.from,
      to: change.to,
      startsOn: change.startsOn,
      pace: athletePace,
      profileId: profile?.id ?? null,
      requirements,
      missingCount: requirements.filter((r) => !r.met).length,
    })
  })
  onProgress?.({ phase: 'readiness', done: rows.length, total: rows.length })
  return rows
}

export interface FigureChange {
  previous: number | null
  current: number | null
  /** current − previous; null when either is missing. */
  change: number | null
}

export interface AuditComparison {
  athleteCount: FigureChange
  clubFrontLag: FigureChange
  clubBackLag: FigureChange
  balanceRatio: FigureChange
  catalogueGaps: FigureChange
  gapCount: FigureChange
  athletesWithGaps: FigureChange
  readinessAlerts: FigureChange
  /** Every squad in either audit; a squad in only one of them has a null side. */
  squadFrontLags: Record<string, FigureChange>
}

function figureChange(previous: number | null, current: number | null): FigureChange {
  return {
    previous,
    current,
    change: previous === null || current === null ? null : current - previous,
  }
}

/**
 * The change of each headline figure from the previous audit of the same scope to the current
 * one. With no previous audit every `previous` and `change` is null.
 */
export function compareAudits(
  previous: Pick<AuditResult, 'headline'> | null,
  current: Pick<AuditResult, 'headline'>,
): AuditComparison {
  const before = previous?.headline ?? null
  const now = current.headline
  const figure = (key: Exclude<keyof AuditHeadline, 'squadFrontLags'>) =>
    figureChange(before === null ? null : before[key], now[key])
  const squadIds = [
    ...new Set([...Object.keys(before?.squadFrontLags ?? {}), ...Object.keys(now.squadFrontLags)]),
  ].sort(compareText)
  return {
    athleteCount: figure('athleteCount'),
    clubFrontLag: figure('clubFrontLag'),
    clubBackLag: figure('clubBackLag'),
    balanceRatio: figure('balanceRatio'),
    catalogueGaps: figure('catalogueGaps'),
    gapCount: figure('gapCount'),
    athletesWithGaps: figure('athletesWithGaps'),
    readinessAlerts: figure('readinessAlerts'),
    squadFrontLags: Object.fromEntries(
      squadIds.map((id) => [
        id,
        figureChange(before?.squadFrontLags[id] ?? null, now.squadFrontLags[id] ?? null),
      ]),
    ),
  }
}

/**
 * JSON with object keys sorted and every array sorted by its items' canonical text, so that the
 * same data in any order gives the same text. Undefined properties are left out, as JSON does.
 * Array order is treated as carrying no meaning, which holds for the audit's inputs: their
 * entities are sets and the audit sorts its output itself.
 */
export function canonicalJson(value: unknown): string {
  // This runs over every record of an audit, so it avoids building intermediate strings and
  // arrays: a flat object goes to JSON.stringify whole, with its keys in sorted order. The default
  // sorts compare UTF-16 code units, the same order as compareText.
  if (Array.isArray(value)) {
    const items = new Array<string>(value.length)
    for (let i = 0; i < value.length; i++) items[i] = canonicalJson(value[i])
    return `[${items.sort().join(',')}]`
  }
  if (value !== null && typeof value === 'object') {
    const object = value as Record<string, unknown>
    if (flatInKeyOrder(object)) return JSON.stringify(object)
    const keys = Object.keys(object).sort()
    if (keys.every((key) => object[key] === null || typeof object[key] !== 'object')) {
      return JSON.stringify(object, keys)
    }
    let text = ''
    for (const key of keys) {
      const item = object[key]
      if (item === undefined) continue
      text += `${text === '' ? '' : ','}${JSON.stringify(key)}:${canonicalJson(item)}`
    }
    return `{${text}}`
  }
  return JSON.stringify(value) ?? 'null'
}

/**
 * Whether an object holds no object (arrays included) and lists its keys in sorted order, as an
 * audit record does (athleteId, elementId, stepIndex): then plain JSON.stringify gives its
 * canonical text, without a sorted copy of its keys. Keys a `for…in` lists beyond the object's
 * own come after them, so own keys in order are all that a true answer needs.
 */
function flatInKeyOrder(object: Record<string, unknown>): boolean {
  let previous: string | null = null
  for (const key in object) {
    const item = object[key]
    if ((item !== null && typeof item === 'object') || (previous !== null && key <= previous)) {
      return false
    }
    previous = key
  }
  return true
}

/**
 * SHA-256 (hex) of the canonical inputs and resolved options, through the Web Crypto API so the
 * module stays free of I/O and runs in the browser and in Node alike. Defaults are filled in
 * before hashing, so leaving an option out and passing its default give the same hash.
 */
export async function auditInputHash(
  inputs: AuditInputs,
  options: AuditOptions = {},
): Promise<string> {
  const canonical = canonicalJson({
    inputs: {
      ...inputs,
      paces: inputs.paces ?? {},
      profiles: inputs.profiles ?? defaultRequirementProfiles,
      ageThresholds: inputs.ageThresholds ?? defaultAgeThresholds,
    },
    options: resolveAuditOptions(options),
  })
  const digest = await crypto.subtle.digest('SHA-256', new TextEncoder().encode(canonical))
  return Array.from(new Uint8Array(digest), (byte) => byte.toString(16).padStart(2, '0')).join('')
}
