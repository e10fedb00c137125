import { describe, expect, it } from 'vitest'
import { blockBound, physicalBound } from '../../shared/domain/planner/bound.ts'
import { explainInfeasible } from '../../shared/domain/planner/explain.ts'
import { planFigures } from '../../shared/domain/planner/figures.ts'
import { focusSteps, optionAt } from '../../shared/domain/planner/model.ts'
import { ratioGuidance, ratioWarnings } from '../../shared/domain/planner/ratios.ts'
import { spottedBlocks } from '../../shared/domain/planner/schedule.ts'
import { moveAthlete, shareTurns } from '../../shared/domain/planner/turns.ts'
import { athlete, model, station } from '../support/planner.ts'

// Hand-worked cases: each figure below is worked out in the comment beside it.

describe('physicalBound', () => {
  it.each([
    // 20 min, 2 blocks, no changeover: 1200 s in use. Trampoline 2 at once, 30 s: 2 × 40 = 80;
    // tumble track 1 at once, 20 s: 1 × 60 = 60. 140.
    [{ blocks: 2, changeoverSeconds: 0 }, 140],
    // 4 blocks of 300 s less 60 s changeover: 960 s in use. 2 × ⌊960/30⌋ + 1 × ⌊960/20⌋ = 64 + 48
    [{ blocks: 4, changeoverSeconds: 60 }, 112],
    // 3 blocks of 400 s less 45 s: 1065 s in use. 2 × ⌊1065/30⌋ + ⌊1065/20⌋ = 70 + 53 = 123
    [{ blocks: 3, changeoverSeconds: 45 }, 123],
  ])('%o gives at most %i turns', (shape, expected) => {
    const m = model({
      ...shape,
      stations: [station(1, 'trampoline', 2, 30), station(2, 'tumble-track', 1, 20)],
      athletes: [],
    })
    expect(physicalBound(m)).toBe(expected)
  })

  it('is never below the bound of the blocks, where a turn does not run across a changeover', () => {
    // 3 blocks of 355 s at work: trampoline 2 × ⌊355/30⌋ = 22 per block, 66; tumble track
    // ⌊355/20⌋ = 17 per block, 51: 117 ≤ 123.
    const m = model({
      blocks: 3,
      changeoverSeconds: 45,
      stations: [station(1, 'trampoline', 2, 30), station(2, 'tumble-track', 1, 20)],
      athletes: [],
    })
    expect(blockBound(m)).toBe(117)
    expect(blockBound(m)).toBeLessThanOrEqual(physicalBound(m))
  })
})

describe('focusSteps never advances anyone', () => {
  const steps = [
    { name: 'Drill', modality: 'floor-drill' as const },
    { name: 'Trampoline', modality: 'trampoline' as const },
    { name: 'Pit', modality: 'pit' as const },
    { name: 'Spot', modality: 'hand-spot' as const },
  ]
  const element = { elementId: 'e', elementName: 'Front tuck', direction: 'forward' as const }
  it.each([
    // reached step 1: that step and the next, never step 3
    [1, ['1 trampoline reached', '2 pit next']],
    // not started: the first step only
    [null, ['0 floor-drill next']],
    // on the last step: nothing after it
    [3, ['3 hand-spot reached']],
  ])('on step %s offers %o', (stepIndex, expected) => {
    const out = focusSteps([{ ...element, stepIndex, steps }])
    expect(out.map((s) => `${s.stepIndex} ${s.modality} ${s.kind}`)).toEqual(expected)
  })

  it('puts a hand-spotted step only at a station where a coach spots', () => {
    const a = athlete(1, ['hand-spot'])
    expect(optionAt(a, station(1, 'hand-spot', 1, 30, false))).toBeNull()
    expect(optionAt(a, station(2, 'hand-spot', 1, 30, true))).toBe(0)
    expect(optionAt(a, station(3, 'trampoline', 1, 30, true))).toBeNull()
  })
})

