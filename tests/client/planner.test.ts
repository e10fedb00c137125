import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import type { Role } from '@shared/domain/club'
import { plannerNavItems, plannerRoutes } from '@/router/plannerRoutes'
import { usePlannerStore } from '@/stores/planner'
import { athlete, model, station } from '../support/planner'

describe('the session planner in the navigation', () => {
  it.each<[Role, string[]]>([
    ['director', ['Plan a session']],
    ['coach', ['Plan a session']],
    ['clinician', []],
    ['board', []],
  ])('lists for the %s: %j', (role, labels) => {
    expect(plannerNavItems(role).map((item) => item.label)).toEqual(labels)
  })

  it('opens its pages to directors and coaches only', () => {
    for (const route of plannerRoutes) expect(route.meta?.roles).toEqual(['director', 'coach'])
  })
})

describe('usePlannerStore', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('recomputes the figures when the coach moves an athlete', () => {
    // 10 min, 2 blocks of 300 s. A trampoline for 1, 60 s: 5 turns a block. A floor for 4,
    // 30 s: 10 turns each a block. Both athletes on the trampoline in block 1: 3 + 2 turns.
    const store = usePlannerStore()
    const tramp = station(1, 'trampoline', 1, 60)
    const floor = station(2, 'floor-drill', 4, 30)
    const a = athlete(1, ['trampoline', 'floor-drill'])
    const b = athlete(2, ['trampoline', 'floor-drill'])
    store.model = model({ minutes: 10, blocks: 2, stations: [tramp, floor], athletes: [a, b] })
    store.placements = [a, b].map((x) => ({
      athleteId: x.id,
      block: 0,
      stationId: tramp.id,
      option: 0,
      turns: 0,
    }))
    store.move(b.id, 0, floor.id)
    // Now a alone on the trampoline (5), b alone on the floor (10).
    expect(store.figures?.athletes.map((f) => f.turns)).toEqual([5, 10])
    expect(store.dirty).toBe(true)
    store.move(a.id, 0, null)
    expect(store.figures?.totalTurns).toBe(10)
  })
})
