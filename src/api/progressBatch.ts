import type {
  BatchInput,
  BatchListQuery,
  BatchPreview,
  BatchResult,
} from '@shared/schemas/progress-batch'
import { request } from './http'

const batch = (clubId: string, squadId: string) =>
  `/clubs/${clubId}/squads/${squadId}/progress-batch`

/**
 * Every athlete of the squad on the element (or pair): step, next step, criterion, checks. A GET,
 * so that the service worker keeps the answer for the tablet offline.
 */
export const listBatch = (clubId: string, squadId: string, query: BatchListQuery) =>
  request<BatchPreview>(batch(clubId, squadId), { query: { ...query } })

/** Saves the ticked athletes' next steps in one transaction: all or nothing. */
export const saveBatch = (clubId: string, squadId: string, input: BatchInput) =>
  request<BatchResult>(batch(clubId, squadId), {
    method: 'POST',
    body: { ...input, dryRun: false },
  })
