// The quarterly audit: how far each athlete's forward repertoire keeps up with their backward
// one (and the reverse), per squad and for the scope, where the catalogue itself lacks forward
// counterparts, and who is about to change age category without the elements the next category
// asks for. Everything here is pure so that a stored result can be recomputed from its inputs and
// checked against their hash.

import { rotationClasses, twistBands, type RotationClass } from '../element.ts'
import { defaultAgeThresholds } from '../age-categories.ts'
import { displayNames } from '../element-names.ts'
import {
  balanceRatio,
  compareText,
  findCatalogueGaps,
  gapDeficit,
  lagFrom,
  proficiency,
} from './formulas.ts'
import { defaultRequirementProfiles, readinessRows } from './readiness.ts'
import type {
  AthleteBalance,
  AuditInputs,
  AuditOptions,
  AuditProgress,
  AuditResult,
  CoverageCell,
  CoverageSide,
  GapEntry,
  ResolvedAuditOptions,
  SquadBreakdown,
} from './types.ts'

/**
 * Weights on a gap's deficit by the backward element's rotation class: a missing forward double
 * costs a routine more than a missing forward single. Common practice (no published source).
 */
export const defaultRotationWeights: Readonly<Record<RotationClass, number>> = {
  none: 0.5,
  single: 1,
  double: 2,
  triple: 3,
}

/** Resolves the defaults, so that a stored result names every option it was computed with. */
export function resolveAuditOptions(options: AuditOptions = {}): ResolvedAuditOptions {
  return {
    gapThresholdSteps: options.gapThresholdSteps ?? 2,
    rotationWeights: options.rotationWeights ?? defaultRotationWeights,
    horizonMonths: options.horizonMonths ?? 12,
  }
}

interface SideSums {
  forward: number
  backward: number
  forwardMirrored: number
  backwardMirrored: number
}

const emptySums = (): SideSums => ({
  forward: 0,
  backward: 0,
  forwardMirrored: 0,
  backwardMirrored: 0,
})

function addSums(into: SideSums, from: SideSums) {
  into.forward += from.forward
  into.backward += from.backward
  into.forwardMirrored += from.forwardMirrored
  into.backwardMirrored += from.backwardMirrored
}

/**
 * Runs the audit. Athletes, elements and records are indexed once, then each athlete is visited
 * through their own records only, so the cost grows with the number of records (plus elements ×
 * requirements for readiness), never with athletes × elements.
 *
 * Only backward and forward elements enter the lags, the balance ratio and the coverage grid;
 * sideward ones count only towards requirements that ask for them. Records of athletes or
 * elements outside the inputs are ignored; several records of one pair count as the highest.
 * Results are sorted by id (gaps by rank), so they do not depend on the order of the inputs.
 *
 * @throws RangeError when two elements or two athletes share an id.
 */
