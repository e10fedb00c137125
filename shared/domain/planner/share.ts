import { turnsPerBlock } from './model.ts'
import type { Placement, PlanModel } from './types.ts'

// Sharing a session's turns among the athletes placed, the placements fixed. Each athlete takes at
// most a station's turns per block in a block (one turn at a time); a station gives at most its
// places × turns per block in a block. Where a station has no more athletes than places, everyone
// there takes every turn. The crowded ones are shared as a whole session: turns go one at a time
// to the athlete with the fewest so far who can still take one, rerouting turns of others between
// their crowded blocks where that frees one (an augmenting path, as in a flow network). The
// athletes' totals form a polymatroid (the turns a set of athletes can take together is
// submodular in the set), on which raising the lowest total that can still rise, one unit at a
// time, reaches the fairest sharing (the largest smallest total, then the next, …) and the
// largest total: Fujishige, "Lexicographically optimal base of a polymatroid with respect to a
// weight vector", Mathematics of Operations Research 5 (1980).

interface Cell {
  /** Turns the station gives in the block, all its places together. */
  room: number
  members: number[]
}

/**
 * The turns of each placement (by index into `placements`), as described above. Placements at a
 * station or of an athlete the model does not have get none.
 */
export function fairTurns(model: PlanModel, placements: readonly Placement[]): number[] {
  const stations = new Map(model.stations.map((s) => [s.id, s]))
  const athleteOrder = new Map(model.athletes.map((a, i) => [a.id, i]))
  const turns = placements.map(() => 0)
  const limit = placements.map(() => 0)
  const cellOf = placements.map(() => -1)
  const totals = model.athletes.map(() => 0)
  const cells: Cell[] = []
  const cellIndex = new Map<string, number>()
  placements.forEach((p, i) => {
    const station = stations.get(p.stationId)
    if (!station || !athleteOrder.has(p.athleteId)) return
    limit[i] = turnsPerBlock(model, station)
    const key = `${p.block} ${p.stationId}`
    let c = cellIndex.get(key)
    if (c === undefined) {
      c = cells.length
      cellIndex.set(key, c)
      cells.push({ room: station.capacity * limit[i]!, members: [] })
    }
    cells[c]!.members.push(i)
    cellOf[i] = c
  })
  // Uncrowded cells: everyone takes every turn; crowded ones enter the sharing.
  const crowded = new Set<number>()
  cells.forEach((cell, c) => {
    const station = stations.get(placements[cell.members[0]!]!.stationId)!
    if (cell.members.length <= station.capacity) {
      for (const i of cell.members) {
        turns[i] = limit[i]!
        totals[athleteOrder.get(placements[i]!.athleteId)!]! += limit[i]!
      }
    } else crowded.add(c)
  })
  const mine = model.athletes.map(() => [] as number[])
  placements.forEach((p, i) => {
    if (crowded.has(cellOf[i]!)) mine[athleteOrder.get(p.athleteId)!]!.push(i)
  })
  // Placements in block order, so that a turn goes to the earliest block that has one.
  for (const list of mine) list.sort((x, y) => placements[x]!.block - placements[y]!.block)
  const used = cells.map(() => 0)
  const athleteOfPlacement = placements.map((p) => athleteOrder.get(p.athleteId) ?? -1)
  const open = new Set(mine.flatMap((list, a) => (list.length ? [a] : [])))

  /**
   * Up to `most` more turns for athlete `a` along one path, rerouting others' turns if need be:
   * how many it gave (0 if none is left).
   */
  const augment = (a: number, most: number): number => {
    // Breadth-first over crowded cells. `enter[c]`: the placement that takes one more turn in c;
    // `giver[c]`: the placement, in the cell before on the path, whose athlete gives a turn up
    // there in exchange (none for the cells athlete `a` reaches directly).
    const enter = new Map<number, number>()
    const giver = new Map<number, number>()
    const queue: number[] = []
    const reach = (i: number, from?: number) => {
      const c = cellOf[i]!
      if (enter.has(c) || turns[i]! >= limit[i]!) return
      enter.set(c, i)
      if (from !== undefined) giver.set(c, from)
      queue.push(c)
    }
    for (const i of mine[a]!) reach(i)
    for (let head = 0; head < queue.length; head++) {
      const c = queue[head]!
      if (used[c]! < cells[c]!.room) {
        // As many as every step of the path allows, `most` at the outside.
        let amount = Math.min(most, cells[c]!.room - used[c]!)
        for (let cell: number | undefined = c; cell !== undefined;) {
          const i = enter.get(cell)!
          amount = Math.min(amount, limit[i]! - turns[i]!)
          const q = giver.get(cell)
          if (q !== undefined) amount = Math.min(amount, turns[q]!)
          cell = q === undefined ? undefined : cellOf[q]
        }
        used[c]! += amount
        for (let cell: number | undefined = c; cell !== undefined;) {
          turns[enter.get(cell)!]! += amount
          const q = giver.get(cell)
          if (q === undefined) break
          turns[q]! -= amount
          cell = cellOf[q]
        }
        return amount
      }
      for (const q of cells[c]!.members) {
        if (turns[q]! <= 0) continue
        for (const i of mine[athleteOfPlacement[q]!]!) if (i !== q) reach(i, q)
      }
    }
    return 0
  }

  while (open.size) {
    let a = -1
    let next = Infinity
    for (const x of open) {
      if (a < 0 || totals[x]! < totals[a]!) {
        if (a >= 0) next = Math.min(next, totals[a]!)
        a = x
      } else next = Math.min(next, totals[x]!)
    }
    // One at a time would give `a` every turn until it passes the next fewest: as many at once.
    const given = augment(a, Math.max(1, next - totals[a]!))
    if (given) totals[a]! += given
    else open.delete(a)
  }
  return turns
}
