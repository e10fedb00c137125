import type { AgeThresholds, AgeThresholdTable } from '@shared/domain/age-categories'
import type { RequirementProfile } from '@shared/domain/audit/types'
import type { Discipline } from '@shared/domain/club'
import type {
  AuditJob,
  AuditReport,
  AuditRun,
  AuditSummary,
  BoardSummary,
  RequirementProfileInput,
} from '@shared/schemas/audits'
import type { ReportPdfJob } from '@shared/schemas/report-pdfs'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

/** What a recheck answers: the stored hash beside the hash of the inputs gathered again now. */
export interface AuditRecheck {
  inputHash: string
  currentHash: string
  unchanged: boolean
}

/**
 * What publishing answers: the audit, how many board members were e-mailed, and whether it was
 * published already (asked again, it stays as it was and nobody is e-mailed twice).
 */
export type PublishedAudit = AuditSummary & { notified: number; alreadyPublished: boolean }

/** A squad as the run form needs it; the audit feature reads nothing else of a squad. */
export interface AuditScopeSquad {
  id: string
  name: string
}

export const listAudits = (clubId: string) => request<AuditSummary[]>(`${club(clubId)}/audits`)
export const startAudit = (clubId: string, run: AuditRun) =>
  request<AuditJob>(`${club(clubId)}/audits`, { method: 'POST', body: run })
export const getAuditJob = (clubId: string, jobId: string) =>
  request<AuditJob>(`${club(clubId)}/audit-jobs/${jobId}`)
export const getAuditReport = (clubId: string, id: string) =>
  request<AuditReport>(`${club(clubId)}/audits/${id}`)
export const recheckAudit = (clubId: string, id: string) =>
  request<AuditRecheck>(`${club(clubId)}/audits/${id}/recheck`, { method: 'POST' })
export const publishAudit = (clubId: string, id: string) =>
  request<PublishedAudit>(`${club(clubId)}/audits/${id}/publish`, { method: 'POST' })

/** The squads to choose a scope from (the club's squad list, of which only id and name). */
export const listAuditSquads = (clubId: string) =>
  request<AuditScopeSquad[]>(`${club(clubId)}/squads`)

export const listRequirementProfiles = (clubId: string) =>
  request<RequirementProfile[]>(`${club(clubId)}/requirement-profiles`)
/** Creates a profile; a 409 `profile_exists` when the club already uses its id. */
export const createRequirementProfile = (clubId: string, input: RequirementProfileInput) =>
  request<RequirementProfile>(`${club(clubId)}/requirement-profiles`, {
    method: 'POST',
    body: input,
  })
/** Edits a profile that exists (404 otherwise). */
export const saveRequirementProfile = (clubId: string, input: RequirementProfileInput) =>
  request<RequirementProfile>(`${club(clubId)}/requirement-profiles/${input.id}`, {
    method: 'PUT',
    body: input,
  })
export const deleteRequirementProfile = (clubId: string, id: string) =>
  request<void>(`${club(clubId)}/requirement-profiles/${id}`, { method: 'DELETE' })
export const getAgeThresholds = (clubId: string) =>
  request<AgeThresholdTable>(`${club(clubId)}/age-thresholds`)
export const saveAgeThresholds = (clubId: string, discipline: Discipline, input: AgeThresholds) =>
  request<AgeThresholdTable>(`${club(clubId)}/age-thresholds/${discipline}`, {
    method: 'PUT',
    body: input,
  })

export const getBoardSummary = (clubId: string) =>
  request<BoardSummary>(`${club(clubId)}/board-summary`)

// The exports are plain download links, not fetches: the browser saves the file itself and the
// session cookie goes along as for any same-origin link.
const exportUrl = (clubId: string, id: string, file: string) =>
  `/api${club(clubId)}/audits/${id}/${file}`
export const gapsCsvUrl = (clubId: string, id: string) => exportUrl(clubId, id, 'gaps.csv')
export const headlineCsvUrl = (clubId: string, id: string) => exportUrl(clubId, id, 'headline.csv')

/** Asks for the audit's PDF report, drawn by a worker for what the person reads. */
export const startReportPdf = (clubId: string, auditId: string) =>
  request<ReportPdfJob>(`${club(clubId)}/audits/${auditId}/report-pdfs`, { method: 'POST' })
export const getReportPdf = (clubId: string, id: string) =>
  request<ReportPdfJob>(`${club(clubId)}/report-pdfs/${id}`)
/** The drawn PDF itself, for a link: the browser saves it under the name the server gives. */
export const reportPdfDownloadUrl = (clubId: string, id: string) =>
  `/api${club(clubId)}/report-pdfs/${id}/download`
