import type { Highs } from 'highs'
import { blockBound } from '../../shared/domain/planner/bound.ts'
import { pairs, planLp, readCounts, readSpotted } from '../../shared/domain/planner/lp.ts'
import { repairLayout } from '../../shared/domain/planner/repair.ts'
import { scheduleBlocks, spottedBlocks } from '../../shared/domain/planner/schedule.ts'
import { shareTurns } from '../../shared/domain/planner/turns.ts'
import type { Placement, PlanModel, SolverReport } from '../../shared/domain/planner/types.ts'

// HiGHS compiled to WebAssembly: loaded once per process (the .wasm sits beside the package's
// loader in node_modules, for the compiled server too) and reused by every solve. A solve runs
// synchronously on the calling thread; the time limit keeps it short.
let loading: Promise<Highs> | null = null

/** The process's HiGHS runtime, loaded on first use. */
export function loadHighs(): Promise<Highs> {
  loading ??= import('highs').then((m) => {
    // The package's ESM entry exports the loader as default; typed through its CommonJS face
    // (the compiled server's module setting), the default is the module with the loader inside.
    const mod = m as unknown as { default: Loader | { default: Loader } }
    const loader = typeof mod.default === 'function' ? mod.default : mod.default.default
    return loader()
  })
  return loading
}

type Loader = () => Promise<Highs>

export interface SolvedPlan {
  placements: Placement[]
  /** The smallest number of turns any athlete gets, as the first stage proved or found. */
  minTurns: number
  report: SolverReport
}

interface StageResult {
  status: string
  objective: number
  values: Map<string, number>
  gap: number
  bound: number
}

function statusName(highs: Highs, code: number): string {
  const entry = Object.entries(highs.constants.modelStatus).find(([, v]) => v === code)
  return entry?.[0] ?? 'unknown'
}

/**
 * One stage, started from a feasible plan (`start`, by column name; columns it does not name
 * start at 0, which the first stage's all-zero plan satisfies), so that a stage cut short by its
 * time limit on a busy machine still answers a plan. Null only if HiGHS holds none at all.
 */
function runStage(
  highs: Highs,
  lp: string,
  timeLimit: number,
  start?: ReadonlyMap<string, number>,
): StageResult | null {
  return highs.withModel({ format: 'lp', data: lp }, (model) => {
    model.options.set({ output_flag: false, time_limit: timeLimit, mip_rel_gap: 1e-6 })
    const { numCols } = model.getDimensions()
    const names = Array.from({ length: numCols }, (_, i) => model.getColName(i))
    model.setSolution({ colValue: names.map((name) => start?.get(name) ?? 0) })
    model.run()
    const status = statusName(highs, model.getModelStatus())
    if (Number(model.info.get('primal_solution_status')) !== 2) return null
    const { colValue } = model.getSolution()
    const values = new Map<string, number>()
    names.forEach((name, i) => values.set(name, colValue[i]!))
    return {
      status,
      objective: model.getObjectiveValue(),
      values,
      gap: Number(model.info.get('mip_gap')),
      bound: Number(model.info.get('mip_dual_bound')),
    }
  })
}

/**
 * Solves the plan lexicographically: first the largest smallest-number-of-turns any athlete gets,
 * then, with that held as a floor for everyone, the largest total; then lays the solution out
 * block by block, repairs the layout (for at most the time limit again) where it left the least
 * served athlete short of the solver's smallest, and shares the turns out (the same function the
 * screen uses after a move). The
 * report's gap compares the plan's total with the solver's proven bound on any plan's total.
 */
export async function solvePlan(model: PlanModel, timeLimitSeconds = 0.4): Promise<SolvedPlan> {
  const started = performance.now()
  if (pairs(model).length === 0) {
    return {
      placements: [],
      minTurns: 0,
      report: { status: 'optimal', gap: 0, bound: 0, milliseconds: 0 },
    }
  }
  const highs = await loadHighs()
  const first = runStage(highs, planLp(model), timeLimitSeconds)
  // A time-limited first stage may stop on a fractional bound; its incumbent is whole.
  const minTurns = first ? Math.max(0, Math.floor(first.objective + 1e-6)) : 0
  const second =
    runStage(highs, planLp(model, minTurns), timeLimitSeconds, first?.values) ??
    (first && { ...first, status: 'timeLimit', bound: blockBound(model) })
  if (!second) throw new Error('The planner’s solver found no plan in its time.')
  const spotted = readSpotted(model, second.values)
  const laidOut = scheduleBlocks(model, readCounts(model, second.values), spotted)
  const placements = shareTurns(
    model,
    repairLayout(model, laidOut, spottedBlocks(model, spotted), minTurns, timeLimitSeconds * 1000),
  )
  const total = placements.reduce((sum, p) => sum + p.turns, 0)
  const bound = Math.max(
    total,
    Number.isFinite(second.bound) ? Math.floor(second.bound + 1e-6) : total,
  )
  return {
    placements,
    minTurns,
    report: {
      status: second.status,
      gap: total > 0 ? (bound - total) / total : 0,
      bound,
      milliseconds: Math.round(performance.now() - started),
    },
  }
}