export function runAudit(
  inputs: AuditInputs,
  options: AuditOptions = {},
  onProgress?: (progress: AuditProgress) => void,
): AuditResult {
  const resolved = resolveAuditOptions(options)
  const { asOf } = inputs
  const profiles = inputs.profiles ?? defaultRequirementProfiles
  const thresholds = inputs.ageThresholds ?? defaultAgeThresholds
  // Names as the lists show them: an element whose name is also used on another apparatus
  // carries its apparatus, so a floor gap is never mistaken for a trampoline one.
  const shownName = displayNames(inputs.elements)
  const elements = [...inputs.elements]
    .sort((a, b) => compareText(a.id, b.id))
    .map((e) => ({ ...e, name: shownName.get(e.id)! }))
  const athletes = [...inputs.athletes].sort((a, b) => compareText(a.id, b.id))

  const elementAt = new Map<string, number>()
  elements.forEach((e, i) => {
    if (elementAt.has(e.id)) throw new RangeError(`Two elements share the id ${e.id}.`)
    elementAt.set(e.id, i)
  })
  const athleteAt = new Map<string, number>()
  athletes.forEach((a, i) => {
    if (athleteAt.has(a.id)) throw new RangeError(`Two athletes share the id ${a.id}.`)
    athleteAt.set(a.id, i)
  })
  const counterpartAt = elements.map((e) =>
    e.counterpartId === null ? -1 : (elementAt.get(e.counterpartId) ?? -1),
  )
  const cellOf = elements.map(
    (e) =>
      rotationClasses.indexOf(e.rotationClass) * twistBands.length +
      twistBands.indexOf(e.twistBand),
  )
  const cellCount = rotationClasses.length * twistBands.length

  onProgress?.({ phase: 'records', done: 0, total: inputs.records.length })
  const steps: Map<number, number>[] = athletes.map(() => new Map())
  for (const record of inputs.records) {
    if (record.stepIndex === null || record.stepIndex < 0) continue
    const a = athleteAt.get(record.athleteId)
    const e = elementAt.get(record.elementId)
    if (a === undefined || e === undefined) continue
    const byElement = steps[a]!
    const before = byElement.get(e)
    if (before === undefined || record.stepIndex > before) byElement.set(e, record.stepIndex)
  }
  onProgress?.({ phase: 'records', done: inputs.records.length, total: inputs.records.length })

  const weightOf = resolved.rotationWeights
  const athleteRows: AthleteBalance[] = []
  const athleteSums: SideSums[] = []
  const gaps: GapEntry[] = []
  const gapsByAthlete = new Array<number>(athletes.length).fill(0)
  const coverageSums = {
    forward: new Float64Array(cellCount),
    backward: new Float64Array(cellCount),
  }
  const best = { forward: new Float64Array(cellCount), backward: new Float64Array(cellCount) }
  const reportEvery = Math.max(1, Math.ceil(athletes.length / 20))

  athletes.forEach((athlete, a) => {
    const byElement = steps[a]!
    const p = (e: number) => {
      const s = byElement.get(e)
      return s === undefined ? 0 : proficiency(s, elements[e]!.stepCount)
    }
    const sums = emptySums()
    best.forward.fill(0)
    best.backward.fill(0)
    for (const [e, stepIndex] of byElement) {
      const element = elements[e]!
      const side = element.direction
      if (side !== 'forward' && side !== 'backward') continue
      const pe = proficiency(stepIndex, element.stepCount)
      const c = counterpartAt[e]!
      const mirrored = Math.min(pe, c === -1 ? 0 : p(c))
      const cell = cellOf[e]!
      if (pe > best[side][cell]!) best[side][cell] = pe
      if (side === 'forward') {
        sums.forward += pe
        sums.forwardMirrored += mirrored
        continue
      }
      sums.backward += pe
      sums.backwardMirrored += mirrored

      const counterpart = c === -1 ? null : elements[c]!
      const counterpartStep = c === -1 ? null : (byElement.get(c) ?? null)
      const deficit = gapDeficit(
        { stepIndex, stepCount: element.stepCount },
        counterpart === null
          ? null
          : { stepIndex: counterpartStep, stepCount: counterpart.stepCount },
      )
      const missing = counterpart === null
      const neverStarted = !missing && counterpartStep === null
      if (missing || neverStarted || deficit >= resolved.gapThresholdSteps) {
        const weight = weightOf[element.rotationClass]
        gaps.push({
          athleteId: athlete.id,
          squadId: athlete.squadId,
          elementId: element.id,
          elementName: element.name,
          rotationClass: element.rotationClass,
          counterpartId: element.counterpartId,
          counterpartName: counterpart?.name ?? null,
          stepIndex,
          counterpartStepIndex: counterpartStep,
          deficitSteps: deficit,
          weight,
          weightedDeficit: deficit * weight,
          counterpartMissing: missing,
          counterpartNeverStarted: neverStarted,
          stepCount: element.stepCount,
          counterpartStepCount: counterpart?.stepCount ?? null,
        })
        // A gap whose forward element the catalogue lacks is the director's to fix, not the
        // athlete's: counted with the catalogue gaps, not among the athlete's gaps.
        if (!missing) gapsByAthlete[a]!++
      }
    }
    for (let cell = 0; cell < cellCount; cell++) {
      coverageSums.forward[cell]! += best.forward[cell]!
      coverageSums.backward[cell]! += best.backward[cell]!
    }
    athleteSums.push(sums)
    athleteRows.push({
      athleteId: athlete.id,
      squadId: athlete.squadId,
      frontLag: byElement.size === 0 ? null : lagFrom(sums.backwardMirrored, sums.backward),
      backLag: byElement.size === 0 ? null : lagFrom(sums.forwardMirrored, sums.forward),
      forwardProficiency: sums.forward,
      backwardProficiency: sums.backward,
    })
    if ((a + 1) % reportEvery === 0 || a + 1 === athletes.length) {
      onProgress?.({ phase: 'athletes', done: a + 1, total: athletes.length })
    }
  })

  onProgress?.({ phase: 'gaps', done: 0, total: gaps.length })
  // Gaps a coach can act on first; those waiting for the catalogue after them, however large.
  gaps.sort(
    (x, y) =>
      Number(x.counterpartMissing) - Number(y.counterpartMissing) ||
      y.weightedDeficit - x.weightedDeficit ||
      y.deficitSteps - x.deficitSteps ||
      compareText(x.athleteId, y.athleteId) ||
      compareText(x.elementId, y.elementId),
  )
  onProgress?.({ phase: 'gaps', done: gaps.length, total: gaps.length })

  const elementCounts = {
    forward: new Array(cellCount).fill(0),
    backward: new Array(cellCount).fill(0),
  }
  elements.forEach((e, i) => {
    if (e.direction === 'forward' || e.direction === 'backward')
      elementCounts[e.direction][cellOf[i]!]++
  })
  const coverage: CoverageCell[] = []
  for (const [r, rotationClass] of rotationClasses.entries()) {
    for (const [t, twistBand] of twistBands.entries()) {
      const cell = r * twistBands.length + t
      const side = (direction: 'forward' | 'backward'): CoverageSide => ({
        mean: athletes.length === 0 ? 0 : coverageSums[direction][cell]! / athletes.length,
        elementCount: elementCounts[direction][cell] as number,
      })
      coverage.push({
        rotationClass,
        twistBand,
        forward: side('forward'),
        backward: side('backward'),
      })
    }
  }

  const readiness = readinessRows(
    athletes,
    steps,
    elements,
    profiles,
    thresholds,
    inputs.paces ?? {},
    asOf,
    resolved.horizonMonths,
    onProgress,
  )
  const alertAthletes = new Set(readiness.filter((r) => r.missingCount > 0).map((r) => r.athleteId))

  const squadIndex = new Map<string, { sums: SideSums; athletes: number[] }>()
  athletes.forEach((athlete, a) => {
    let squad = squadIndex.get(athlete.squadId)
    if (squad === undefined) {
      squad = { sums: emptySums(), athletes: [] }
      squadIndex.set(athlete.squadId, squad)
    }
    addSums(squad.sums, athleteSums[a]!)
    squad.athletes.push(a)
  })
  const squads: SquadBreakdown[] = [...squadIndex.entries()]
    .sort(([x], [y]) => compareText(x, y))
    .map(([squadId, { sums, athletes: members }]) => {
      const withRecords = members.filter((a) => steps[a]!.size > 0).length
      return {
        squadId,
        athleteCount: members.length,
        athletesWithRecords: withRecords,
        frontLag: withRecords === 0 ? null : lagFrom(sums.backwardMirrored, sums.backward),
        backLag: withRecords === 0 ? null : lagFrom(sums.forwardMirrored, sums.forward),
        forwardProficiency: sums.forward,
        backwardProficiency: sums.backward,
        balanceRatio: balanceRatio(sums.forward, sums.backward),
        gapCount: members.reduce((n, a) => n + gapsByAthlete[a]!, 0),
        athletesWithGaps: members.filter((a) => gapsByAthlete[a]! > 0).length,
        readinessAlerts: members.filter((a) => alertAthletes.has(athletes[a]!.id)).length,
      }
    })
  const anyRecords = steps.some((byElement) => byElement.size > 0)

  const total = emptySums()
  for (const sums of athleteSums) addSums(total, sums)
  const affected = new Map<string, number>()
  for (const g of gaps) {
    if (g.counterpartMissing) affected.set(g.elementId, (affected.get(g.elementId) ?? 0) + 1)
  }
  const catalogueGaps = findCatalogueGaps(elements).map((c) => ({
    ...c,
    athleteCount: affected.get(c.elementId) ?? 0,
  }))

  const result: AuditResult = {
    asOf,
    options: resolved,
    headline: {
      athleteCount: athletes.length,
      clubFrontLag: anyRecords ? lagFrom(total.backwardMirrored, total.backward) : null,
      clubBackLag: anyRecords ? lagFrom(total.forwardMirrored, total.forward) : null,
      balanceRatio: balanceRatio(total.forward, total.backward),
      squadFrontLags: Object.fromEntries(squads.map((s) => [s.squadId, s.frontLag])),
      squadsWithoutRecords: squads.filter((s) => s.athletesWithRecords === 0).length,
      catalogueGaps: catalogueGaps.length,
      gapCount: gaps.filter((g) => !g.counterpartMissing).length,
      athletesWithGaps: gapsByAthlete.filter((n) => n > 0).length,
      readinessAlerts: alertAthletes.size,
    },
    athletes: athleteRows,
    squads,
    coverage,
    catalogueGaps,
    gaps,
    readiness,
  }
  onProgress?.({ phase: 'done', done: 1, total: 1 })
  return result
}
