import type { Placement, PlanModel } from './types.ts'

// Supervision guidance. British Gymnastics' reasonable-ratio guidance, quoted on a member club's
// published policy page (a secondary source: the federation's own text was not found here;
// "British Gymnastics recommends the following reasonable ratio"): "Normally, one coach would not be expected to
// supervise more than 16 gymnasts, without other suitably qualified coaches being in
// attendance" and "The recommended maximum number of participants to one apparatus/station is 8
// participants". Other federations publish other figures: the national federation's rules and
// local regulations decide.
export const ratioGuidance = {
  athletesPerCoach: 16,
  athletesPerStation: 8,
  source:
    'British Gymnastics guidance on coach:gymnast ratios, as quoted in a member club’s published policy (secondary source)',
} as const

export interface RatioWarning {
  code: 'no-coach' | 'athletes-per-coach' | 'athletes-per-station'
  message: string
}

/**
 * Warnings where the session's athletes per coach, or the athletes at one station in one block,
 * exceed the published guidance above. Shown with the safety caution; never a refusal.
 */
export function ratioWarnings(
  model: Pick<PlanModel, 'athletes' | 'coaches' | 'stations'>,
  placements: readonly Placement[] = [],
): RatioWarning[] {
  const out: RatioWarning[] = []
  const present = model.athletes.length
  if (model.coaches === 0) {
    out.push({ code: 'no-coach', message: `${present} athletes and no coach present.` })
  } else if (present / model.coaches > ratioGuidance.athletesPerCoach) {
    out.push({
      code: 'athletes-per-coach',
      message: `${present} athletes for ${model.coaches} coach${model.coaches === 1 ? '' : 'es'}: more than the ${ratioGuidance.athletesPerCoach} per coach of the guidance (${ratioGuidance.source}).`,
    })
  }
  const heads = new Map<string, number>()
  for (const p of placements) {
    const key = `${p.stationId}|${p.block}`
    heads.set(key, (heads.get(key) ?? 0) + 1)
  }
  for (const [key, n] of heads) {
    if (n <= ratioGuidance.athletesPerStation) continue
    const [stationId, block] = key.split('|')
    const station = model.stations.find((s) => s.id === stationId)
    out.push({
      code: 'athletes-per-station',
      message: `${n} athletes at ${station?.name ?? 'one station'} in block ${Number(block) + 1}: more than the ${ratioGuidance.athletesPerStation} per station of the guidance (${ratioGuidance.source}).`,
    })
  }
  return out
}
