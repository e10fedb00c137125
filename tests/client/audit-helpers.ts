import { createPinia, setActivePinia } from 'pinia'
import { type Component } from 'vue'
import { mountWithProviders } from './mount'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import type { Role } from '@shared/domain/club'
import type { FigureChange } from '@shared/domain/audit/comparison'
import { resolveAuditOptions } from '@shared/domain/audit/run'
import type { AuditResult } from '@shared/domain/audit/types'
import type { AuditReport, AuditSummary, BoardSummary } from '@shared/schemas/audits'
import { useSessionStore } from '@/stores/session'

const blank: Component = { render: () => null }

export const clubId = '11111111-1111-4111-8111-111111111111'
export const auditId = '55555555-5555-4555-8555-555555555501'
export const previousAuditId = '55555555-5555-4555-8555-555555555500'
export const squadIds = [
  '66666666-6666-4666-8666-666666666601',
  '66666666-6666-4666-8666-666666666602',
]
export const athleteIds = [
  '77777777-7777-4777-8777-777777777701',
  '77777777-7777-4777-8777-777777777702',
]
export const athleteNames = ['Mia Novak', 'Lena Ortiz']

/** A router with the route names the audit screens link to. */
export function auditRouter(): Router {
  return createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', name: 'home', component: blank },
      { path: '/audits', name: 'audits', component: blank },
      { path: '/audits/settings', name: 'audit-settings', component: blank },
      { path: '/audits/:id', name: 'audit', component: blank },
      { path: '/board', name: 'board', component: blank },
    ],
  })
}

/** Signs someone in with `role` in the demo club, as the session store holds it. */
export function signInAs(role: Role) {
  const session = useSessionStore()
  session.me = {
    user: { id: 'u1', email: `${role}@demo.example`, name: 'Sam' },
    memberships: [
      {
        clubId,
        clubName: 'Demo club',
        role,
        accessStartsOn: null,
        accessEndsOn: null,
        accessOpen: true,
      },
    ],
    activeClubId: clubId,
  }
  session.ready = true
}

/** Mounts a component inside the Naive UI providers, with Pinia, a router and a signed-in role. */
export function mountInProviders(
  component: Component,
  props: Record<string, unknown> = {},
  options: { role?: Role } = {},
) {
  const pinia = createPinia()
  setActivePinia(pinia)
  signInAs(options.role ?? 'director')
  return mountWithProviders(component, props, { router: auditRouter(), pinia })
}

export const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

const fc = (previous: number | null, current: number | null): FigureChange => ({
  previous,
  current,
  change: previous === null || current === null ? null : current - previous,
})

export function auditSummary(partial: Partial<AuditSummary> = {}): AuditSummary {
  return {
    id: auditId,
    squadId: null,
    scopeName: 'Demo club',
    asOf: '2025-06-30',
    inputHash: 'a3f1c09e77b2d4e5f60718293a4b5c6d7e8f90112233445566778899aabbccdd',
    createdAt: '2025-07-01T09:30:00.000Z',
    publishedAt: null,
    rerun: false,
    clubFrontLag: 0.325,
    balanceRatio: 0.85,
    athleteCount: 2,
    ...partial,
  }
}

