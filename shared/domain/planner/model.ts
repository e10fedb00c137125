import type { FocusStep, PlanAthlete, PlanModel, PlanStation } from './types.ts'

/** Modalities where a coach holds the athlete: such a step only goes where a coach is. */
export const spottedModalities: readonly string[] = ['hand-spot', 'spotting-rig']

/** True when working on this step needs a coach at the station. */
export function needsSpotter(step: Pick<FocusStep, 'modality'>): boolean {
  return spottedModalities.includes(step.modality)
}

/** Whole seconds in one rotation block, changeover included. */
export function blockSeconds(model: Pick<PlanModel, 'minutes' | 'blocks'>): number {
  return Math.floor((model.minutes * 60) / model.blocks)
}

/** Seconds of each block in which athletes actually turn (the block less its changeover). */
export function workSeconds(model: Pick<PlanModel, 'minutes' | 'blocks' | 'changeoverSeconds'>) {
  return Math.max(0, blockSeconds(model) - model.changeoverSeconds)
}

/** Turns one athlete can take at a station in one block: one turn at a time. */
export function turnsPerBlock(model: PlanModel, station: PlanStation): number {
  return Math.floor(workSeconds(model) / station.secondsPerTurn)
}

/** Turns a station gives in one block, all its places together. */
export function stationBlockTurns(model: PlanModel, station: PlanStation): number {
  return station.capacity * turnsPerBlock(model, station)
}

/**
 * The option an athlete works on at a station: the first of their focus steps (in priority
 * order) done on the station's modality, a spotted step only at a station where a coach spots.
 * Null when the station serves none of them: the athlete is not placed there.
 */
export function optionAt(athlete: PlanAthlete, station: PlanStation): number | null {
  const index = athlete.options.findIndex(
    (o) => o.modality === station.modality && (!needsSpotter(o) || station.needsSpotter),
  )
  return index < 0 ? null : index
}

/**
 * Builds an athlete's focus steps from their step on each focus element: the step reached and
 * the next one, never further. `stepIndex` null means the element is not started: only its
 * first step is offered.
 */
export function focusSteps(
  elements: {
    elementId: string
    elementName: string
    direction: FocusStep['direction']
    stepIndex: number | null
    steps: { name: string; modality: FocusStep['modality'] }[]
  }[],
): FocusStep[] {
  const out: FocusStep[] = []
  for (const e of elements) {
    const candidates: [number, FocusStep['kind']][] =
      e.stepIndex === null
        ? [[0, 'next']]
        : [
            [e.stepIndex, 'reached'],
            [e.stepIndex + 1, 'next'],
          ]
    for (const [index, kind] of candidates) {
      const step = e.steps[index]
      if (!step) continue
      out.push({
        elementId: e.elementId,
        elementName: e.elementName,
        direction: e.direction,
        stepIndex: index,
        stepName: step.name,
        modality: step.modality,
        kind,
      })
    }
  }
  return out
}
