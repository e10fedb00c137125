import {
  recordViewSchema,
  type CheckResultView,
  type DueAthlete,
  type EventResult,
  type MissingSkill,
  type ProgressEventInput,
  type RecordDetail,
  type RecordView,
} from '@shared/schemas/progress'
import { ApiError, request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`
const athlete = (clubId: string, athleteId: string) => `${club(clubId)}/athletes/${athleteId}`

/** The preview of an event: what the checks say, and the step a lost-skill pause would plan. */
export interface EventCheck {
  checks: CheckResultView[]
  plannedStepIndex: number | null
}

export const listRecords = (clubId: string, athleteId: string) =>
  request<RecordView[]>(`${athlete(clubId, athleteId)}/records`)
export const getRecordDetail = (clubId: string, athleteId: string, elementId: string) =>
  request<RecordDetail>(`${athlete(clubId, athleteId)}/records/${elementId}`)

export const checkEvent = (clubId: string, athleteId: string, input: ProgressEventInput) =>
  request<EventCheck>(`${athlete(clubId, athleteId)}/events/check`, {
    method: 'POST',
    body: input,
  })
export const recordEvent = (clubId: string, athleteId: string, input: ProgressEventInput) =>
  request<EventResult>(`${athlete(clubId, athleteId)}/events`, { method: 'POST', body: input })

export const listMissingSkills = (clubId: string, squadId?: string | null) =>
  request<MissingSkill[]>(`${club(clubId)}/missing-skills`, { query: { squadId } })

/**
 * The record as it stands now, from a 409 answer: another coach wrote to it after this screen
 * loaded it. Null for any other error.
 */
export function conflictRecord(err: unknown): RecordView | null {
  if (!(err instanceof ApiError) || err.status !== 409 || err.code !== 'conflict') return null
  const body = err.body as { error?: { record?: unknown } } | undefined
  const parsed = recordViewSchema.safeParse(body?.error?.record)
  return parsed.success ? parsed.data : null
}

/** The readable athletes with nothing logged for `days` days (28 by default on the server). */
export const listProgressDue = (clubId: string, days?: number) =>
  request<DueAthlete[]>(`${club(clubId)}/progress-due`, { query: { days } })
