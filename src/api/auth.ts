import type {
  AcceptInvitationInput,
  ChangePasswordInput,
  InvitationPreview,
  LocalMail,
  Me,
  SessionView,
  SignInInput,
} from '@shared/schemas/auth'
import { request } from './http'

export const getMe = () => request<Me>('/auth/me')
export const getLocalMail = () => request<LocalMail>('/auth/local-mail')
export const signIn = (input: SignInInput) =>
  request<Me>('/auth/sign-in', { method: 'POST', body: input })
export const signOut = () => request<void>('/auth/sign-out', { method: 'POST' })
export const switchClub = (clubId: string) =>
  request<Me>('/auth/club', { method: 'POST', body: { clubId } })

export const listSessions = () => request<SessionView[]>('/auth/sessions')
export const endSession = (handle: string) =>
  request<void>(`/auth/sessions/${handle}`, { method: 'DELETE' })
export const endOtherSessions = () => request<void>('/auth/sessions/end-others', { method: 'POST' })
export const changePassword = (input: ChangePasswordInput) =>
  request<void>('/auth/password', { method: 'POST', body: input })

export const requestPasswordReset = (email: string) =>
  request<{ message: string }>('/auth/password-reset/request', { method: 'POST', body: { email } })
export const confirmPasswordReset = (token: string, newPassword: string) =>
  request<void>('/auth/password-reset/confirm', { method: 'POST', body: { token, newPassword } })

export const previewInvitation = (token: string) =>
  request<InvitationPreview>('/auth/invitations/preview', { method: 'POST', body: { token } })
export const acceptInvitation = (input: AcceptInvitationInput) =>
  request<Me>('/auth/invitations/accept', { method: 'POST', body: input })
