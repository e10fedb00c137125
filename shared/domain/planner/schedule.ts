import { optionAt } from './model.ts'
import type { Placement, PlanModel } from './types.ts'

/**
 * The blocks in which a coach spots at each station, given how many each one gets: laid end to
 * end along the coaches' time (McNaughton's wrap-around rule), so that no block has more spotted
 * stations than coaches and no station is given the same block twice (each count ≤ blocks).
 */
export function spottedBlocks(model: PlanModel, counts: readonly number[]): Set<number>[] {
  const out = model.stations.map(() => new Set<number>())
  let position = 0
  counts.forEach((count, s) => {
    for (let k = 0; k < Math.min(count, model.blocks); k++)
      out[s]!.add((position + k) % model.blocks)
    position += Math.min(count, model.blocks)
  })
  return out
}

/**
 * Lays the solver's counts (blocks per athlete and station) out block by block: each athlete at
 * one station per block, a spotted station only in its coach's blocks, and each station's head
 * count kept level across the blocks. The athletes with the fewest free choices go first. A visit
 * that finds no block left is dropped rather than breaking a rule (the figures then show it).
 */
export function scheduleBlocks(
  model: PlanModel,
  counts: readonly (readonly number[])[],
  spotted: readonly number[],
): Placement[] {
  const staffed = spottedBlocks(model, spotted)
  const heads = model.stations.map(() => new Array<number>(model.blocks).fill(0))
  const placements: Placement[] = []
  const athletes = model.athletes
    .map((athlete, a) => ({ athlete, a }))
    .sort((x, y) => spottedVisits(model, counts[y.a]!) - spottedVisits(model, counts[x.a]!))
  for (const { athlete, a } of athletes) {
    const busy = new Set<number>()
    const visits = model.stations
      .map((station, s) => ({ station, s, count: counts[a]?.[s] ?? 0 }))
      .filter((v) => v.count > 0)
      // Spotted stations have the fewest blocks to offer: place them first.
      .sort((x, y) => Number(y.station.needsSpotter) - Number(x.station.needsSpotter) || x.s - y.s)
    for (const { station, s, count } of visits) {
      const option = optionAt(athlete, station)
      if (option === null) continue
      for (let k = 0; k < count; k++) {
        let best = -1
        for (let b = 0; b < model.blocks; b++) {
          if (busy.has(b) || (station.needsSpotter && !staffed[s]!.has(b))) continue
          if (best < 0 || heads[s]![b]! < heads[s]![best]!) best = b
        }
        if (best < 0) break
        busy.add(best)
        heads[s]![best]! += 1
        placements.push({
          athleteId: athlete.id,
          block: best,
          stationId: station.id,
          option,
          turns: 0,
        })
      }
    }
  }
  level(model, placements, heads, staffed)
  return placements.sort((x, y) => x.block - y.block)
}

/**
 * Swaps an athlete's stations between two of their blocks wherever that levels the head counts
 * (the sum of squared heads per place at each station and block falls), until no swap helps.
 */
function level(
  model: PlanModel,
  placements: Placement[],
  heads: number[][],
  staffed: Set<number>[],
) {
  const index = new Map(model.stations.map((s, i) => [s.id, i]))
  const cost = (s: number, h: number) => (h * h) / model.stations[s]!.capacity
  const byAthlete = new Map<string, Placement[]>()
  for (const p of placements) byAthlete.set(p.athleteId, [...(byAthlete.get(p.athleteId) ?? []), p])
  for (let round = 0; round < 20; round++) {
    let improved = false
    for (const mine of byAthlete.values()) {
      for (const p of mine) {
        const s = index.get(p.stationId)!
        for (let b = 0; b < model.blocks; b++) {
          if (b === p.block) continue
          if (model.stations[s]!.needsSpotter && !staffed[s]!.has(b)) continue
          const other = mine.find((q) => q.block === b)
          const o = other ? index.get(other.stationId)! : -1
          if (other && model.stations[o]!.needsSpotter && !staffed[o]!.has(p.block)) continue
          if (o === s) continue
          const hs = heads[s]!
          let delta =
            cost(s, hs[b]! + 1) -
            cost(s, hs[b]!) +
            cost(s, hs[p.block]! - 1) -
            cost(s, hs[p.block]!)
          if (other) {
            const ho = heads[o]!
            delta +=
              cost(o, ho[p.block]! + 1) -
              cost(o, ho[p.block]!) +
              cost(o, ho[b]! - 1) -
              cost(o, ho[b]!)
          }
          if (delta >= -1e-9) continue
          hs[p.block]! -= 1
          hs[b]! += 1
          if (other) {
            heads[o]![b]! -= 1
            heads[o]![p.block]! += 1
            other.block = p.block
          }
          p.block = b
          improved = true
        }
      }
    }
    if (!improved) break
  }
}

function spottedVisits(model: PlanModel, row: readonly number[]): number {
  return row.reduce((sum, c, s) => sum + (model.stations[s]!.needsSpotter ? c : 0), 0)
}
