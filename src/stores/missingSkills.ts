import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { MissingSkill } from '@shared/schemas/progress'
import * as api from '@/api/progress'

/** The coaches' list of athletes whose forward element trails the backward one. */
export const useMissingSkillsStore = defineStore('missingSkills', () => {
  const items = ref<MissingSkill[]>([])
  /** The squad filter; null lists every squad the person sees. */
  const squadId = ref<string | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)
  let serial = 0

  /** Loads the list for the current squad filter; the error is kept for the view. */
  async function load(clubId: string) {
    const mine = ++serial
    loading.value = true
    error.value = null
    try {
      const list = await api.listMissingSkills(clubId, squadId.value)
      if (mine === serial) items.value = list
    } catch (err) {
      if (mine === serial) error.value = err instanceof Error ? err.message : String(err)
    } finally {
      if (mine === serial) loading.value = false
    }
  }

  return { items, squadId, loading, error, load }
})
