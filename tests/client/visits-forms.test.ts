import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { safetyCaution } from '@shared/domain/element'
import * as elementsApi from '@/api/elements'
import { ApiError } from '@/api/http'
import * as api from '@/api/visits'
import VisitsRecommendationForm from '@/components/visits/VisitsRecommendationForm.vue'
import VisitsRecommendationList from '@/components/visits/VisitsRecommendationList.vue'
import VisitsVisitForm from '@/components/visits/VisitsVisitForm.vue'
import { mountInProviders } from './catalogue-helpers'

vi.mock('@/api/visits', () => ({
  listVisits: vi.fn(),
  createVisit: vi.fn(),
  updateVisit: vi.fn(),
  cancelVisit: vi.fn(),
  listRecommendations: vi.fn(),
  createRecommendation: vi.fn(),
  setRecommendationStatus: vi.fn(),
}))
vi.mock('@/api/elements', () => ({ getElement: vi.fn() }))

const clubId = '11111111-1111-4111-8111-111111111111'
const squadId = '22222222-2222-4222-8222-222222222222'
const athleteId = '33333333-3333-4333-8333-333333333333'
const elementId = '44444444-4444-4444-8444-444444444444'
const text = () => document.body.textContent ?? ''

beforeEach(() => {
  vi.mocked(api.listRecommendations).mockResolvedValue([])
  vi.mocked(elementsApi.getElement).mockResolvedValue({
    steps: [
      { name: 'Drill on the floor', modality: 'drill', criterion: 'Five clean' },
      { name: 'Spotted', modality: 'spotted', criterion: 'Three spotted' },
    ],
  } as never)
})
afterEach(() => {
  document.body.innerHTML = ''
  vi.clearAllMocks()
})

describe('VisitsRecommendationForm', () => {
  it('shows the safety caution where it suggests a step on an element', async () => {
    mountInProviders(VisitsRecommendationForm, { clubId, squadId, athleteId, elementId })
    await flushPromises()
    expect(text()).toContain(safetyCaution)
    expect(text()).toContain('Step to aim for')
  })

  it('shows no caution for a recommendation on the squad as a whole', async () => {
    mountInProviders(VisitsRecommendationForm, { clubId, squadId })
    await flushPromises()
    expect(text()).not.toContain(safetyCaution)
  })

  it('names the missing fields before sending anything', async () => {
    mountInProviders(VisitsRecommendationForm, { clubId, squadId, athleteId, elementId })
    await flushPromises()
    document.querySelector<HTMLFormElement>('[data-test="recommendation-form"]')!.requestSubmit()
    await flushPromises()
    expect(text()).toContain('Choose the step to aim for.')
    expect(text()).toContain('Write the recommendation.')
    expect(api.createRecommendation).not.toHaveBeenCalled()
  })
})

describe('VisitsVisitForm', () => {
  it('asks for a clinician or an e-mail and for squads, naming the fields', async () => {
    mountInProviders(VisitsVisitForm, { clubId, clinicians: [], squads: [] })
    await flushPromises()
    document.querySelector<HTMLFormElement>('[data-test="visit-form"]')!.requestSubmit()
    await flushPromises()
    expect(text()).toContain('Choose a clinician or enter the e-mail address to invite.')
    expect(text()).toContain('Choose at least one squad.')
    expect(api.createVisit).not.toHaveBeenCalled()
  })
})

describe('VisitsRecommendationList', () => {
  const rec = {
    id: '55555555-5555-4555-8555-555555555555',
    visitId: '66666666-6666-4666-8666-666666666666',
    squadId,
    squadName: 'Squad A',
    athleteId,
    athleteName: 'Ada Example',
    elementId,
    elementName: 'Back tuck',
    suggestedStepIndex: 1,
    suggestedStepName: 'Spotted',
    clipId: null,
    text: 'Hold the tuck longer.',
    priority: 'high' as const,
    dueOn: '2030-01-10',
    status: 'open' as const,
    clinicianName: 'Visiting Expert',
    createdAt: '2030-01-01T10:00:00.000Z',
    history: [
      {
        status: 'open' as const,
        note: '',
        byName: 'Visiting Expert',
        at: '2030-01-01T10:00:00.000Z',
      },
    ],
  }

  it('lets a coach decline only with a reason, showing the server’s word on the field', async () => {
    vi.mocked(api.listRecommendations).mockResolvedValue([rec])
    vi.mocked(api.setRecommendationStatus).mockRejectedValue(
      new ApiError(400, 'invalid_input', 'Say why you decline it.', [
        { path: 'note', message: 'Say why you decline it.' },
      ]),
    )
    mountInProviders(VisitsRecommendationList, { clubId, filter: { athleteId }, canAnswer: true })
    await flushPromises()
    expect(text()).toContain('Aim for step 2: Spotted')
    expect(text()).toContain(safetyCaution)
    const buttons = () => [...document.querySelectorAll('button')]
    buttons()
      .find((b) => b.textContent?.includes('Decline…'))!
      .click()
    await flushPromises()
    buttons()
      .find((b) => b.textContent?.trim() === 'Decline')!
      .click()
    await flushPromises()
    expect(api.setRecommendationStatus).toHaveBeenCalledWith(clubId, rec.id, {
      status: 'declined',
      note: '',
    })
    expect(document.querySelector('p.error')?.textContent).toContain('Say why you decline it.')
  })

  it('offers no actions to the director', async () => {
    vi.mocked(api.listRecommendations).mockResolvedValue([rec])
    mountInProviders(VisitsRecommendationList, { clubId, filter: { athleteId }, canAnswer: false })
    await flushPromises()
    expect(text()).toContain('Hold the tuck longer.')
    expect(text()).not.toContain('Accept')
  })
})
