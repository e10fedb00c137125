import { optionAt, stationBlockTurns, turnsPerBlock } from './model.ts'
import type { PlanModel } from './types.ts'

// The plan as a mixed-integer program in the CPLEX LP format that HiGHS reads. It counts blocks
// rather than naming them (the blocks are interchangeable, and a program over every athlete ×
// station × block drowns the solver in symmetric choices); `scheduleBlocks` then lays the counts
// out block by block.
//   n_a_s ∈ {0..B}   blocks athlete a spends at station s (only where it serves a focus step)
//   T_a_s ∈ ℤ≥0      turns a takes there: at most the station's turns per block in each of them
//   m_s   ∈ {0..B}   blocks a coach spots at station s (stations that need a spotter)
//   z                the smallest number of turns any athlete gets
// Each athlete is in at most B blocks; a station gives at most its turns per block in each block
// (a spotted one only in the blocks a coach is there); the coaches spot at most coaches × B
// station-blocks. Stage 1 maximises z; stage 2 holds every athlete at z* or more and maximises
// the sum of turns. Any block-by-block plan satisfies these, so stage 2's optimum bounds every
// plan's total from above.

export interface Pair {
  a: number
  s: number
  /** The station's turns per block for one athlete. */
  r: number
}

/** The (athlete, station) pairs the program has variables for. */
export function pairs(model: PlanModel): Pair[] {
  const out: Pair[] = []
  model.athletes.forEach((athlete, a) =>
    model.stations.forEach((station, s) => {
      const r = turnsPerBlock(model, station)
      if (r > 0 && optionAt(athlete, station) !== null) out.push({ a, s, r })
    }),
  )
  return out
}

const n = (p: Pair) => `n_${p.a}_${p.s}`
const T = (p: Pair) => `T_${p.a}_${p.s}`

function joined(terms: string[], sign: '+' | '-'): string {
  const lines: string[] = []
  for (let i = 0; i < terms.length; i += 20) lines.push(terms.slice(i, i + 20).join(` ${sign} `))
  return lines.join(`\n   ${sign} `)
}

/**
 * The LP text of one stage. Without `minTurns`: stage 1 (maximise the smallest total). With it:
 * stage 2 (every athlete who can be placed gets at least `minTurns`; maximise the sum).
 */
export function planLp(model: PlanModel, minTurns?: number): string {
  const all = pairs(model)
  const B = model.blocks
  const rows: string[] = []
  model.athletes.forEach((_, a) => {
    const mine = all.filter((p) => p.a === a)
    if (mine.length) rows.push(` blocks_${a}: ${joined(mine.map(n), '+')} <= ${B}`)
    for (const p of mine) rows.push(` rate_${a}_${p.s}: ${T(p)} - ${p.r} ${n(p)} <= 0`)
    if (minTurns === undefined) {
      rows.push(
        mine.length ? ` min_${a}: z - ${joined(mine.map(T), '-')} <= 0` : ` min_${a}: z <= 0`,
      )
    } else if (minTurns > 0 && mine.length) {
      rows.push(` min_${a}: ${joined(mine.map(T), '+')} >= ${minTurns}`)
    }
  })
  const spotted: string[] = []
  model.stations.forEach((station, s) => {
    const here = all.filter((p) => p.s === s)
    if (!here.length) return
    const turns = stationBlockTurns(model, station)
    if (station.needsSpotter) {
      spotted.push(`m_${s}`)
      rows.push(` st_${s}: ${joined(here.map(T), '+')} - ${turns} m_${s} <= 0`)
      for (const p of here) rows.push(` sp_${p.a}_${s}: ${n(p)} - m_${s} <= 0`)
    } else {
      rows.push(` st_${s}: ${joined(here.map(T), '+')} <= ${turns * B}`)
    }
  })
  if (spotted.length) rows.push(` coaches: ${joined(spotted, '+')} <= ${model.coaches * B}`)

  const bounds = [
    ...all.flatMap((p) => [` 0 <= ${n(p)} <= ${B}`, ` 0 <= ${T(p)} <= ${p.r * B}`]),
    ...spotted.map((m) => ` 0 <= ${m} <= ${B}`),
  ]
  const ints = [...all.flatMap((p) => [n(p), T(p)]), ...spotted]
  const objective = minTurns === undefined ? 'z' : joined(all.map(T), '+')
  if (minTurns === undefined) bounds.push(' z >= 0')
  const general: string[] = []
  for (let i = 0; i < ints.length; i += 20) general.push(' ' + ints.slice(i, i + 20).join(' '))
  return [
    'Maximize',
    ` obj: ${objective}`,
    'Subject To',
    ...rows,
    'Bounds',
    ...bounds,
    ...(general.length ? ['General', ...general] : []),
    'End',
    '',
  ].join('\n')
}

/** Blocks per athlete and station as the solver chose them: counts[a][s]. */
export function readCounts(model: PlanModel, values: ReadonlyMap<string, number>): number[][] {
  const counts = model.athletes.map(() => model.stations.map(() => 0))
  for (const p of pairs(model)) counts[p.a]![p.s] = Math.round(values.get(n(p)) ?? 0)
  return counts
}

/** Blocks a coach spots at each station as the solver chose them (0 for unspotted stations). */
export function readSpotted(model: PlanModel, values: ReadonlyMap<string, number>): number[] {
  return model.stations.map((_, s) => Math.round(values.get(`m_${s}`) ?? 0))
}
