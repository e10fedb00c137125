import type {
  ElementDetail,
  ElementQuery,
  ImportResult,
  Prerequisite,
  ProgressionTemplateView,
  StepsUpdate,
} from '@shared/schemas/catalogue'
import type { CatalogueElement, ElementInput } from '@shared/schemas/elements'
import type { ProgressionStep } from '@shared/schemas/progressions'
import { request } from './http'

const club = (clubId: string) => `/clubs/${clubId}`

export const listElements = (clubId: string, query: ElementQuery = {}) =>
  request<CatalogueElement[]>(`${club(clubId)}/elements`, { query })
export const getElement = (clubId: string, id: string) =>
  request<ElementDetail>(`${club(clubId)}/elements/${id}`)
export const createElement = (clubId: string, input: ElementInput) =>
  request<CatalogueElement>(`${club(clubId)}/elements`, { method: 'POST', body: input })
export const updateElement = (clubId: string, id: string, input: ElementInput) =>
  request<CatalogueElement>(`${club(clubId)}/elements/${id}`, { method: 'PATCH', body: input })
export const deleteElement = (clubId: string, id: string) =>
  request<void>(`${club(clubId)}/elements/${id}`, { method: 'DELETE' })

export const updateSteps = (clubId: string, id: string, update: StepsUpdate) =>
  request<ElementDetail>(`${club(clubId)}/elements/${id}/steps`, { method: 'PUT', body: update })
export const updatePrerequisites = (clubId: string, id: string, prerequisites: Prerequisite[]) =>
  request<ElementDetail>(`${club(clubId)}/elements/${id}/prerequisites`, {
    method: 'PUT',
    body: { prerequisites },
  })

export const importElements = (clubId: string, rows: Record<string, unknown>[], dryRun: boolean) =>
  request<ImportResult>(`${club(clubId)}/elements/import`, {
    method: 'POST',
    body: { rows, dryRun },
  })

/** The CSV export is a plain download link, not a fetch: the browser saves the file itself. */
export const elementsExportUrl = (clubId: string) => `/api${club(clubId)}/elements/export`

export const listTemplates = (clubId: string) =>
  request<ProgressionTemplateView[]>(`${club(clubId)}/progression-templates`)
export const updateTemplate = (clubId: string, family: string, steps: ProgressionStep[]) =>
  request<ProgressionTemplateView>(
    `${club(clubId)}/progression-templates/${encodeURIComponent(family)}`,
    { method: 'PUT', body: { steps } },
  )
