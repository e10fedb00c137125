import type { Direction, Modality } from '../element.ts'

/** A station of the gym: one piece of equipment set up for a modality. */
export interface PlanStation {
  id: string
  name: string
  modality: Modality
  /** Athletes who can work on it at once (lanes, beds, …). */
  capacity: number
  secondsPerTurn: number
  /** A coach stands at it: it only runs in a block where a coach is assigned to it. */
  needsSpotter: boolean
}

/**
 * A step an athlete may work on in the session: the step they have reached or the next one on a
 * focus element, never further.
 */
export interface FocusStep {
  elementId: string
  elementName: string
  direction: Direction
  stepIndex: number
  stepName: string
  modality: Modality
  /** 'reached' for the athlete's current step, 'next' for the one after it. */
  kind: 'reached' | 'next'
}

export interface PlanAthlete {
  id: string
  name: string
  /** In order of priority: the first one a station serves is what the athlete works on there. */
  options: FocusStep[]
}

/** Everything a plan is computed from; the solver and the screen read the same model. */
export interface PlanModel {
  minutes: number
  blocks: number
  /** Seconds at the start of each block spent moving between stations. */
  changeoverSeconds: number
  coaches: number
  stations: PlanStation[]
  athletes: PlanAthlete[]
}

/** One athlete at one station during one block, working on `athlete.options[option]`. */
export interface Placement {
  athleteId: string
  block: number
  stationId: string
  option: number
  turns: number
}

export interface SolverReport {
  /** HiGHS's model status of the last stage, e.g. 'Optimal' or 'Time limit reached'. */
  status: string
  /** Relative gap between the plan's total and the solver's own bound (0 when proved optimal). */
  gap: number
  /** The solver's upper bound on the total turns in the second stage. */
  bound: number
  milliseconds: number
}
