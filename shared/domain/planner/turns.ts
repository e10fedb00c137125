import { optionAt, stationBlockTurns, turnsPerBlock } from './model.ts'
import type { Placement, PlanModel } from './types.ts'

interface Member {
  placement: Placement
  order: number
}

/**
 * Shares out the turns of every station in every block among the athletes placed there: each
 * athlete takes at most the station's turns per block (one turn at a time), and when the station
 * cannot give everyone that many, its turns (athletes at once × turns per block) are shared as
 * evenly as whole turns allow, the odd ones going to those with the fewest turns so far in the
 * session. The solver's plan and every move the coach makes on screen go through it, so the
 * figures are always computed the same way.
 */
export function shareTurns(model: PlanModel, placements: readonly Placement[]): Placement[] {
  const stationIndex = new Map(model.stations.map((s, i) => [s.id, i]))
  const athleteOrder = new Map(model.athletes.map((a, i) => [a.id, i]))
  const totals = new Map<string, number>()
  const out = placements.map((p) => ({ ...p, turns: 0 }))
  const cellsByBlock = new Map<number, Map<string, Member[]>>()
  out.forEach((p) => {
    if (!stationIndex.has(p.stationId) || !athleteOrder.has(p.athleteId)) return
    const block = cellsByBlock.get(p.block) ?? new Map<string, Member[]>()
    cellsByBlock.set(p.block, block)
    const cell = block.get(p.stationId) ?? []
    cell.push({ placement: p, order: athleteOrder.get(p.athleteId)! })
    block.set(p.stationId, cell)
  })
  for (const b of [...cellsByBlock.keys()].sort((x, y) => x - y)) {
    const given: [Placement, number][] = []
    for (const [stationId, members] of cellsByBlock.get(b)!) {
      const station = model.stations[stationIndex.get(stationId)!]!
      const perAthlete = turnsPerBlock(model, station)
      const available = stationBlockTurns(model, station)
      const ordered = [...members].sort(
        (x, y) =>
          (totals.get(x.placement.athleteId) ?? 0) - (totals.get(y.placement.athleteId) ?? 0) ||
          x.order - y.order,
      )
      const base = Math.min(perAthlete, Math.floor(available / members.length))
      let spare = available - base * members.length
      for (const m of ordered) {
        const extra = base < perAthlete && spare > 0 ? 1 : 0
        spare -= extra
        given.push([m.placement, base + extra])
      }
    }
    for (const [p, turns] of given) {
      p.turns = turns
      totals.set(p.athleteId, (totals.get(p.athleteId) ?? 0) + turns)
    }
  }
  return out
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
