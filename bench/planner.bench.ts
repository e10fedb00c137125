import { performance } from 'node:perf_hooks'
import { planFigures } from '../shared/domain/planner/figures.ts'
import type { PlanModel } from '../shared/domain/planner/types.ts'
import { loadHighs, solvePlan } from '../server/services/planner-solver.ts'
import type { Modality } from '../shared/domain/element.ts'

// `npm run bench -- planner`: 40 athletes × 8 stations × 90 minutes planned (both solver stages,
// the block layout and the turns) against a budget of 1 s, with the plan's total against the
// solver's proven bound (the optimality gap), and the laid-out plan's smallest number of turns
// against the solver's max-min. The baseline is the same plan's figures alone.

const modalities: Modality[] = [
  'trampoline',
  'tumble-track',
  'pit',
  'floor-drill',
  'soft-mat',
  'spotting-rig',
  'floor-solo',
  'hand-spot',
]

/** A session like a busy evening: every athlete has three focus steps on different stations. */
export function benchModel(): PlanModel {
  const id = (prefix: number, n: number) =>
    `00000000-0000-4000-8000-${prefix.toString().padStart(4, '0')}${n.toString().padStart(8, '0')}`
  return {
    minutes: 90,
    blocks: 6,
    changeoverSeconds: 60,
    coaches: 3,
    stations: modalities.map((modality, i) => ({
      id: id(1, i),
      name: `Station ${i + 1}`,
      modality,
      capacity: 1 + (i % 3),
      secondsPerTurn: 20 + 7 * i,
      needsSpotter: modality === 'spotting-rig' || modality === 'hand-spot',
    })),
    athletes: Array.from({ length: 40 }, (_, a) => ({
      id: id(2, a),
      name: `Athlete ${a + 1}`,
      options: [0, 1, 2].map((k) => ({
        elementId: id(3, k),
        elementName: `Element ${k + 1}`,
        direction: k === 2 ? ('backward' as const) : ('forward' as const),
        stepIndex: 1,
        stepName: 'Step 2',
        modality: modalities[(a + k * 3) % modalities.length]!,
        kind: 'reached' as const,
      })),
    })),
  }
}

export default async function plannerBench() {
  await loadHighs()
  const model = benchModel()
  const runs: {
    ms: number
    gap: number
    total: number
    bound: number
    min: number
    solverMin: number
  }[] = []
  for (let i = 0; i < 6; i++) {
    const started = performance.now()
    const solved = await solvePlan(model)
    const ms = performance.now() - started
    const figures = planFigures(model, solved.placements)
    if (i > 0)
      runs.push({
        ms,
        gap: solved.report.gap,
        total: figures.totalTurns,
        bound: solved.report.bound,
        min: figures.minTurns,
        solverMin: solved.minTurns,
      })
  }
  const baselineStart = performance.now()
  for (let i = 0; i < 5; i++) planFigures(model, [])
  const baseline = (performance.now() - baselineStart) / 5
  const sorted = runs.map((r) => r.ms).sort((a, b) => a - b)
  const median = sorted[Math.floor(sorted.length / 2)]!
  const worst = sorted[sorted.length - 1]!
  const last = runs[runs.length - 1]!
  console.log('\nplanner: 40 athletes × 8 stations × 90 minutes (6 blocks)')
  console.log(
    `  measured:  median ${median.toFixed(0)} ms, worst ${worst.toFixed(0)} ms (budget 1000 ms)`,
  )
  console.log(`  baseline (the figures alone): ${baseline.toFixed(2)} ms`)
  console.log(
    `  plan: ${last.total} turns; solver bound ${last.bound}; optimality gap ${(last.gap * 100).toFixed(2)} %`,
  )
  const short = runs.filter((r) => r.min < r.solverMin).length
  console.log(
    `  smallest number of turns: plan ${last.min}, solver's optimum ${last.solverMin} (${short ? `SHORT in ${short} of ${runs.length} runs` : 'equal in every run'})`,
  )
  console.log(`  ${worst < 1000 ? 'within' : 'OVER'} the 1 s budget`)
}
