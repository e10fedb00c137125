import { defineStore } from 'pinia'
import { computed, reactive, ref } from 'vue'
import {
  catalogueGaps,
  counterpartKey,
  descriptionKey,
  findCounterparts,
  type ElementDescription,
} from '@shared/domain/catalogue'
import type { Direction, RotationClass, Shape, TwistBand } from '@shared/domain/element'
import type { ImportResult } from '@shared/schemas/catalogue'
import type { CatalogueElement, ElementInput } from '@shared/schemas/elements'
import * as api from '@/api/elements'

/** The list filters as the controls hold them: a cleared select is null, an empty search ''. */
export interface CatalogueFilters {
  apparatus: string | null
  direction: Direction | null
  rotationClass: RotationClass | null
  twistBand: TwistBand | null
  shape: Shape | null
  q: string
}

const noFilters = (): CatalogueFilters => ({
  apparatus: null,
  direction: null,
  rotationClass: null,
  twistBand: null,
  shape: null,
  q: '',
})

/**
 * Whether an element passes the filters. `q` looks in the name and the notation, as the
 * server's `q` does, so a coach can type "back" or "820o".
 */
export function matchesFilters(element: CatalogueElement, filters: CatalogueFilters): boolean {
  if (filters.apparatus && element.apparatus !== filters.apparatus) return false
  if (filters.direction && element.direction !== filters.direction) return false
  if (filters.rotationClass && element.rotationClass !== filters.rotationClass) return false
  if (filters.twistBand && element.twistBand !== filters.twistBand) return false
  if (filters.shape && element.shape !== filters.shape) return false
  const q = filters.q.trim().toLowerCase()
  if (q === '') return true
  // The notation is matched from its start: "8" lists the doubles, "40o" only the back tuck.
  return element.name.toLowerCase().includes(q) || (element.notation ?? '').startsWith(q)
}

// After a local change the counterparts of other elements may change too (adding a front tuck
// gives the back tuck its mirror), so every link is recomputed with the rule the server uses.
function relink(elements: CatalogueElement[]): CatalogueElement[] {
  const counterparts = findCounterparts(elements)
  return elements.map((e) => ({ ...e, counterpartId: counterparts.get(e.id) ?? null }))
}

/**
 * The club's whole catalogue. It is small (about 120 elements), so it is loaded once and
 * filtered here: the gaps and the form's counterpart preview need the whole list, not a page.
 */
export const useCatalogueStore = defineStore('catalogue', () => {
  const elements = ref<CatalogueElement[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)
  const loadedFor = ref<string | null>(null)
  const filters = reactive<CatalogueFilters>(noFilters())

  const visible = computed(() => elements.value.filter((e) => matchesFilters(e, filters)))
  /** True while any filter or the search is set. */
  const filtered = computed(() =>
    Object.values(filters).some((value) => value !== null && value !== ''),
  )
  const gaps = computed(() => catalogueGaps(elements.value))
  const byId = computed(() => new Map(elements.value.map((e) => [e.id, e])))
  const apparatusList = computed(() => [...new Set(elements.value.map((e) => e.apparatus))].sort())
  const byDescription = computed(() => {
    const map = new Map<string, CatalogueElement>()
    for (const e of elements.value) {
      const key = descriptionKey(e)
      if (!map.has(key)) map.set(key, e)
    }
    return map
  })

  /** Loads the whole catalogue of the club; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      elements.value = await api.listElements(clubId)
      loadedFor.value = clubId
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** Loads the catalogue unless this club's is already here (pages that only look things up). */
  async function ensureLoaded(clubId: string) {
    if (loadedFor.value !== clubId && !loading.value) await load(clubId)
  }

  function clearFilters() {
    Object.assign(filters, noFilters())
  }

  /** The element in the catalogue that mirrors this description, other than `exceptId`. */
  function counterpartOf(description: ElementDescription, exceptId?: string) {
    const key = counterpartKey(description)
    if (key === null) return null
    const found = byDescription.value.get(key)
    return found && found.id !== exceptId ? found : null
  }

  /** An element already describing the same skill, other than `exceptId`. */
  function duplicateOf(description: ElementDescription, exceptId?: string) {
    const key = descriptionKey(description)
    return elements.value.find((e) => e.id !== exceptId && descriptionKey(e) === key) ?? null
  }

  /** Creates an element; lets the ApiError (duplicates, field issues) through to the form. */
  async function create(clubId: string, input: ElementInput) {
    const created = await api.createElement(clubId, input)
    elements.value = relink([...elements.value, created])
    return created
  }

  /** Saves an edited element; lets the ApiError through to the form. */
  async function update(clubId: string, id: string, input: ElementInput) {
    const updated = await api.updateElement(clubId, id, input)
    elements.value = relink(elements.value.map((e) => (e.id === id ? updated : e)))
    return updated
  }

  /** Deletes an element; a 409 `has_records` comes through for the view to explain. */
  async function remove(clubId: string, id: string) {
    await api.deleteElement(clubId, id)
    elements.value = relink(elements.value.filter((e) => e.id !== id))
  }

  /**
   * Sends CSV rows to the server, as a check (`dryRun`) or for real. The server saves all rows
   * or none; after a real import the list is reloaded to show the new elements.
   */
  async function importRows(
    clubId: string,
    rows: Record<string, unknown>[],
    dryRun: boolean,
  ): Promise<ImportResult> {
    const result = await api.importElements(clubId, rows, dryRun)
    if (!dryRun && result.created > 0) await load(clubId)
    return result
  }

  return {
    elements,
    loading,
    error,
    filters,
    visible,
    filtered,
    gaps,
    byId,
    apparatusList,
    load,
    ensureLoaded,
    clearFilters,
    counterpartOf,
    duplicateOf,
    create,
    update,
    remove,
    importRows,
  }
})