describe('shareTurns', () => {
  // A trampoline for 2 at once, 60 s turns, blocks of 300 s: 5 turns each, 10 in all per block.
  const tramp = station(1, 'trampoline', 2, 60)
  const three = [1, 2, 3].map((n) => athlete(n, ['trampoline']))
  const m = model({ minutes: 10, blocks: 2, stations: [tramp], athletes: three })
  const at = (block: number) =>
    three.map((a) => ({ athleteId: a.id, block, stationId: tramp.id, option: 0, turns: 0 }))

  it('shares a crowded station evenly, the odd turn to whoever has fewest so far', () => {
    // Block 1: 10 turns for 3: 3 each and one over, to the first: 4, 3, 3.
    // Block 2: 3 each and one over, to the fewest so far (athletes 2 and 3 tie; 2 comes first).
    const shared = shareTurns(m, [...at(0), ...at(1)])
    expect(shared.filter((p) => p.block === 0).map((p) => p.turns)).toEqual([4, 3, 3])
    expect(shared.filter((p) => p.block === 1).map((p) => p.turns)).toEqual([3, 4, 3])
    expect(planFigures(m, shared).athletes.map((a) => a.turns)).toEqual([7, 7, 6])
  })

  it('gives each athlete no more than one turn at a time when the station is not full', () => {
    // Alone on a bed for 2: 5 turns in 300 s, not 10.
    const shared = shareTurns(m, at(0).slice(0, 1))
    expect(shared[0]!.turns).toBe(5)
  })

  it('updates the figures when the coach moves an athlete', () => {
    const floor = station(2, 'floor-drill', 4, 30)
    const both = [1, 2, 3].map((n) => athlete(n, ['trampoline', 'floor-drill']))
    const mm = model({ minutes: 10, blocks: 2, stations: [tramp, floor], athletes: both })
    const start = shareTurns(mm, [...at(0), ...at(1)])
    expect(planFigures(mm, start).totalTurns).toBe(20)
    // Athlete 3 to the floor in block 1: the trampoline gives athletes 1 and 2 5 each there (two
    // places), the floor 10 to athlete 3 (300 s / 30 s). Block 2's 10 trampoline turns go to
    // whoever has fewest: athletes 1 and 2 take 5 each (their most), athlete 3 none: 10, 10, 10.
    // (Shared block by block, block 2 went 4, 3, 3 and athlete 2 ended on 8.)
    const moved = moveAthlete(mm, start, both[2]!.id, 0, floor.id)
    const figures = planFigures(mm, moved)
    expect(figures.athletes.map((a) => a.turns)).toEqual([5 + 5, 5 + 5, 10 + 0])
    expect(figures.totalTurns).toBe(30)
    expect(figures.totalTurns).toBeLessThanOrEqual(figures.physicalBound)
    expect(() => moveAthlete(mm, start, both[2]!.id, 0, station(9, 'pit', 1, 30).id)).toThrow()
  })
})

describe('planFigures', () => {
  it('splits the work forward and backward and counts idle time', () => {
    // 10 min in 2 blocks of 300 s. Athlete 1 forward on the trampoline, alone: 5 turns of 60 s
    // in block 1, idle 600 − 300 = 300 s. Athlete 2 backward, 5 turns in block 2.
    const tramp = station(1, 'trampoline', 1, 60)
    const a = athlete(1, ['trampoline'], 'forward')
    const b = athlete(2, ['trampoline'], 'backward')
    const m = model({ minutes: 10, blocks: 2, stations: [tramp], athletes: [a, b] })
    const placed = shareTurns(m, [
      { athleteId: a.id, block: 0, stationId: tramp.id, option: 0, turns: 0 },
      { athleteId: b.id, block: 1, stationId: tramp.id, option: 0, turns: 0 },
    ])
    const f = planFigures(m, placed)
    expect([f.forwardTurns, f.backwardTurns, f.totalTurns, f.minTurns]).toEqual([5, 5, 10, 5])
    expect(f.athletes.map((x) => x.idleSeconds)).toEqual([300, 300])
    expect(f.problems).toEqual([])
  })

  it('names a block with more spotted stations than coaches', () => {
    const s1 = station(1, 'hand-spot', 1, 30, true)
    const s2 = station(2, 'spotting-rig', 1, 30, true)
    const a = athlete(1, ['hand-spot'])
    const b = athlete(2, ['spotting-rig'])
    const m = model({ coaches: 1, stations: [s1, s2], athletes: [a, b] })
    const f = planFigures(m, [
      { athleteId: a.id, block: 0, stationId: s1.id, option: 0, turns: 1 },
      { athleteId: b.id, block: 0, stationId: s2.id, option: 0, turns: 1 },
    ])
    expect(f.problems).toEqual(['Block 1 has 2 spotted stations but 1 coach.'])
  })
})

