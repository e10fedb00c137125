import { blockBound, physicalBound } from './bound.ts'
import { blockSeconds, optionAt } from './model.ts'
import type { Placement, PlanModel } from './types.ts'

export interface AthleteFigures {
  athleteId: string
  turns: number
  /** Seconds of the session not spent turning: queueing, changeovers, blocks without a station. */
  idleSeconds: number
  forwardTurns: number
  backwardTurns: number
}

export interface PlanFigures {
  athletes: AthleteFigures[]
  minTurns: number
  totalTurns: number
  forwardTurns: number
  backwardTurns: number
  /** Turns the stations could still give in the blocks as planned. */
  unusedStationTurns: number
  physicalBound: number
  blockBound: number
  /** Rules a plan (after a move) breaks: placements the figures cannot stand behind. */
  problems: string[]
}

/**
 * The figures of a plan: each athlete's turns, idle time and forward/backward split, the
 * session's totals and the bounds. The same function on the server and on the coach's screen.
 */
export function planFigures(model: PlanModel, placements: readonly Placement[]): PlanFigures {
  const session = blockSeconds(model) * model.blocks
  const stations = new Map(model.stations.map((s) => [s.id, s]))
  const problems: string[] = []
  const spottedPerBlock = new Map<number, Set<string>>()
  const athletes = model.athletes.map((athlete) => {
    const mine = placements.filter((p) => p.athleteId === athlete.id)
    let turns = 0
    let busy = 0
    let forwardTurns = 0
    let backwardTurns = 0
    const blocks = new Set<number>()
    for (const p of mine) {
      const station = stations.get(p.stationId)
      if (!station) continue
      if (blocks.has(p.block))
        problems.push(`${athlete.name} is at two stations in block ${p.block + 1}.`)
      blocks.add(p.block)
      if (optionAt(athlete, station) === null)
        problems.push(`${station.name} serves none of ${athlete.name}'s focus steps.`)
      if (station.needsSpotter) {
        const set = spottedPerBlock.get(p.block) ?? new Set<string>()
        set.add(station.id)
        spottedPerBlock.set(p.block, set)
      }
      turns += p.turns
      busy += p.turns * station.secondsPerTurn
      const direction = athlete.options[p.option]?.direction
      if (direction === 'forward') forwardTurns += p.turns
      if (direction === 'backward') backwardTurns += p.turns
    }
    return {
      athleteId: athlete.id,
      turns,
      idleSeconds: session - busy,
      forwardTurns,
      backwardTurns,
    }
  })
  for (const [block, set] of spottedPerBlock) {
    if (set.size > model.coaches)
      problems.push(
        `Block ${block + 1} has ${set.size} spotted stations but ${model.coaches} coach${model.coaches === 1 ? '' : 'es'}.`,
      )
  }
  const totalTurns = athletes.reduce((sum, a) => sum + a.turns, 0)
  const bound = blockBound(model)
  return {
    athletes,
    minTurns: athletes.length ? Math.min(...athletes.map((a) => a.turns)) : 0,
    totalTurns,
    forwardTurns: athletes.reduce((sum, a) => sum + a.forwardTurns, 0),
    backwardTurns: athletes.reduce((sum, a) => sum + a.backwardTurns, 0),
    unusedStationTurns: bound - totalTurns,
    physicalBound: physicalBound(model),
    blockBound: bound,
    problems,
  }
}
