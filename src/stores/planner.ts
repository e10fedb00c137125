import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { planFigures } from '@shared/domain/planner/figures'
import { ratioWarnings } from '@shared/domain/planner/ratios'
import { moveAthlete } from '@shared/domain/planner/turns'
import type { Placement, PlanModel, SolverReport } from '@shared/domain/planner/types'
import type {
  PlanOutcome,
  PlanRequest,
  SavedPlanSummary,
  Station,
  StationInput,
} from '@shared/schemas/planner'
import type { AthleteView } from '@shared/schemas/athletes'
import type { SquadView } from '@shared/schemas/squads'
import { listAthletes } from '@/api/athletes'
import { listElements } from '@/api/elements'
import * as api from '@/api/planner'
import { listSquads } from '@/api/squads'

/**
 * The session planner: the club's stations, the saved plans, and the plan being worked on (a
 * draft: the coach's moves change it here and its figures are recomputed with the same shared
 * function as the server's, until it is saved).
 */
export const usePlannerStore = defineStore('planner', () => {
  const stations = ref<Station[]>([])
  const plans = ref<SavedPlanSummary[]>([])
  const squads = ref<SquadView[]>([])
  const roster = ref<AthleteView[]>([])
  const elements = ref<{ id: string; name: string; direction: string }[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  const model = ref<PlanModel | null>(null)
  const placements = ref<Placement[]>([])
  const solver = ref<SolverReport | null>(null)
  const solverMinTurns = ref<number | null>(null)
  const reasons = ref<string[]>([])
  const focusSource = ref('')
  const squadId = ref<string | null>(null)
  const planId = ref<string | null>(null)
  const sessionDate = ref(new Date().toISOString().slice(0, 10))
  const recordedAt = ref<string | null>(null)
  const outcome = ref<PlanOutcome | null>(null)
  const dirty = ref(false)

  const figures = computed(() => (model.value ? planFigures(model.value, placements.value) : null))
  const warnings = computed(() => (model.value ? ratioWarnings(model.value, placements.value) : []))

  async function guarded(work: () => Promise<void>) {
    loading.value = true
    error.value = null
    try {
      await work()
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Loads the club's stations and the saved plans; the error is kept for the view. */
  const load = (clubId: string) =>
    guarded(async () => {
      ;[stations.value, plans.value, squads.value, elements.value] = await Promise.all([
        api.listStations(clubId),
        api.listPlans(clubId),
        listSquads(clubId),
        listElements(clubId),
      ])
    })

  /** The athletes of the squad chosen for the plan. */
  const loadRoster = (clubId: string, squadId: string) =>
    guarded(async () => {
      roster.value = await listAthletes(clubId, { squadId })
    })

  /** Adds a station. Lets the ApiError through for the form's fields. */
  async function addStation(clubId: string, input: StationInput) {
    const station = await api.createStation(clubId, input)
    stations.value = [...stations.value, station].sort((a, b) => a.name.localeCompare(b.name))
  }

  /** Removes a station from the club's gym (saved plans keep their copy). */
  async function removeStation(clubId: string, id: string) {
    await api.deleteStation(clubId, id)
    stations.value = stations.value.filter((s) => s.id !== id)
  }

  function clearDraft() {
    model.value = null
    placements.value = []
    solver.value = null
    solverMinTurns.value = null
    reasons.value = []
    planId.value = null
    recordedAt.value = null
    outcome.value = null
    dirty.value = false
  }

  /** Asks the server for a plan. Lets the ApiError through for the form's fields. */
  async function plan(clubId: string, request: PlanRequest) {
    const result = await api.planSession(clubId, request)
    clearDraft()
    model.value = result.model
    placements.value = result.placements
    solver.value = result.solver
    solverMinTurns.value = result.solverMinTurns
    reasons.value = result.reasons
    focusSource.value = result.focusSource
    squadId.value = request.squadId
    dirty.value = true
  }

  /** Moves an athlete for one block (null takes them out of it); the figures follow. */
  function move(athleteId: string, block: number, stationId: string | null) {
    if (!model.value) return
    placements.value = moveAthlete(model.value, placements.value, athleteId, block, stationId)
    dirty.value = true
  }

  /** Saves the draft for its squad and date: a new plan, or the reopened one again. */
  async function save(clubId: string) {
    if (!model.value || !squadId.value) return
    const input = {
      squadId: squadId.value,
      sessionDate: sessionDate.value,
      model: model.value,
      placements: placements.value,
    }
    const saved = planId.value
      ? await api.updatePlan(clubId, planId.value, input)
      : await api.savePlan(clubId, input)
    planId.value = saved.id
    dirty.value = false
    plans.value = [saved, ...plans.value.filter((p) => p.id !== saved.id)]
    return saved
  }

  /** Reopens a saved plan as the draft. */
  const open = (clubId: string, id: string) =>
    guarded(async () => {
      const saved = await api.getPlan(clubId, id)
      clearDraft()
      model.value = saved.model
      placements.value = saved.placements
      squadId.value = saved.squadId
      sessionDate.value = saved.sessionDate
      planId.value = saved.id
      recordedAt.value = saved.recordedAt
      outcome.value = saved.outcome
      focusSource.value = ''
    })

  /** Records the session's outcome in one go. Lets the ApiError through. */
  async function record(clubId: string, occurredOn: string, passed: PlanOutcome['passed']) {
    if (!planId.value) return
    const saved = await api.recordOutcome(clubId, planId.value, {
      occurredOn,
      passed: passed.map(({ athleteId, elementId }) => ({ athleteId, elementId })),
    })
    recordedAt.value = saved.recordedAt
    outcome.value = saved.outcome
    plans.value = plans.value.map((p) => (p.id === saved.id ? saved : p))
  }

  return {
    stations,
    plans,
    squads,
    roster,
    elements,
    loadRoster,
    loading,
    error,
    model,
    placements,
    solver,
    solverMinTurns,
    reasons,
    focusSource,
    squadId,
    planId,
    sessionDate,
    recordedAt,
    outcome,
    dirty,
    figures,
    warnings,
    load,
    addStation,
    removeStation,
    plan,
    move,
    save,
    open,
    record,
    clearDraft,
  }
})
