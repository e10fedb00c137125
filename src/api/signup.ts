import type { Me } from '@shared/schemas/auth'
import type {
  ClubSignupConfirm,
  ClubSignupPreview,
  ClubSignupRequest,
} from '@shared/schemas/signup'
import { request } from './http'

/** Asks for a confirmation link to start a club; the answer is the same for every address. */
export const requestClubSignup = (input: ClubSignupRequest) =>
  request<{ message: string }>('/signup/request', { method: 'POST', body: input })

export const previewClubSignup = (token: string) =>
  request<ClubSignupPreview>('/signup/preview', { method: 'POST', body: { token } })

/** Creates the club and signs its new director in. */
export const confirmClubSignup = (input: ClubSignupConfirm) =>
  request<Me>('/signup/confirm', { method: 'POST', body: input })
