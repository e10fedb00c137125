import type { SelectGroupOption, SelectOption } from 'naive-ui'
import { computed, type Ref } from 'vue'
import type { CatalogueElement } from '@shared/schemas/elements'

/**
 * The catalogue as select options grouped by apparatus; the label carries the notation so that
 * typing "40o" finds it. `filterElement` matches anywhere in the label.
 */
export function useElementOptions(elements: Ref<CatalogueElement[]>) {
  const elementOptions = computed<(SelectOption | SelectGroupOption)[]>(() => {
    const groups = new Map<string, SelectOption[]>()
    for (const e of elements.value) {
      const list = groups.get(e.apparatus) ?? []
      list.push({ label: e.notation ? `${e.name} · ${e.notation}` : e.name, value: e.id })
      groups.set(e.apparatus, list)
    }
    return [...groups.entries()]
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([apparatus, children]) => ({
        type: 'group',
        label: apparatus,
        key: apparatus,
        children,
      }))
  })
  function filterElement(pattern: string, option: SelectOption) {
    const q = pattern.trim().toLowerCase()
    return String(option.label ?? '')
      .toLowerCase()
      .includes(q)
  }
  return { elementOptions, filterElement }
}
