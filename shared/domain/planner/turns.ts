import { optionAt } from './model.ts'
import { fairTurns } from './share.ts'
import type { Placement, PlanModel } from './types.ts'

/**
 * Shares out the turns of every station in every block among the athletes placed there: each
 * athlete takes at most the station's turns per block (one turn at a time), and where a station
 * has more athletes than places, its turns (athletes at once × turns per block) are shared over
 * the whole session so that the athlete with the fewest turns gets as many as the placements
 * allow, then the next (`fairTurns`). The solver's plan and every move the coach makes on screen
 * go through it, so the figures are always computed the same way.
 */
export function shareTurns(model: PlanModel, placements: readonly Placement[]): Placement[] {
  const turns = fairTurns(model, placements)
  return placements.map((p, i) => ({ ...p, turns: turns[i]! }))
}

/**
 * Moves an athlete, for one block, to another station (or takes them out of the block with
 * `stationId` null) and shares the turns out again. Refuses a station that serves none of the
 * athlete's focus steps, or a spotted one the athlete's step needs where no coach spots.
 */
export function moveAthlete(
  model: PlanModel,
  placements: readonly Placement[],
  athleteId: string,
  block: number,
  stationId: string | null,
): Placement[] {
  const rest = placements.filter((p) => !(p.athleteId === athleteId && p.block === block))
  if (stationId === null) return shareTurns(model, rest)
  const athlete = model.athletes.find((a) => a.id === athleteId)
  const station = model.stations.find((s) => s.id === stationId)
  const option = athlete && station ? optionAt(athlete, station) : null
  if (option === null) throw new Error('That station serves none of the athlete’s focus steps.')
  return shareTurns(model, [...rest, { athleteId, block, stationId, option, turns: 0 }])
}
