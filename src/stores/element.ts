import { defineStore } from 'pinia'
import { ref } from 'vue'
import { z } from 'zod'
import {
  elementDetailSchema,
  type ElementDetail,
  type Prerequisite,
} from '@shared/schemas/catalogue'
import type { ProgressionStep } from '@shared/schemas/progressions'
import * as api from '@/api/elements'
import { ApiError } from '@/api/http'
import { useCatalogueStore } from './catalogue'

const conflictBodySchema = z.object({ error: z.object({ element: elementDetailSchema }) })

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
   * Saves a new progression made against `stepsVersion` of the steps. While athletes have records
   * the server answers 409 `steps_need_mapping` unless `mapping` says where each old step goes;
   * the error comes through for the editor to ask. If someone else has changed the steps since,
   * the server answers 409 `conflict` with the element as it now stands: that is kept here, so
   * the page shows the current steps, and the error comes through for the editor to explain.
   */
  async function saveSteps(
    clubId: string,
    id: string,
    steps: ProgressionStep[],
    stepsVersion: number,
    mapping?: number[],
  ) {
    try {
      keep(
        await api.updateSteps(
          clubId,
          id,
          mapping ? { steps, mapping, stepsVersion } : { steps, stepsVersion },
        ),
      )
    } catch (err) {
      if (err instanceof ApiError && err.code === 'conflict') await keepCurrent(clubId, id, err)
      throw err
    }
  }

  async function keepCurrent(clubId: string, id: string, conflict: ApiError) {
    const answered = conflictBodySchema.safeParse(conflict.body)
    if (answered.success) return keep(answered.data.error.element)
    try {
      keep(await api.getElement(clubId, id))
    } catch {
      // The conflict itself is what the person needs to hear about; a failed reload adds nothing.
    }
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
