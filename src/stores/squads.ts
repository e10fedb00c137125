import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { MemberView } from '@shared/schemas/auth'
import type { SquadInput, SquadView } from '@shared/schemas/squads'
import { listMembers } from '@/api/members'
import * as api from '@/api/squads'

/** The squads the person may see and, for directors, the coaches they can assign. */
export const useSquadsStore = defineStore('squads', () => {
  const squads = ref<SquadView[]>([])
  /** Members with the coach role; only directors may list members, so empty for others. */
  const coaches = ref<MemberView[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  const byId = computed(() => new Map(squads.value.map((s) => [s.id, s])))
  const coachNames = computed(() => new Map(coaches.value.map((c) => [c.userId, c.name])))

  function put(squad: SquadView) {
    const known = squads.value.some((s) => s.id === squad.id)
    squads.value = known
      ? squads.value.map((s) => (s.id === squad.id ? squad : s))
      : [...squads.value, squad].sort((a, b) => a.name.localeCompare(b.name))
  }

  /**
   * Loads the squads; with `withCoaches` (directors) also the coaches to assign. The error is
   * kept for the view to show.
   */
  async function load(clubId: string, options: { withCoaches?: boolean } = {}) {
    loading.value = true
    error.value = null
    try {
      const [list, members] = await Promise.all([
        api.listSquads(clubId),
        options.withCoaches ? listMembers(clubId) : Promise.resolve([]),
      ])
      squads.value = list
      coaches.value = members.filter((m) => m.role === 'coach')
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  /** One squad, fresh from the server, kept in the list too. Lets the ApiError through. */
  async function loadOne(clubId: string, squadId: string) {
    const squad = await api.getSquad(clubId, squadId)
    put(squad)
    return squad
  }

  /** Creates a squad (directors); a duplicate name comes back as an ApiError on `name`. */
  async function create(clubId: string, input: SquadInput) {
    const squad = await api.createSquad(clubId, input)
    put(squad)
    return squad
  }

  async function update(clubId: string, squadId: string, input: SquadInput) {
    put(await api.updateSquad(clubId, squadId, input))
  }

  /** Replaces the squad's whole list of coaches. */
  async function assignCoaches(clubId: string, squadId: string, userIds: string[]) {
    put(await api.setSquadCoaches(clubId, squadId, userIds))
  }

  return {
    squads,
    coaches,
    loading,
    error,
    byId,
    coachNames,
    load,
    loadOne,
    create,
    update,
    assignCoaches,
  }
})
