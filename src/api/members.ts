import type {
  InvitationInput,
  InvitationView,
  MembershipUpdate,
  MemberView,
} from '@shared/schemas/auth'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export const listMembers = (clubId: string) => request<MemberView[]>(`${club(clubId)}/members`)
export const updateMember = (clubId: string, userId: string, input: MembershipUpdate) =>
  request<MemberView>(`${club(clubId)}/members/${userId}`, { method: 'PATCH', body: input })
export const endMembership = (clubId: string, userId: string) =>
  request<void>(`${club(clubId)}/members/${userId}`, { method: 'DELETE' })

export const listInvitations = (clubId: string) =>
  request<InvitationView[]>(`${club(clubId)}/invitations`)
export const invite = (clubId: string, input: InvitationInput) =>
  request<InvitationView>(`${club(clubId)}/invitations`, { method: 'POST', body: input })
export const resendInvitation = (clubId: string, id: string) =>
  request<void>(`${club(clubId)}/invitations/${id}/resend`, { method: 'POST' })
export const withdrawInvitation = (clubId: string, id: string) =>
  request<void>(`${club(clubId)}/invitations/${id}`, { method: 'DELETE' })
