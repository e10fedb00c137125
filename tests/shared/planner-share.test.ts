import { describe, expect, it } from 'vitest'
import { physicalBound } from '../../shared/domain/planner/bound.ts'
import { planFigures } from '../../shared/domain/planner/figures.ts'
import { repairLayout } from '../../shared/domain/planner/repair.ts'
import { shareTurns } from '../../shared/domain/planner/turns.ts'
import type { Placement, PlanModel } from '../../shared/domain/planner/types.ts'
import { athlete, model, station } from '../support/planner.ts'

// Hand-worked layouts where sharing block by block, or the block layout itself, left the least
// served athlete short, and what the session-wide sharing and the repair give instead.

const at = (m: PlanModel, a: number, block: number, s: number): Placement => ({
  athleteId: m.athletes[a]!.id,
  block,
  stationId: m.stations[s]!.id,
  option: 0,
  turns: 0,
})

const totals = (m: PlanModel, placements: readonly Placement[]) =>
  planFigures(m, shareTurns(m, placements)).athletes.map((a) => a.turns)

describe('shareTurns over the whole session', () => {
  it('gives a crowded station’s turns to whoever has fewest in the session', () => {
    // 10 min, 2 blocks of 300 s. A trampoline for 1, 60 s turns: 5 turns a block. Athlete 1 on
    // it in both blocks, athlete 2 in the first only, athlete 3 in the second only.
    // Block by block (the odd turn to the fewest so far): block 1 gives 3 and 2 (athlete 1 first
    // on the tie), block 2 gives 2 to athlete 1 and 3 to athlete 3: 5, 2, 3, smallest 2.
    // Over the session: 10 turns, athletes 2 and 3 at most 5 each; the fairest is 4, 3, 3
    // (athlete 1 takes 2 in each block), smallest 3.
    const m = model({
      minutes: 10,
      stations: [station(1, 'trampoline', 1, 60)],
      athletes: [1, 2, 3].map((n) => athlete(n, ['trampoline'])),
    })
    expect(totals(m, [at(m, 0, 0, 0), at(m, 1, 0, 0), at(m, 0, 1, 0), at(m, 2, 1, 0)])).toEqual([
      4, 3, 3,
    ])
  })

  it('never takes a turn from an athlete alone at a station', () => {
    // Athlete 1 alone on a floor for 4 (30 s: 10 turns in 300 s) and crowded with athlete 2 on
    // the trampoline (5 turns for both) in block 2; athlete 2 only there. Block by block, the
    // trampoline gave 2 and 3 (12 and 3). Over the session athlete 2, with fewest, takes all 5
    // (at most 5 a block at 60 s); athlete 1 none there: 10 and 5.
    const m = model({
      minutes: 10,
      stations: [station(1, 'trampoline', 1, 60), station(2, 'floor-drill', 4, 30)],
      athletes: [1, 2].map((n) => athlete(n, ['trampoline', 'floor-drill'])),
    })
    expect(totals(m, [at(m, 0, 0, 1), at(m, 0, 1, 0), at(m, 1, 1, 0)])).toEqual([10, 5])
  })
})

describe('repairLayout', () => {
  // 10 min, 2 blocks of 300 s. A trampoline for 1 and a floor for 2, both 60 s turns: 5 turns an
  // athlete a block at either. Three athletes who may use both. Physical bound: 1 × 10 + 2 × 10
  // = 30 = 3 × 10: every place filled in both blocks gives everyone 10, the solver's optimum.
  const m = model({
    minutes: 10,
    stations: [station(1, 'trampoline', 1, 60), station(2, 'floor-drill', 2, 60)],
    athletes: [1, 2, 3].map((n) => athlete(n, ['trampoline', 'floor-drill'])),
  })

  it('fills the places a layout left empty until the smallest reaches the solver’s', () => {
    // All three on the trampoline in block 1 (5 turns for three) and on the floor in block 2
    // (10 for three): 15 in all, 5 each.
    const bad = [0, 1, 2].flatMap((a) => [at(m, a, 0, 0), at(m, a, 1, 1)])
    expect(totals(m, bad)).toEqual([5, 5, 5])
    expect(physicalBound(m)).toBe(30)
    const repaired = repairLayout(m, bad, [new Set(), new Set()], 10)
    expect(totals(m, repaired)).toEqual([10, 10, 10])
    expect(planFigures(m, shareTurns(m, repaired)).problems).toEqual([])
  })

  it('puts nobody at a spotted station in a block its coach is not there', () => {
    // The floor needs a spotter, whose coach is there in block 1 only: in block 2 only the
    // trampoline runs, 5 turns for three. Block 1 gives 5 + 10 = 15. Best: 20 in all, and the
    // fairest sharing 7, 7, 6 (sorted 6, 7, 7).
    const spotted = model({
      ...m,
      stations: [station(1, 'trampoline', 1, 60), station(2, 'floor-drill', 2, 60, true)],
    })
    const bad = [0, 1, 2].map((a) => at(spotted, a, 0, 0))
    const repaired = repairLayout(spotted, bad, [new Set(), new Set([0])], 10)
    expect(
      repaired.filter((p) => p.stationId === spotted.stations[1]!.id && p.block === 1),
    ).toEqual([])
    expect(totals(spotted, repaired).sort((x, y) => x - y)).toEqual([6, 7, 7])
  })
})
