import { ref, watch, type Ref } from 'vue'

// The athletes and elements a coach logged last, one tap away on the log screens. Kept on this
// device per user and club (ids only, names come from the lists already loaded) and removed
// from the device when anyone signs out or the session ends.

const prefix = 'twofold.recent.'
const keep = 6

function storage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage
  } catch {
    return null
  }
}

function read(key: string): string[] {
  try {
    const value = JSON.parse(storage()?.getItem(key) ?? '[]') as unknown
    return Array.isArray(value) ? value.filter((v): v is string => typeof v === 'string') : []
  } catch {
    return []
  }
}

/** Removes every list kept on this device, whoever's. */
export function forgetRecentPicks() {
  const store = storage()
  if (!store) return
  for (const key of Object.keys(store)) if (key.startsWith(prefix)) store.removeItem(key)
}

/**
 * The recent ids of one kind ('athletes', 'elements') for the user in the club, newest first;
 * `remember(id)` puts one at the front.
 */
export function useRecentPicks(
  kind: 'athletes' | 'elements',
  owner: Ref<{ userId: string | null; clubId: string | null }>,
) {
  const key = () =>
    owner.value.userId && owner.value.clubId
      ? `${prefix}${owner.value.userId}.${owner.value.clubId}.${kind}`
      : null
  const ids = ref<string[]>([])
  watch(
    owner,
    () => {
      const k = key()
      ids.value = k ? read(k) : []
    },
    { immediate: true, deep: true },
  )
  function remember(id: string | null | undefined) {
    const k = key()
    if (!id || !k) return
    ids.value = [id, ...ids.value.filter((x) => x !== id)].slice(0, keep)
    storage()?.setItem(k, JSON.stringify(ids.value))
  }
  return { ids, remember }
}
