import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ClubView } from '@shared/schemas/clubs'
import * as api from '@/api/clubs'
import { useSessionStore } from './session'

/** The club the person works in, as its settings screen shows it. */
export const useClubStore = defineStore('club', () => {
  const club = ref<ClubView | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads the club; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      club.value = await api.getClub(clubId)
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /**
   * Deletes the club for good once its name is typed, then asks who is signed in again, so the
   * session moves to the person's other club or to none. Lets the ApiError through.
   */
  async function remove(clubId: string, confirmName: string) {
    await api.deleteClub(clubId, { confirmName })
    await useSessionStore().load()
  }

  return { club, loading, error, load, remove }
})
