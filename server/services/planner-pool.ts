import { extname } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Piscina } from 'piscina'
import type { PlanModel } from '../../shared/domain/planner/types.ts'
import type { SolvedPlan } from './planner-solver.ts'
import type { SolveTask } from './planner-solver.worker.ts'

// The worker is TypeScript where the server runs from its sources (tsx, vitest) and JavaScript
// once compiled (build/server/services/planner-solver.worker.js); a TypeScript worker loads tsx.
const ownExtension = extname(fileURLToPath(import.meta.url))
const workerUrl = new URL(`./planner-solver.worker${ownExtension}`, import.meta.url)
const execArgv = ownExtension === '.ts' ? ['--import', import.meta.resolve('tsx')] : []

let pool: Piscina | undefined

/**
 * A solve is synchronous WebAssembly (HiGHS, up to about a second in its two stages): it runs on
 * one worker thread of the web process, started on first use and kept until shutdown, so the
 * request loop keeps answering meanwhile. Solves queue for the one thread; the
 * thread runs at a lower priority than the loop (`planner-solver.worker.ts`).
 */
export async function solvePlanOffThread(
  model: PlanModel,
  timeLimitSeconds?: number,
): Promise<SolvedPlan> {
  pool ??= new Piscina({
    filename: workerUrl.href,
    // Once started, the thread stays (warm: see the worker) until the server closes.
    minThreads: 1,
    maxThreads: 1,
    execArgv,
  })
  const task: SolveTask = { model, timeLimitSeconds }
  return (await pool.run(task)) as SolvedPlan
}

/** Ends the solver's thread, if any, at shutdown. */
export async function closePlannerPool() {
  const closing = pool
  pool = undefined
  await closing?.close()
}
