import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ChangePasswordInput, SessionView } from '@shared/schemas/auth'
import * as api from '@/api/auth'

/** The signed-in person's own sessions and password. */
export const useAccountStore = defineStore('account', () => {
  const sessions = ref<SessionView[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  async function loadSessions() {
    loading.value = true
    error.value = null
    try {
      sessions.value = await api.listSessions()
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  async function endSession(handle: string) {
    await api.endSession(handle)
    sessions.value = sessions.value.filter((s) => s.handle !== handle)
  }

  async function endOthers() {
    await api.endOtherSessions()
    sessions.value = sessions.value.filter((s) => s.current)
  }

  /** Changes the password; the server ends every other session. */
  async function changePassword(input: ChangePasswordInput) {
    await api.changePassword(input)
    await loadSessions()
  }

  return { sessions, loading, error, loadSessions, endSession, endOthers, changePassword }
})
