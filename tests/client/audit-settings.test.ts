import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defaultAgeThresholds } from '@shared/domain/age-categories'
import { womensArtisticFloorProfile } from '@shared/domain/audit/readiness'
import * as api from '@/api/audits'
import { ApiError } from '@/api/http'
import AuditsView from '@/views/AuditsView.vue'
import RequirementProfilesView from '@/views/RequirementProfilesView.vue'
import { auditSummary, clubId, mountInProviders, wait } from './audit-helpers'

vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  listAudits: vi.fn(),
  listAuditSquads: vi.fn(),
  listRequirementProfiles: vi.fn(),
  getAgeThresholds: vi.fn(),
  saveRequirementProfile: vi.fn(),
  saveAgeThresholds: vi.fn(),
}))

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(api.listAudits).mockReset().mockResolvedValue([auditSummary()])
  vi.mocked(api.listAuditSquads).mockReset().mockResolvedValue([])
  vi.mocked(api.listRequirementProfiles).mockReset().mockResolvedValue([womensArtisticFloorProfile])
  vi.mocked(api.getAgeThresholds).mockReset().mockResolvedValue(defaultAgeThresholds)
  vi.mocked(api.saveRequirementProfile).mockReset()
  vi.mocked(api.saveAgeThresholds).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AuditsView', () => {
  it('lists the audits with their figures and hash, and offers the run form to the director only', async () => {
    mountInProviders(AuditsView, {}, { role: 'director' })
    await settle()
    const text = document.body.textContent!
    expect(text).toContain('Whole club')
    expect(text).toContain('32.5%')
    expect(text).toContain('0.85')
    expect(text).toContain('a3f1c09e77b2')
    expect(byTest('run-audit')).not.toBeNull()
    expect(api.listAuditSquads).toHaveBeenCalledWith(clubId)
  })

  it('shows a coach the list without the run form', async () => {
    mountInProviders(AuditsView, {}, { role: 'coach' })
    await settle()
    expect(document.body.textContent).toContain('Whole club')
    expect(byTest('run-audit')).toBeNull()
    expect(api.listAuditSquads).not.toHaveBeenCalled()
  })
})

describe('RequirementProfilesView', () => {
  it('shows a coach the profiles and age bands with their sources, read-only', async () => {
    mountInProviders(RequirementProfilesView, {}, { role: 'coach' })
    await settle()
    const text = document.body.textContent!
    expect(text).toContain('A salto forward or sideward')
    expect(text).toContain(womensArtisticFloorProfile.source)
    // the apparatus the requirements are met on
    expect(text).toContain('met by floor elements')
    expect(text).toContain('should be checked against the current FIG rules')
    expect(byTest('thresholds-tumbling')!.textContent).toContain('from memory')
    expect(document.querySelector('input')).toBeNull()
  })

  it('saves the edited profile in the shape of the API, steps counted from 0', async () => {
    vi.mocked(api.saveRequirementProfile).mockImplementation(async (_club, input) => ({
      ...input,
      requirements: input.requirements,
    }))
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    const first = wrapper.find('[data-test="requirement-0"]')
    await first.find('input').setValue('A salto with a full twist or more')
    await first.find('input[type="radio"][value="step"]').setValue(true)
    await first.find('input[aria-label="Minimum step of requirement 1"]').setValue('4')
    await first.find('input[aria-label="Minimum step of requirement 1"]').trigger('blur')
    await wrapper.findAll('form')[0]!.trigger('submit')
    await settle()

    expect(api.saveRequirementProfile).toHaveBeenCalledTimes(1)
    const input = vi.mocked(api.saveRequirementProfile).mock.calls[0]![1]
    expect(input.id).toBe(womensArtisticFloorProfile.id)
    expect(input.apparatus).toBe('floor')
    expect(input.requirements[0]).toMatchObject({
      label: 'A salto with a full twist or more',
      minStepIndex: 3,
      matches: { minRotationClass: 'single', minTwistBand: 'full' },
    })
    expect(input.requirements[2]!.matches.direction).toEqual(['forward', 'sideward'])
    expect(input.requirements[3]!.matches.direction).toBe('backward')
  })

  it('puts the server’s issue on the senior age', async () => {
    vi.mocked(api.saveAgeThresholds).mockRejectedValue(
      new ApiError(400, 'invalid_input', 'Check the fields.', [
        { path: 'seniorFromAge', message: 'The senior age must be above the junior age.' },
      ]),
    )
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await wrapper.find('[data-test="thresholds-trampoline"] form').trigger('submit')
    await settle()
    expect(api.saveAgeThresholds).toHaveBeenCalledWith(clubId, 'trampoline', {
      juniorFromAge: 13,
      seniorFromAge: 17,
      source: defaultAgeThresholds.trampoline.source,
    })
    expect(byTest('thresholds-trampoline')!.textContent).toContain(
      'The senior age must be above the junior age.',
    )
  })
})
