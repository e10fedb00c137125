import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { nextTick, ref } from 'vue'
import { forgetRecentPicks, useRecentPicks } from '@/composables/recentPicks'
import { useSessionStore } from '@/stores/session'

vi.mock('@/api/auth', () => ({ signOut: vi.fn().mockResolvedValue(undefined) }))

const owner = ref({ userId: 'user-1', clubId: 'club-1' })

beforeEach(() => {
  localStorage.clear()
  setActivePinia(createPinia())
})
afterEach(() => localStorage.clear())

describe('recent picks', () => {
  it('keeps the newest first, without repeats, per user and club', async () => {
    const recent = useRecentPicks('athletes', owner)
    for (const id of ['a', 'b', 'a', 'c']) recent.remember(id)
    expect(recent.ids.value).toEqual(['c', 'a', 'b'])
    const other = useRecentPicks('athletes', ref({ userId: 'user-2', clubId: 'club-1' }))
    expect(other.ids.value).toEqual([])
    // A later screen of the same person reads them back.
    expect(useRecentPicks('athletes', owner).ids.value).toEqual(['c', 'a', 'b'])
    await nextTick()
  })

  it('leaves nothing on the device after signing out', async () => {
    useRecentPicks('athletes', owner).remember('a')
    useRecentPicks('elements', owner).remember('e')
    localStorage.setItem('unrelated', 'kept')
    await useSessionStore().signOut()
    expect(Object.keys(localStorage).filter((k) => k.startsWith('twofold.recent.'))).toEqual([])
    expect(localStorage.getItem('unrelated')).toBe('kept')
    forgetRecentPicks()
  })
})
