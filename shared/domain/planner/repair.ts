import { optionAt, turnsPerBlock } from './model.ts'
import { fairTurns } from './share.ts'
import type { Placement, PlanModel } from './types.ts'

// The block layout works from the solver's counts of blocks per athlete and station, which say
// nothing of who shares a block with whom; laid out, a crowded station can leave the least-served
// athlete short of the smallest number of turns the solver proved. The repair moves athletes,
// one change at a time, while a change raises the athletes' turns taken in order from the fewest
// (the smallest first, then the next, …): the athlete at the smallest to another station or into
// an idle block, someone sharing their crowded station elsewhere, or the two swapped.

/** Athletes' totals, sorted from the fewest. */
function sortedTotals(model: PlanModel, placements: readonly Placement[]): number[] {
  const turns = fairTurns(model, placements)
  const totals = new Map(model.athletes.map((a) => [a.id, 0]))
  placements.forEach((p, i) => totals.set(p.athleteId, (totals.get(p.athleteId) ?? 0) + turns[i]!))
  return [...totals.values()].sort((x, y) => x - y)
}

/** Positive when `a` serves the least served better (compared from the fewest turns up). */
function compare(a: readonly number[], b: readonly number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i]! - b[i]!
  return 0
}

/**
 * The layout with the changes above made while they help, stopping once the smallest number of
 * turns reaches `target` (the solver's), no change helps, or `budgetMs` have passed (the plan is
 * then as far as it got; the figures show the smallest beside the solver's). `staffed[s]` are the blocks a coach
 * spots at station s: a spotted station takes athletes in those blocks only.
 */
export function repairLayout(
  model: PlanModel,
  placements: readonly Placement[],
  staffed: readonly ReadonlySet<number>[],
  target: number,
  budgetMs = 400,
): Placement[] {
  const deadline = performance.now() + budgetMs
  let current = placements.map((p) => ({ ...p }))
  let best = sortedTotals(model, current)
  const stationIndex = new Map(model.stations.map((s, i) => [s.id, i]))
  const athletes = new Map(model.athletes.map((a) => [a.id, a]))
  const open = (s: number, b: number) => {
    const station = model.stations[s]!
    return turnsPerBlock(model, station) > 0 && (!station.needsSpotter || staffed[s]!.has(b))
  }

  /** `current` with athlete `id` in block `b` at station `s` (null: out of the block). */
  const placed = (list: Placement[], id: string, b: number, s: number | null) => {
    const rest = list.filter((p) => !(p.athleteId === id && p.block === b))
    if (s === null) return rest
    const option = optionAt(athletes.get(id)!, model.stations[s]!)
    if (option === null || !open(s, b)) return null
    return [
      ...rest,
      { athleteId: id, block: b, stationId: model.stations[s]!.id, option, turns: 0 },
    ]
  }

  function* changes(id: string): Generator<Placement[]> {
    for (let b = 0; b < model.blocks; b++) {
      const here = current.find((p) => p.athleteId === id && p.block === b)
      const s0 = here ? stationIndex.get(here.stationId)! : null
      for (let s = 0; s < model.stations.length; s++) {
        if (s === s0) continue
        const moved = placed(current, id, b, s)
        if (moved) yield moved
        // Swapped with someone at s in this block.
        for (const other of current.filter(
          (p) => p.block === b && p.stationId === model.stations[s]!.id,
        )) {
          const swapped = moved && placed(moved, other.athleteId, b, s0)
          if (swapped) yield swapped
        }
      }
      if (s0 === null) continue
      // Someone sharing the station in this block elsewhere, or out of it.
      for (const other of current.filter((p) => p.block === b && p.stationId === here!.stationId)) {
        if (other.athleteId === id) continue
        for (let s = 0; s < model.stations.length; s++) {
          if (s === s0) continue
          const moved = placed(current, other.athleteId, b, s)
          if (moved) yield moved
        }
      }
    }
  }

  while (best[0]! < target && performance.now() < deadline) {
    let improved = false
    const totals = new Map(model.athletes.map((a) => [a.id, 0]))
    const turns = fairTurns(model, current)
    current.forEach((p, i) => totals.set(p.athleteId, totals.get(p.athleteId)! + turns[i]!))
    const least = model.athletes.filter((a) => totals.get(a.id) === best[0]).map((a) => a.id)
    search: for (const id of least) {
      for (const candidate of changes(id)) {
        if (performance.now() >= deadline) break search
        const score = sortedTotals(model, candidate)
        if (compare(score, best) > 0) {
          current = candidate
          best = score
          improved = true
          break search
        }
      }
    }
    if (!improved) break
  }
  return current
}
