import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ProgressionTemplateView } from '@shared/schemas/catalogue'
import type { ProgressionStep } from '@shared/schemas/progressions'
import * as api from '@/api/elements'

/** The club's progression templates, one per element family. */
export const useProgressionTemplatesStore = defineStore('progressionTemplates', () => {
  const templates = ref<ProgressionTemplateView[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads the templates; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      templates.value = await api.listTemplates(clubId)
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Saves a template's steps; they apply to elements created from now on. */
  async function save(clubId: string, family: string, steps: ProgressionStep[]) {
    const saved = await api.updateTemplate(clubId, family, steps)
    templates.value = templates.value.map((t) => (t.family === family ? saved : t))
  }

  return { templates, loading, error, load, save }
})
