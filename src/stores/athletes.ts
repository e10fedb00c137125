import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { AthleteInput, AthleteUpdate, AthleteView } from '@shared/schemas/athletes'
import * as api from '@/api/athletes'

/** The roster of one squad at a time, and single athletes opened from anywhere. */
export const useAthletesStore = defineStore('athletes', () => {
  const roster = ref<AthleteView[]>([])
  /** The squad the roster belongs to, so a late answer for another squad is not shown. */
  const rosterSquadId = ref<string | null>(null)
  const includeArchived = ref(false)
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads a squad's roster; the error is kept for the view to show. */
  async function loadRoster(clubId: string, squadId: string, withArchived = includeArchived.value) {
    rosterSquadId.value = squadId
    includeArchived.value = withArchived
    loading.value = true
    error.value = null
    try {
      const list = await api.listAthletes(clubId, { squadId, includeArchived: withArchived })
      if (rosterSquadId.value === squadId) roster.value = list
    } catch (err) {
      if (rosterSquadId.value === squadId)
        error.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (rosterSquadId.value === squadId) loading.value = false
    }
  }

  /** One athlete; lets the ApiError through (404 when out of the person's squads). */
  async function get(clubId: string, athleteId: string) {
    return api.getAthlete(clubId, athleteId)
  }

  /** Adds an athlete; the field issues come back on the ApiError. */
  async function add(clubId: string, input: AthleteInput) {
    const created = await api.addAthlete(clubId, input)
    if (created.squadId === rosterSquadId.value)
      roster.value = sortByName([...roster.value, created])
    return created
  }

  /**
   * Renames, moves or archives an athlete. The roster drops them when they leave its squad, or
   * when archived while archived athletes are hidden.
   */
  async function update(clubId: string, athleteId: string, change: AthleteUpdate) {
    const updated = await api.updateAthlete(clubId, athleteId, change)
    const stays =
      updated.squadId === rosterSquadId.value && (includeArchived.value || !updated.archived)
    roster.value = stays
      ? roster.value.map((a) => (a.id === athleteId ? updated : a))
      : roster.value.filter((a) => a.id !== athleteId)
    return updated
  }

  /**
   * Erases an athlete for good once their full name is typed; the roster drops them. Lets the
   * ApiError through (a field issue on `confirmName` when the name does not match).
   */
  async function erase(clubId: string, athleteId: string, confirmName: string) {
    await api.eraseAthlete(clubId, athleteId, { confirmName })
    roster.value = roster.value.filter((a) => a.id !== athleteId)
  }

  /** Checks (`dryRun`) or imports roster rows; all or nothing on the server. */
  async function importRows(clubId: string, rows: Record<string, unknown>[], dryRun: boolean) {
    return api.importRoster(clubId, rows, dryRun)
  }

  return {
    roster,
    rosterSquadId,
    includeArchived,
    loading,
    error,
    loadRoster,
    get,
    add,
    update,
    erase,
    importRows,
  }
})

function sortByName(list: AthleteView[]) {
  return list.sort(
    (a, b) => a.familyName.localeCompare(b.familyName) || a.givenName.localeCompare(b.givenName),
  )
}
