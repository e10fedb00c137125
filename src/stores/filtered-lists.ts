import { ref } from 'vue'

export interface FilteredList<T> {
  items: T[]
  loading: boolean
  error: string | null
}

/**
 * Lists of one kind of thing, one per filter, shared wherever the same filter is shown; for a
 * setup store. A load keeps its error on the list for the component to show.
 */
export function filteredLists<F, T>(
  keyOf: (filter: F) => string,
  fetch: (clubId: string, filter: F) => Promise<T[]>,
) {
  const lists = ref<Record<string, FilteredList<T>>>({})
  const filters = new Map<string, F>()

  async function load(clubId: string, filter: F) {
    const key = keyOf(filter)
    filters.set(key, filter)
    lists.value[key] ??= { items: [], loading: false, error: null }
    // Read back through the reactive record, so that the changes below are seen.
    const list = lists.value[key]!
    list.loading = true
    list.error = null
    try {
      list.items = (await fetch(clubId, filter)) as typeof list.items
    } catch (err) {
      list.error = err instanceof Error ? err.message : String(err)
    } finally {
      list.loading = false
    }
  }

  /** Every list shown reloads: a new or changed item may belong to several. */
  async function refresh(clubId: string) {
    await Promise.all([...filters.values()].map((f) => load(clubId, f)))
  }

  return { lists, load, refresh }
}
