import { setPriority } from 'node:os'
import type { PlanModel } from '../../shared/domain/planner/types.ts'
import { solvePlan, type SolvedPlan } from './planner-solver.ts'

/** How much lower than the web process's request loop the solver's thread runs (nice 5 of 19). */
const plannerNiceness = 5

// On Linux a niceness belongs to a thread (see `server/jobs/priority.ts`): lowering this one, the
// solver's thread, lets the web process's own request loop go first on a busy machine. A system
// that refuses leaves the thread at normal priority.
try {
  setPriority(plannerNiceness)
} catch {
  // Refused: the solve runs at normal priority.
}

export interface SolveTask {
  model: PlanModel
  timeLimitSeconds?: number
}

/** Solves one plan on the solver's thread (HiGHS is loaded once per thread and reused). */
export default function solveOnThread(task: SolveTask): Promise<SolvedPlan> {
  return solvePlan(task.model, task.timeLimitSeconds)
}
