import type { Modality } from '../../shared/domain/element.ts'
import type { PlanAthlete, PlanModel, PlanStation } from '../../shared/domain/planner/types.ts'

// Small builders for planner models, ids made up to be valid UUIDs.

const uuid = (prefix: number, n: number) =>
  `00000000-0000-4000-8000-${prefix.toString().padStart(4, '0')}${n.toString().padStart(8, '0')}`

export function station(
  n: number,
  modality: Modality,
  capacity: number,
  secondsPerTurn: number,
  needsSpotter = false,
): PlanStation {
  return { id: uuid(1, n), name: `Station ${n}`, modality, capacity, secondsPerTurn, needsSpotter }
}

/** An athlete whose focus steps are done on these modalities, one forward element each. */
export function athlete(
  n: number,
  modalities: Modality[],
  direction: 'forward' | 'backward' = 'forward',
): PlanAthlete {
  return {
    id: uuid(2, n),
    name: `Athlete ${n}`,
    options: modalities.map((modality, k) => ({
      elementId: uuid(3, k),
      elementName: `Element ${k}`,
      direction,
      stepIndex: 1,
      stepName: `Step ${k}`,
      modality,
      kind: 'reached' as const,
    })),
  }
}

export function model(
  partial: Partial<PlanModel> & Pick<PlanModel, 'stations' | 'athletes'>,
): PlanModel {
  return { minutes: 20, blocks: 2, changeoverSeconds: 0, coaches: 1, ...partial }
}
