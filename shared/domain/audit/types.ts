// The shapes of the audit's inputs, options and result (see run.ts for the computation).

import type { Discipline } from '../club.ts'
import type { Direction, RotationClass, TwistBand } from '../element.ts'
import type { AgeCategory, AgeThresholdTable } from '../age-categories.ts'

export interface AuditElement {
  id: string
  name: string
  /** Floor, tumbling, trampoline or a club's own: a requirement is met on its own apparatus. */
  apparatus: string
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
  /** Only elements of this apparatus can meet the requirements: a floor profile is met on floor. */
  apparatus: string
  /** The categories the profile applies to, i.e. for athletes about to enter one of them. */
  categories: readonly AgeCategory[]
  source: string
  /** Listed in the order they are shown. */
  requirements: readonly Requirement[]
}

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
  /** Null when the athlete has no record with a step: no data, not a lag of 0. */
  frontLag: number | null
  backLag: number | null
  forwardProficiency: number
  backwardProficiency: number
}

export interface SquadBreakdown {
  squadId: string
  athleteCount: number
  /** Athletes of the squad with at least one record with a step. */
  athletesWithRecords: number
  /** Null when no athlete of the squad has a record: no data, not a lag of 0. */
  frontLag: number | null
  backLag: number | null
  forwardProficiency: number
  backwardProficiency: number
  balanceRatio: number | null
  /** Gaps a coach can act on: the counterpart is in the catalogue. */
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
  /**
   * The counterpart is not in the catalogue: a catalogue gap, the director's to fix. Ranked after
   * every other gap and left out of the gap counts (see `CatalogueGap.athleteCount`).
   */
  counterpartMissing: boolean
  counterpartNeverStarted: boolean
  /** Steps in the element's progression, to read "step 7 of 9"; absent from older audits. */
  stepCount?: number
  /** Steps in the counterpart's progression; null when it is not in the catalogue. */
  counterpartStepCount?: number | null
}

export interface CatalogueGap {
  elementId: string
  elementName: string
  counterpartId: string | null
  /**
   * Athletes in scope with progress on the element, whose forward work waits for the catalogue;
   * absent from older audits.
   */
  athleteCount?: number
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
  /**
   * Front-lag over every athlete in scope (the club, or the squad for a squad audit); null when
   * no athlete in scope has a record (no data).
   */
  clubFrontLag: number | null
  clubBackLag: number | null
  balanceRatio: number | null
  /** By squad; null for a squad without records. */
  squadFrontLags: Record<string, number | null>
  /**
   * Squads in scope none of whose athletes has a record: left out of rankings and counted apart.
   * Absent from audits stored before it existed.
   */
  squadsWithoutRecords?: number
  catalogueGaps: number
  /** Gaps a coach can act on: the counterpart is in the catalogue. */
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
