import { afterAll, describe, expect, it } from 'vitest'
import { closePlannerPool, solvePlanOffThread } from '../../server/services/planner-pool.ts'
import { solvePlan } from '../../server/services/planner-solver.ts'
import type { Modality } from '../../shared/domain/element.ts'
import type { PlanModel } from '../../shared/domain/planner/types.ts'
import { athlete, model, station } from '../support/planner.ts'

// The solve (synchronous WebAssembly) runs on the planner's worker thread: while it works, the
// request loop keeps turning. A 10 ms timer stands for the loop; its longest pause is measured
// while a large plan is solved on the thread, and, to show the measure can fail, while the same
// plan is solved on the loop itself.

const modalities: Modality[] = ['trampoline', 'tumble-track', 'pit', 'floor-drill', 'hand-spot']

/** 40 athletes × 5 stations × 90 minutes: a solve of several hundred milliseconds. */
function largeModel(): PlanModel {
  return model({
    minutes: 90,
    blocks: 6,
    changeoverSeconds: 60,
    coaches: 2,
    stations: modalities.map((m, i) =>
      station(i + 1, m, 1 + (i % 3), 20 + 7 * i, m === 'hand-spot'),
    ),
    athletes: Array.from({ length: 40 }, (_, a) =>
      athlete(
        a + 1,
        [0, 1, 2].map((k) => modalities[(a + k * 2) % modalities.length]!),
      ),
    ),
  })
}

/** Runs `work` while a 10 ms timer ticks; the longest gap between ticks and the work's time. */
async function whileTicking<T>(work: () => Promise<T>) {
  let last = performance.now()
  let longest = 0
  const timer = setInterval(() => {
    const now = performance.now()
    longest = Math.max(longest, now - last)
    last = now
  }, 10)
  const started = performance.now()
  const result = await work()
  const elapsed = performance.now() - started
  clearInterval(timer)
  longest = Math.max(longest, performance.now() - last)
  return { result, longest, elapsed }
}

afterAll(() => closePlannerPool())

describe('solvePlanOffThread', () => {
  it('solves on the worker thread while the loop keeps turning', async () => {
    // Warm the thread (start, loading tsx and HiGHS) so the measure is of the solve itself.
    await solvePlanOffThread(
      model({ stations: [station(1, 'pit', 1, 30)], athletes: [athlete(1, ['pit'])] }),
    )
    const m = largeModel()
    const off = await whileTicking(() => solvePlanOffThread(m, 2))
    const on = await whileTicking(() => solvePlan(m, 2))
    // The same plan both ways (the solve is deterministic).
    expect(off.result.minTurns).toBe(on.result.minTurns)
    expect(off.result.placements.length).toBeGreaterThan(0)
    // On the loop, the timer stops for a whole stage; on the thread, it keeps firing.
    expect(on.longest).toBeGreaterThan(100)
    expect(off.longest).toBeLessThan(on.longest / 2)
    expect(off.longest).toBeLessThan(off.elapsed / 2)
  })
})