describe('spottedBlocks', () => {
  it('never gives a block more spotted stations than coaches', () => {
    // 2 coaches, 4 blocks: 8 station-blocks; 3 stations asking 3, 3 and 2 blocks.
    const m = model({
      blocks: 4,
      coaches: 2,
      stations: [1, 2, 3].map((n) => station(n, 'hand-spot', 1, 30, true)),
      athletes: [],
    })
    const blocks = spottedBlocks(m, [3, 3, 2])
    expect(blocks.map((b) => b.size)).toEqual([3, 3, 2])
    for (let b = 0; b < 4; b++)
      expect(blocks.filter((set) => set.has(b)).length).toBeLessThanOrEqual(2)
  })
})

describe('explainInfeasible', () => {
  it('says so when more athletes need a spotter than the coaches present can spot', () => {
    // 10 min in 2 blocks of 300 s less 60 s: 240 s of work. A spotted station, one at a time,
    // 120 s a turn: 2 turns a block, 4 in the session, for 9 athletes who all need a spot.
    const spot = station(1, 'hand-spot', 1, 120, true)
    // A floor for 8 at once, 10 s turns, for anyone else: 8 × 24 turns a block, no shortage of turns.
    const floor = station(2, 'floor-drill', 8, 10)
    const athletes = Array.from({ length: 9 }, (_, i) => athlete(i + 1, ['hand-spot']))
    const m = model({
      minutes: 10,
      blocks: 2,
      changeoverSeconds: 60,
      coaches: 1,
      stations: [spot, floor],
      athletes,
    })
    expect(explainInfeasible(m)).toEqual([
      '9 athletes need a spotter but one coach is present: the spotted stations give at most 4 turns in this session.',
    ])
  })

  it('says so when no coach is present for spotted steps', () => {
    const spot = station(1, 'hand-spot', 1, 30, true)
    const m = model({ coaches: 0, stations: [spot], athletes: [athlete(1, ['hand-spot'])] })
    expect(explainInfeasible(m)).toEqual(['one athlete needs a spotter but no coach is present.'])
  })

  it('names athletes whose steps no station serves, and blocks too short for a turn', () => {
    const m = model({
      minutes: 5,
      blocks: 2,
      changeoverSeconds: 120,
      stations: [station(1, 'trampoline', 1, 200)],
      athletes: [athlete(1, ['pit'])],
    })
    expect(explainInfeasible(m)).toEqual([
      'one athlete works on steps done on mini-trampoline into the foam pit, but no station chosen serves them (Athlete 1).',
      'Blocks leave 30 s of work: too short for one turn of 200 s at Station 1.',
      'one athlete is present but the stations give only 0 turns in 5 minutes.',
    ])
  })

  it('finds nothing wrong with a request every athlete can be served by', () => {
    const m = model({
      stations: [station(1, 'trampoline', 2, 30)],
      athletes: [athlete(1, ['trampoline'])],
    })
    expect(explainInfeasible(m)).toEqual([])
  })
})

describe('ratioWarnings', () => {
  // Figures: British Gymnastics guidance as a member club publishes it (see ratios.ts): at most
  // 16 gymnasts for one coach, at most 8 participants to one apparatus/station.
  const tramp = station(1, 'trampoline', 8, 30)
  const many = (n: number) => Array.from({ length: n }, (_, i) => athlete(i + 1, ['trampoline']))
  it.each([
    [16, 1, []],
    [17, 1, ['athletes-per-coach']],
    [32, 2, []],
    [33, 2, ['athletes-per-coach']],
    [4, 0, ['no-coach']],
  ])('%i athletes for %i coaches: %o', (athletes, coaches, codes) => {
    const m = model({ coaches, stations: [tramp], athletes: many(athletes) })
    expect(ratioWarnings(m).map((w) => w.code)).toEqual(codes)
  })

  it('warns of more than 8 athletes at one station in one block, naming the source', () => {
    const athletes = many(9)
    const m = model({ coaches: 1, stations: [tramp], athletes })
    const placed = athletes.map((a) => ({
      athleteId: a.id,
      block: 0,
      stationId: tramp.id,
      option: 0,
      turns: 1,
    }))
    const warnings = ratioWarnings(m, placed)
    expect(warnings.map((w) => w.code)).toEqual(['athletes-per-station'])
    expect(warnings[0]!.message).toContain('9 athletes at Station 1 in block 1')
    expect(warnings[0]!.message).toContain(ratioGuidance.source)
    expect(ratioWarnings(m, placed.slice(1))).toEqual([])
  })
})
