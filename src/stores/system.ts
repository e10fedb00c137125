import { defineStore } from 'pinia'
import { ref } from 'vue'
import { ApiError } from '@/api/http'
import { getHealth, type Health } from '@/api/system'

/** Whether the server and its database answer. */
export const useSystemStore = defineStore('system', () => {
  const health = ref<Health | null>(null)
  const error = ref<string | null>(null)
  const loading = ref(false)

  /** Asks the server for its health; a 503 still carries the body with `database: 'down'`. */
  async function checkHealth() {
    loading.value = true
    error.value = null
    try {
      health.value = await getHealth()
    } catch (err) {
      if (err instanceof ApiError && err.status === 503)
        health.value = { status: 'degraded', database: 'down' }
      else error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  return { health, error, loading, checkHealth }
})
