import { stationBlockTurns, workSeconds } from './model.ts'
import type { PlanModel } from './types.ts'

/**
 * The physical bound: no plan gives more turns than Σ over stations of (athletes at once ×
 * ⌊seconds the station is in use ÷ seconds per turn⌋), the station being in use for every
 * block's working seconds.
 */
export function physicalBound(model: PlanModel): number {
  const inUse = workSeconds(model) * model.blocks
  return model.stations.reduce(
    (sum, s) => sum + s.capacity * Math.floor(inUse / s.secondsPerTurn),
    0,
  )
}

/**
 * The tighter bound once the session is cut into blocks (a turn does not run across a
 * changeover): Σ over blocks and stations of the station's turns in a block.
 */
export function blockBound(model: PlanModel): number {
  return model.blocks * model.stations.reduce((sum, s) => sum + stationBlockTurns(model, s), 0)
}
