import { uniformInt } from 'pure-rand/distribution/uniformInt'
import type { RandomGenerator } from 'pure-rand/types/RandomGenerator'
import type { RotationClass, TwistBand } from '../shared/domain/element.ts'
import type { SquadLevel } from '../shared/domain/club.ts'
import type { HistoryEvent } from '../server/services/progress-history.ts'

// Eighteen months of plausible progress for the demo club, made up but deterministic: the same
// random seed and day give the same history. One squad's forward program clearly trails its
// backward one (Falcons), one is balanced (Kites); a few records are paused and a few skips are
// flagged, so that every screen has something real to show.

export interface DemoElement {
  id: string
  apparatus: string
  direction: string
  rotationClass: RotationClass
  twistBand: TwistBand
  counterpartId: string | null
  stepCount: number
}

export interface DemoAthlete {
  id: string
  squadName: string
  level: SquadLevel
}

interface SquadPlan {
  apparatus: string[]
  rotations: RotationClass[]
  twists: TwistBand[]
  /** How far the forward mirror gets, as a share of the backward element's steps. */
  forwardShare: [number, number]
  /** How far the backward elements get, as a share of their progression. */
  backwardShare: [number, number]
}

const plans: Record<string, SquadPlan> = {
  Fledglings: {
    apparatus: ['floor', 'trampoline'],
    rotations: ['none', 'single'],
    twists: ['none'],
    forwardShare: [0.7, 1],
    backwardShare: [0.2, 0.7],
  },
  Kites: {
    apparatus: ['floor', 'trampoline'],
    rotations: ['none', 'single'],
    twists: ['none', 'half', 'full'],
    forwardShare: [0.85, 1.1],
    backwardShare: [0.4, 0.9],
  },
  Falcons: {
    apparatus: ['floor', 'trampoline'],
    rotations: ['single', 'double'],
    twists: ['none', 'half', 'full', 'more'],
    forwardShare: [0.1, 0.5],
    backwardShare: [0.5, 1],
  },
  Harriers: {
    apparatus: ['tumbling', 'floor'],
    rotations: ['single', 'double', 'triple'],
    twists: ['none', 'half', 'full', 'more'],
    forwardShare: [0.4, 0.8],
    backwardShare: [0.6, 1],
  },
}

const dayMs = 86_400_000
const iso = (d: Date) => d.toISOString().slice(0, 10)

export function demoHistory(
  rng: RandomGenerator,
  today: Date,
  athletes: DemoAthlete[],
  catalogue: DemoElement[],
  coachOf: (squadName: string) => string,
): HistoryEvent[] {
  const events: HistoryEvent[] = []
  const start = today.getTime() - 540 * dayMs
  const share = ([lo, hi]: [number, number]) => lo + (uniformInt(rng, 0, 1000) / 1000) * (hi - lo)
  const byId = new Map(catalogue.map((e) => [e.id, e]))

  /** Steps 0..reached, one by one, spread from `from` to a few days ago; now and then a skip. */
  const climb = (athleteId: string, element: DemoElement, reached: number, coachId: string) => {
    if (reached < 0) return
    let day = start + uniformInt(rng, 0, 120) * dayMs
    const end = today.getTime() - 3 * dayMs
    const gap = Math.max(7, Math.floor((end - day) / dayMs / (reached + 2)))
    let step = 0
    while (step <= reached && day <= end) {
      const skip = step > 0 && step < reached && uniformInt(rng, 0, 30) === 0
      const to = skip ? step + 1 : step
      events.push({
        athleteId,
        elementId: element.id,
        coachId,
        change: {
          kind: 'step',
          stepIndex: to,
          occurredOn: iso(new Date(day)),
          ...(skip || (step === 0 && to > 0)
            ? { skipReason: 'Shown already at the assessment on joining the squad' }
            : {}),
        },
      })
      step = to + 1
      day += (gap + uniformInt(rng, -3, 10)) * dayMs
    }
  }

  for (const athlete of athletes) {
    const plan = plans[athlete.squadName]
    if (!plan) continue
    const coachId = coachOf(athlete.squadName)
    const backward = catalogue.filter(
      (e) =>
        e.direction === 'backward' &&
        plan.apparatus.includes(e.apparatus) &&
        plan.rotations.includes(e.rotationClass) &&
        plan.twists.includes(e.twistBand),
    )
    for (const element of backward) {
      // Not every athlete works every element of the squad's range.
      if (uniformInt(rng, 0, 9) < 3) continue
      const reached = Math.round(share(plan.backwardShare) * (element.stepCount - 1))
      climb(athlete.id, element, reached, coachId)
      const mirror = element.counterpartId ? byId.get(element.counterpartId) : undefined
      if (!mirror) continue
      const forward = Math.round(share(plan.forwardShare) * (reached + 1)) - 1
      climb(athlete.id, mirror, Math.min(forward, mirror.stepCount - 1), coachId)
    }
  }

  // A few paused records: a lost skill being rebuilt, an injury, a fear pause.
  const latest = new Map<string, HistoryEvent>()
  for (const e of events)
    if (e.change.kind === 'step') latest.set(`${e.athleteId}|${e.elementId}`, e)
  const candidates = [...latest.values()].filter(
    (e) => e.change.kind === 'step' && e.change.stepIndex >= 3,
  )
  const pick = (n: number) => candidates[Math.floor((n * candidates.length) / 7)]
  const lost = pick(1)
  const injured = pick(3)
  const afraid = pick(5)
  const daysAgo = (n: number) => iso(new Date(today.getTime() - n * dayMs))
  if (lost) {
    events.push({
      ...lost,
      change: { kind: 'pause', reason: 'lost-skill', occurredOn: daysAgo(2) },
      note: 'Balked twice on the floor; back to the pit.',
    })
  }
  if (injured) {
    events.push({
      ...injured,
      change: { kind: 'pause', reason: 'injury', occurredOn: daysAgo(1) },
      note: 'Sprained ankle, cleared to return in three weeks.',
    })
  }
  if (afraid) {
    events.push({ ...afraid, change: { kind: 'pause', reason: 'fear', occurredOn: daysAgo(2) } })
  }
  return events
}
