import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { AthleteView } from '@shared/schemas/athletes'
import type { Grid, RecordDetail, RecordView } from '@shared/schemas/progress'
import { getAthlete } from '@/api/athletes'
import * as api from '@/api/progress'
import { getSquadGrid } from '@/api/squads'

/** An element as the athlete page needs it: names, direction, mirror and number of steps. */
export type ElementSummary = Grid['columns'][number]

/** One athlete's page: their records on every element, the events behind them, the pairs. */
export const useAthleteProgressStore = defineStore('athleteProgress', () => {
  const athlete = ref<AthleteView | null>(null)
  const records = ref<RecordView[]>([])
  const elements = ref<ElementSummary[]>([])
  const details = ref<Record<string, RecordDetail>>({})
  const loading = ref(false)
  const error = ref<string | null>(null)
  const timelineLoading = ref(false)
  const timelineError = ref<string | null>(null)
  let serial = 0

  const elementById = computed(() => new Map(elements.value.map((e) => [e.elementId, e])))

  /**
   * Loads the athlete, their records and the elements. The squad grid's columns are the whole
   * catalogue with each element's number of steps, which the catalogue list does not carry and
   * the gap of a pair needs even for a forward element never started. Then loads the events.
   */
  async function load(clubId: string, athleteId: string) {
    const mine = ++serial
    loading.value = true
    error.value = null
    if (athlete.value?.id !== athleteId) {
      athlete.value = null
      records.value = []
      details.value = {}
    }
    try {
      const found = await getAthlete(clubId, athleteId)
      const [list, grid] = await Promise.all([
        api.listRecords(clubId, athleteId),
        getSquadGrid(clubId, found.squadId),
      ])
      if (mine !== serial) return
      athlete.value = found
      records.value = list
      elements.value = grid.columns
    } catch (err) {
      if (mine === serial) error.value = err instanceof Error ? err.message : String(err)
      return
    } finally {
      if (mine === serial) loading.value = false
    }
    await loadTimeline(clubId, athleteId, mine)
  }

  // One request per record: an athlete has a few dozen at most, and each answer carries the
  // step names the timeline shows.
  async function loadTimeline(clubId: string, athleteId: string, mine: number) {
    timelineLoading.value = true
    timelineError.value = null
    try {
      const loaded = await Promise.all(
        records.value.map((r) => api.getRecordDetail(clubId, athleteId, r.elementId)),
      )
      if (mine === serial) details.value = Object.fromEntries(loaded.map((d) => [d.elementId, d]))
    } catch (err) {
      if (mine === serial) timelineError.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (mine === serial) timelineLoading.value = false
    }
  }

  return {
    athlete,
    records,
    elements,
    elementById,
    details,
    loading,
    error,
    timelineLoading,
    timelineError,
    load,
  }
})