/** A club-wide report with two athletes in two squads, one gap each and one readiness row. */
export function auditReport(partial: Partial<AuditReport> = {}): AuditReport {
  const result: AuditResult = {
    asOf: '2025-06-30',
    options: resolveAuditOptions({}),
    headline: {
      athleteCount: 2,
      clubFrontLag: 0.325,
      clubBackLag: 0.05,
      balanceRatio: 0.85,
      squadFrontLags: { [squadIds[0]!]: 0.4, [squadIds[1]!]: 0.2 },
      catalogueGaps: 3,
      gapCount: 2,
      athletesWithGaps: 2,
      readinessAlerts: 1,
    },
    athletes: [],
    squads: [
      {
        squadId: squadIds[0]!,
        athleteCount: 1,
        athletesWithRecords: 1,
        frontLag: 0.4,
        backLag: 0.05,
        forwardProficiency: 1.2,
        backwardProficiency: 2,
        balanceRatio: 0.6,
        gapCount: 1,
        athletesWithGaps: 1,
        readinessAlerts: 1,
      },
      {
        squadId: squadIds[1]!,
        athleteCount: 1,
        athletesWithRecords: 1,
        frontLag: 0.2,
        backLag: 0.05,
        forwardProficiency: 1.6,
        backwardProficiency: 2,
        balanceRatio: 0.8,
        gapCount: 1,
        athletesWithGaps: 1,
        readinessAlerts: 0,
      },
    ],
    coverage: [
      {
        rotationClass: 'single',
        twistBand: 'none',
        forward: { mean: 0.5, elementCount: 3 },
        backward: { mean: 0.9, elementCount: 3 },
      },
      {
        rotationClass: 'triple',
        twistBand: 'more',
        forward: { mean: 0, elementCount: 0 },
        backward: { mean: 0, elementCount: 0 },
      },
    ],
    catalogueGaps: [],
    gaps: [
      // As runAudit ranks them: the gap waiting for the catalogue after the athletes' own.
      {
        athleteId: athleteIds[1]!,
        squadId: squadIds[1]!,
        elementId: 'e-back-tuck',
        elementName: 'Back tuck',
        rotationClass: 'single',
        counterpartId: 'e-front-tuck',
        counterpartName: 'Front tuck',
        stepIndex: 5,
        counterpartStepIndex: 2,
        deficitSteps: 3,
        weight: 1,
        weightedDeficit: 3,
        counterpartMissing: false,
        counterpartNeverStarted: false,
        stepCount: 8,
        counterpartStepCount: 6,
      },
      {
        athleteId: athleteIds[0]!,
        squadId: squadIds[0]!,
        elementId: 'e-back-double',
        elementName: 'Back double tuck',
        rotationClass: 'double',
        counterpartId: null,
        counterpartName: null,
        stepIndex: 3,
        counterpartStepIndex: null,
        deficitSteps: 4,
        weight: 2,
        weightedDeficit: 8,
        counterpartMissing: true,
        counterpartNeverStarted: false,
        stepCount: 6,
        counterpartStepCount: null,
      },
    ],
    readiness: [
      {
        athleteId: athleteIds[0]!,
        squadId: squadIds[0]!,
        discipline: 'artistic-women',
        from: 'age-group',
        to: 'junior',
        startsOn: '2026-01-01',
        pace: 1.5,
        profileId: 'fig-wag-floor-2022',
        missingCount: 1,
        requirements: [
          {
            requirementId: 'salto-forward-sideward',
            label: 'A salto forward or sideward',
            source: 'FIG WAG Code of Points 2022–2024',
            met: false,
            elementId: 'e-front-tuck',
            elementName: 'Front tuck',
            stepIndex: 2,
            targetStepIndex: 5,
            stepsNeeded: 3,
            forecastOn: '2025-08-30',
            onTime: true,
            noMatchingElement: false,
          },
        ],
      },
    ],
  }
  return {
    audit: auditSummary(),
    result,
    comparison: {
      athleteCount: fc(2, 2),
      clubFrontLag: fc(0.3, 0.325),
      clubBackLag: fc(0.05, 0.05),
      balanceRatio: fc(0.8, 0.85),
      catalogueGaps: fc(5, 3),
      gapCount: fc(2, 2),
      athletesWithGaps: fc(2, 2),
      readinessAlerts: fc(0, 1),
      squadFrontLags: {},
    },
    previous: auditSummary({ id: previousAuditId, asOf: '2025-03-31' }),
    trend: [
      { id: previousAuditId, asOf: '2025-03-31', clubFrontLag: 0.3, balanceRatio: 0.8 },
      { id: auditId, asOf: '2025-06-30', clubFrontLag: 0.325, balanceRatio: 0.85 },
    ],
    athleteNames: { [athleteIds[0]!]: athleteNames[0]!, [athleteIds[1]!]: athleteNames[1]! },
    squadNames: { [squadIds[0]!]: 'Juniors A', [squadIds[1]!]: 'Development' },
    limitedToSquads: false,
    visitOutcomes: null,
    ...partial,
  }
}

/** What GET /board-summary answers after two published club-wide audits. */
export function boardSummary(partial: Partial<BoardSummary> = {}): BoardSummary {
  return {
    clubName: 'Demo club',
    trend: [
      { asOf: '2025-03-31', clubFrontLag: 0.3, clubBackLag: 0.05, balanceRatio: 0.8 },
      { asOf: '2025-06-30', clubFrontLag: 0.25, clubBackLag: 0.04, balanceRatio: 0.9 },
    ],
    latest: {
      asOf: '2025-06-30',
      publishedAt: '2025-07-02T10:00:00.000Z',
      athleteCount: 24,
      clubFrontLag: 0.25,
      clubBackLag: 0.04,
      balanceRatio: 0.9,
      catalogueGaps: 3,
      athletesWithGaps: 7,
      readinessAlerts: 2,
      // what the server computes against the audit as of 2025-03-31
      comparison: {
        athleteCount: fc(22, 24),
        clubFrontLag: fc(0.3, 0.25),
        clubBackLag: fc(0.05, 0.04),
        balanceRatio: fc(0.8, 0.9),
        catalogueGaps: fc(3, 3),
        gapCount: fc(9, 8),
        athletesWithGaps: fc(8, 7),
        readinessAlerts: fc(2, 2),
      },
      visitOutcomes: null,
      squads: [
        { name: 'Development', frontLag: 0.2, athleteCount: 14 },
        { name: 'Juniors A', frontLag: 0.31, athleteCount: 10 },
      ],
      squadsWithoutRecords: 0,
    },
    ...partial,
  }
}
