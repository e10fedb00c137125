// Readiness: the requirement profiles, which elements can meet a requirement, and each athlete
// about to change age category checked against the profile of the next one.

import { rotationClasses, twistBands, type Direction } from '../element.ts'
import { categoryChangesWithin, type AgeThresholdTable } from '../age-categories.ts'
import { forecastDate } from './formulas.ts'
import type {
  AuditAthlete,
  AuditElement,
  AuditProgress,
  ReadinessRow,
  Requirement,
  RequirementMatch,
  RequirementProfile,
  RequirementStatus,
} from './types.ts'

const wagFloorSource =
  "FIG Women's Artistic Gymnastics Code of Points 2022–2024, Section 13 Floor Exercise, Composition Requirements"

/**
 * Seeded from the published floor composition requirements. The dance passage (the first
 * requirement) is not an acrobatic element and is not in the catalogue, so it is left out.
 * Juniors compete under the same Code (from memory), so the profile serves both categories.
 */
export const womensArtisticFloorProfile: RequirementProfile = {
  id: 'fig-wag-floor-2022',
  label: "Women's artistic floor: acrobatic composition requirements",
  discipline: 'artistic-women',
  apparatus: 'floor',
  categories: ['junior', 'senior'],
  source: wagFloorSource,
  requirements: [
    {
      id: 'salto-full-twist',
      label: 'A salto with at least a full twist (360°)',
      source: wagFloorSource,
      matches: { minRotationClass: 'single', minTwistBand: 'full' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'double-salto',
      label: 'A double salto',
      source: wagFloorSource,
      matches: { minRotationClass: 'double' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'salto-forward-sideward',
      label: 'A salto forward or sideward',
      source: wagFloorSource,
      matches: { direction: ['forward', 'sideward'], minRotationClass: 'single' },
      minStepIndex: 'competition-ready',
    },
    {
      id: 'salto-backward',
      label: 'A salto backward',
      source: wagFloorSource,
      matches: { direction: 'backward', minRotationClass: 'single' },
      minStepIndex: 'competition-ready',
    },
  ],
}

export const defaultRequirementProfiles: readonly RequirementProfile[] = [
  womensArtisticFloorProfile,
]

/** Whether an element can meet a requirement, whatever the athlete's step on it. */
export function elementMatches(element: AuditElement, match: RequirementMatch): boolean {
  if (match.direction !== undefined) {
    const allowed: readonly Direction[] =
      // Stryker disable next-line StringLiteral: equivalent, no direction word (forward, backward, sideward) contains another, so a string's includes answers as the array's
      typeof match.direction === 'string' ? [match.direction] : match.direction
    if (!allowed.includes(element.direction)) return false
  }
  if (
    match.minRotationClass !== undefined &&
    rotationClasses.indexOf(element.rotationClass) < rotationClasses.indexOf(match.minRotationClass)
  ) {
    return false
  }
  if (
    match.minTwistBand !== undefined &&
    twistBands.indexOf(element.twistBand) < twistBands.indexOf(match.minTwistBand)
  ) {
    return false
  }
  return true
}

/** Rotation class, then twist band: how far an element is from the simplest salto. */
const levelOf = (element: AuditElement) =>
  rotationClasses.indexOf(element.rotationClass) * twistBands.length +
  twistBands.indexOf(element.twistBand)

/**
 * The positions in `elements` of those that can meet a requirement of `profile`: of the profile's
 * apparatus (a trampoline salto never meets a floor requirement) and matching the requirement,
 * simplest first (lowest rotation class, then lowest twist band), then by position.
 */
export function requirementCandidates(
  profile: Pick<RequirementProfile, 'apparatus'>,
  requirement: Pick<Requirement, 'matches'>,
  elements: readonly AuditElement[],
): number[] {
  const matching: number[] = []
  elements.forEach((e, i) => {
    if (e.apparatus === profile.apparatus && elementMatches(e, requirement.matches))
      matching.push(i)
  })
  return matching.sort((x, y) => levelOf(elements[x]!) - levelOf(elements[y]!) || x - y)
}

/**
 * Each athlete whose age category changes within the horizon, checked against the profile of
 * the next category. A requirement is met when any candidate element has reached its target
 * step. Otherwise the element suggested is the one nearest to what the athlete can build on:
 * the lowest rotation class and twist band that meets the requirement, then the fewest steps
 * still to climb, then the lowest id. (Counting steps alone would send a beginner to a double
 * salto whose progression happens to be short.)
 */
export function readinessRows(
  athletes: readonly AuditAthlete[],
  steps: readonly Map<number, number>[],
  elements: readonly AuditElement[],
  profiles: readonly RequirementProfile[],
  thresholds: AgeThresholdTable,
  paces: Readonly<Record<string, number>>,
  asOf: string,
  horizonMonths: number,
  onProgress: ((progress: AuditProgress) => void) | undefined,
): ReadinessRow[] {
  // Which elements can meet each requirement does not depend on the athlete: work it out once.
  const candidates = new Map<Requirement, number[]>()
  for (const profile of profiles) {
    for (const requirement of profile.requirements) {
      candidates.set(requirement, requirementCandidates(profile, requirement, elements))
    }
  }

  const rows: ReadinessRow[] = []
  athletes.forEach((athlete, a) => {
    const change = categoryChangesWithin(
      athlete.birthYear,
      athlete.discipline,
      asOf,
      horizonMonths,
      thresholds,
    )
    if (change === null) return
    const profile = profiles.find(
      (p) => p.discipline === athlete.discipline && p.categories.includes(change.to),
    )
    const athletePace = paces[athlete.id] ?? 0
    const byElement = steps[a]!
    const requirements = (profile?.requirements ?? []).map((requirement): RequirementStatus => {
      let nearest: {
        e: number
        level: number
        stepIndex: number | null
        target: number
        needed: number
      } | null = null
      // Stryker disable next-line ArrayDeclaration: equivalent, every requirement of every profile was given its candidates above
      for (const e of candidates.get(requirement) ?? []) {
        const element = elements[e]!
        const last = element.stepCount - 1
        const target =
          requirement.minStepIndex === 'competition-ready'
            ? last
            : Math.min(requirement.minStepIndex, last)
        if (target < 0) continue
        const stepIndex = byElement.get(e) ?? null
        const needed = Math.max(0, target - (stepIndex ?? -1))
        const level = levelOf(element)
        // Candidates come simplest first, then in id order: the first met one is taken; until
        // one is met, the simplest level stays and, on it, the fewest steps win.
        if (
          nearest === null ||
          (needed === 0 && nearest.needed > 0) ||
          (level === nearest.level && needed < nearest.needed)
        ) {
          nearest = { e, level, stepIndex, target, needed }
        }
        if (needed === 0) break
      }
      const met = nearest !== null && nearest.needed === 0
      const forecastOn =
        nearest === null || met ? null : forecastDate(asOf, nearest.needed, athletePace)
      return {
        requirementId: requirement.id,
        label: requirement.label,
        source: requirement.source,
        met,
        elementId: nearest === null ? null : elements[nearest.e]!.id,
        elementName: nearest === null ? null : elements[nearest.e]!.name,
        stepIndex: nearest?.stepIndex ?? null,
        targetStepIndex: nearest?.target ?? null,
        stepsNeeded: nearest?.needed ?? 0,
        forecastOn,
        onTime: forecastOn === null ? null : forecastOn <= change.startsOn,
        noMatchingElement: nearest === null,
      }
    })
    rows.push({
      athleteId: athlete.id,
      squadId: athlete.squadId,
      discipline: athlete.discipline,
      from: change.from,
      to: change.to,
      startsOn: change.startsOn,
      pace: athletePace,
      profileId: profile?.id ?? null,
      requirements,
      missingCount: requirements.filter((r) => !r.met).length,
    })
  })
  onProgress?.({ phase: 'readiness', done: rows.length, total: rows.length })
  return rows
}
