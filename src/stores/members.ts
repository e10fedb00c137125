import { defineStore } from 'pinia'
import { ref } from 'vue'
import type {
  InvitationInput,
  InvitationView,
  MembershipUpdate,
  MemberView,
} from '@shared/schemas/auth'
import * as api from '@/api/members'

/** The club's members and open invitations (directors). */
export const useMembersStore = defineStore('members', () => {
  const members = ref<MemberView[]>([])
  const invitations = ref<InvitationView[]>([])
  const loading = ref(false)
  const error = ref<string | null>(null)

  /** Loads both lists; the error is kept for the view to show. */
  async function load(clubId: string) {
    loading.value = true
    error.value = null
    try {
      ;[members.value, invitations.value] = await Promise.all([
        api.listMembers(clubId),
        api.listInvitations(clubId),
      ])
    } catch (err) {
      error.value = err instanceof Error ? err.message : String(err)
    } finally {
      loading.value = false
    }
  }

  async function invite(clubId: string, input: InvitationInput) {
    const created = await api.invite(clubId, input)
    invitations.value = [...invitations.value, created]
  }

  async function changeRole(clubId: string, userId: string, input: MembershipUpdate) {
    const updated = await api.updateMember(clubId, userId, input)
    members.value = members.value.map((m) => (m.userId === userId ? updated : m))
  }

  async function end(clubId: string, userId: string) {
    await api.endMembership(clubId, userId)
    members.value = members.value.filter((m) => m.userId !== userId)
  }

  async function resend(clubId: string, id: string) {
    await api.resendInvitation(clubId, id)
    invitations.value = await api.listInvitations(clubId)
  }

  async function withdraw(clubId: string, id: string) {
    await api.withdrawInvitation(clubId, id)
    invitations.value = invitations.value.filter((i) => i.id !== id)
  }

  return { members, invitations, loading, error, load, invite, changeRole, end, resend, withdraw }
})
