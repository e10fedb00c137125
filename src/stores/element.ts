import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ElementDetail, Prerequisite } from '@shared/schemas/catalogue'
import type { ProgressionStep } from '@shared/schemas/progressions'
import * as api from '@/api/elements'
import { useCatalogueStore } from './catalogue'

/** One element with its progression and prerequisites (the element page and its editors). */
export const useElementStore = defineStore('element', () => {
  const detail = ref<ElementDetail | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)
  /** Steps of other elements, for choosing the step of a prerequisite. */
  const stepsById = ref<Record<string, ProgressionStep[]>>({})

  function keep(next: ElementDetail) {
    detail.value = next
    stepsById.value = { ...stepsById.value, [next.id]: next.steps }
  }

  /** Loads one element; the error is kept for the view to show. */
  async function load(clubId: string, id: string) {
    loading.value = true
    error.value = null
    if (detail.value?.id !== id) detail.value = null
    try {
      keep(await api.getElement(clubId, id))
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /**
   * Saves a new progression. While athletes have records the server answers 409
   * `steps_need_mapping` unless `mapping` says where each old step goes; the error comes through
   * for the editor to ask.
   */
  async function saveSteps(
    clubId: string,
    id: string,
    steps: ProgressionStep[],
    mapping?: number[],
  ) {
    keep(await api.updateSteps(clubId, id, mapping ? { steps, mapping } : { steps }))
  }

  /** Saves the whole prerequisite list; a 400 `prerequisite_cycle` names the cycle. */
  async function savePrerequisites(clubId: string, id: string, prerequisites: Prerequisite[]) {
    keep(await api.updatePrerequisites(clubId, id, prerequisites))
  }

  /** The steps of another element, fetched once, for the prerequisite editor's step choice. */
  async function stepsOf(clubId: string, id: string): Promise<ProgressionStep[]> {
    const known = stepsById.value[id]
    if (known) return known
    const other = await api.getElement(clubId, id)
    stepsById.value = { ...stepsById.value, [id]: other.steps }
    return other.steps
  }

  /** Deletes the element shown; a 409 `has_records` comes through for the view to explain. */
  async function remove(clubId: string, id: string) {
    await useCatalogueStore().remove(clubId, id)
    if (detail.value?.id === id) detail.value = null
  }

  return { detail, loading, error, stepsById, load, saveSteps, savePrerequisites, stepsOf, remove }
})
