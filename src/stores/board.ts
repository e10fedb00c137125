import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { BoardSummary } from '@shared/schemas/audits'
import * as api from '@/api/audits'

/** The board's summary: published club-wide audits only, figures and squads, never an athlete. */
export const useBoardStore = defineStore('board', () => {
  const summary = ref<BoardSummary | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads the summary; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      summary.value = await api.getBoardSummary(clubId)
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  return { summary, loading, error, load }
})
