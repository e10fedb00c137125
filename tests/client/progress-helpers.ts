import type { Component } from 'vue'
import { mountWithProviders } from './mount'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import type { RecordDetail } from '@shared/schemas/progress'

const blank: Component = { render: () => null }

/** A router with the route names the progress screens link to. */
export function progressRouter(): Router {
  return createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', name: 'home', component: blank },
      { path: '/squads', name: 'squads', component: blank },
      { path: '/squads/:squadId', name: 'squad', component: blank },
      { path: '/log', name: 'progress-log', component: blank },
      { path: '/athletes/:athleteId', name: 'athlete', component: blank },
      { path: '/missing-skills', name: 'missing-skills', component: blank },
    ],
  })
}

/** Mounts a component inside the Naive UI providers, with Pinia and the progress routes. */
export function mountInProviders(component: Component, props: Record<string, unknown> = {}) {
  return mountWithProviders(component, props, { router: progressRouter() })
}

export const clubId = '11111111-1111-4111-8111-111111111111'
export const athleteId = '22222222-2222-4222-8222-222222222222'
export const elementId = '33333333-3333-4333-8333-333333333333'
export const eventIds = [
  '44444444-4444-4444-8444-444444444401',
  '44444444-4444-4444-8444-444444444402',
]

// A common trampoline progression for a back tuck (common practice, no published source).
export const steps = [
  {
    name: 'Tuck jumps and timers',
    modality: 'floor-drill',
    criterion: 'Ten tuck jumps in a row, knees to the chest',
    minDays: null,
  },
  {
    name: 'Rotation in the spotting rig',
    modality: 'spotting-rig',
    criterion: 'Five rotations landed on the feet',
    minDays: 7,
  },
  {
    name: 'Hand spot by a coach',
    modality: 'hand-spot',
    criterion: 'Three in a row with a light spot',
    minDays: null,
  },
  {
    name: 'Into the foam pit',
    modality: 'pit',
    criterion: 'Five landed on the feet in the pit',
    minDays: null,
  },
  {
    name: 'Solo on the trampoline',
    modality: 'trampoline',
    criterion: 'Five solo, landed in the centre',
    minDays: null,
  },
  {
    name: 'In a competition routine',
    modality: 'routine',
    criterion: 'Within a full routine, twice',
    minDays: null,
  },
]

/** A record as GET /records/:elementId answers it. */
export function recordDetail(partial: Partial<RecordDetail> = {}): RecordDetail {
  return {
    athleteId,
    elementId,
    stepIndex: 0,
    highestStepIndex: 0,
    stepReachedOn: '2025-01-10',
    paused: false,
    pauseReason: null,
    plannedStepIndex: null,
    lastEventOn: '2025-01-10',
    lastEventId: eventIds[0]!,
    flagged: false,
    steps,
    events: [],
    ...partial,
  }
}

export const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))
