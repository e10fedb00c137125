import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { Me, SignInInput } from '@shared/schemas/auth'
import * as api from '@/api/auth'
import { ApiError, setUnauthorizedListener } from '@/api/http'
import { forgetRecentPicks } from '@/composables/recentPicks'
import { forgetApiAnswers } from '@/offline/caches'

/** Who is signed in, their clubs and the club they are working in. */
export const useSessionStore = defineStore('session', () => {
  const me = ref<Me | null>(null)
  /** True once the first `load()` has answered, signed in or not. */
  const ready = ref(false)

  const signedIn = computed(() => me.value !== null)
  const membership = computed(
    () => me.value?.memberships.find((m) => m.clubId === me.value?.activeClubId) ?? null,
  )
  const clubId = computed(() => membership.value?.clubId ?? null)
  const role = computed(() => membership.value?.role ?? null)

  function clear() {
    me.value = null
    // Nothing about athletes stays on the device once the session is over: a session that
    // expires (a 401) takes the kept API answers with it; the entries still waiting stay, for
    // their maker to send (src/stores/outbox.ts).
    forgetRecentPicks()
    void forgetApiAnswers().catch(() => undefined)
  }
  setUnauthorizedListener(clear)

  /** Asks the server who is signed in; a 401 simply means nobody. */
  async function load() {
    try {
      me.value = await api.getMe()
    } catch (err) {
      if (!(err instanceof ApiError && err.status === 401)) throw err
      me.value = null
    } finally {
      ready.value = true
    }
  }

  /** Signs in; lets the ApiError (wrong password, throttled) through to the form. */
  async function signIn(input: SignInInput) {
    me.value = await api.signIn(input)
  }

  async function signOut() {
    try {
      await api.signOut()
    } finally {
      clear()
    }
  }

  async function switchClub(id: string) {
    me.value = await api.switchClub(id)
  }

  /** After accepting an invitation the server has signed the person in. */
  function adopt(next: Me) {
    me.value = next
    ready.value = true
  }

  return {
    me,
    ready,
    signedIn,
    membership,
    clubId,
    role,
    load,
    signIn,
    signOut,
    switchClub,
    adopt,
    clear,
  }
})
