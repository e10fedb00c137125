import { setPriority } from 'node:os'
import type { Modality } from '../../shared/domain/element.ts'
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

/**
 * A made-up session of the usual size (20 athletes, 5 stations, 4 blocks) solved once before the
 * thread's first task: a thread's first solve runs HiGHS's WebAssembly before the engine has
 * optimised it, several times slower, and its stages' time limits could then cut a coach's first
 * plan short.
 */
function warmUpModel(): PlanModel {
  const modalities: Modality[] = ['trampoline', 'tumble-track', 'pit', 'floor-drill', 'hand-spot']
  const id = (prefix: number, n: number) =>
    `00000000-0000-4000-8000-${prefix.toString().padStart(4, '0')}${n.toString().padStart(8, '0')}`
  return {
    minutes: 40,
    blocks: 4,
    changeoverSeconds: 60,
    coaches: 2,
    stations: modalities.map((modality, i) => ({
      id: id(1, i),
      name: `Station ${i + 1}`,
      modality,
      capacity: 1 + (i % 3),
      secondsPerTurn: 20 + 7 * i,
      needsSpotter: modality === 'hand-spot',
    })),
    athletes: Array.from({ length: 20 }, (_, a) => ({
      id: id(2, a),
      name: `Athlete ${a + 1}`,
      options: [0, 1].map((k) => ({
        elementId: id(3, k),
        elementName: `Element ${k + 1}`,
        direction: 'forward' as const,
        stepIndex: 1,
        stepName: 'Step 2',
        modality: modalities[(a + k * 2) % modalities.length]!,
        kind: 'reached' as const,
      })),
    })),
  }
}

let warmedUp: Promise<unknown> | undefined

export interface SolveTask {
  model: PlanModel
  timeLimitSeconds?: number
}

/** Solves one plan on the solver's thread (HiGHS is loaded once per thread and reused). */
export default async function solveOnThread(task: SolveTask): Promise<SolvedPlan> {
  await (warmedUp ??= solvePlan(warmUpModel(), 2))
  return solvePlan(task.model, task.timeLimitSeconds)
}
