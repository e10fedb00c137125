import { flushPromises } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defaultAgeThresholds } from '@shared/domain/age-categories'
import { womensArtisticFloorProfile } from '@shared/domain/audit/readiness'
import type { RequirementProfileInput } from '@shared/schemas/audits'
import * as api from '@/api/audits'
import { ApiError } from '@/api/http'
import { useAuditSettingsStore } from '@/stores/auditSettings'
import RequirementProfilesView from '@/views/RequirementProfilesView.vue'
import { clubId, mountInProviders, wait } from './audit-helpers'
import { doubleSaltoProfile } from '../support/profiles'

vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  listRequirementProfiles: vi.fn(),
  getAgeThresholds: vi.fn(),
  createRequirementProfile: vi.fn(),
  saveRequirementProfile: vi.fn(),
  deleteRequirementProfile: vi.fn(),
}))

type Wrapper = ReturnType<typeof mountInProviders>['wrapper']

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

const tumblingJunior: RequirementProfileInput = {
  id: 'tumbling-junior-passes',
  ...doubleSaltoProfile('Tumbling junior passes', ['junior']),
}

/** The buttons whose text is exactly `text`, wherever they are (dialogs included). */
const buttons = (text: string) =>
  [...document.querySelectorAll('button')].filter((b) => b.textContent!.trim() === text)
const button = (text: string) => {
  const found = buttons(text)
  expect(found, `one button "${text}"`).toHaveLength(1)
  return found[0]!
}

async function click(element: Element) {
  element.dispatchEvent(new MouseEvent('click', { bubbles: true }))
  await settle()
}

/** Fills the short form: name, discipline, categories and source, then continues. */
async function fillNewForm(
  wrapper: Wrapper,
  fields: { label: string; discipline: string; categories: string[]; source: string },
) {
  const form = wrapper.find('[data-test="new-profile-form"]')
  await form.find('input[aria-label="Profile name"]').setValue(fields.label)
  await form.find('input[aria-label="Profile source"]').setValue(fields.source)
  await form.find(`input[type="radio"][value="${fields.discipline}"]`).setValue(true)
  for (const category of fields.categories) {
    await form.find(`[data-test="new-profile-${category}"]`).trigger('click')
  }
  await settle()
}

beforeEach(() => {
  vi.mocked(api.listRequirementProfiles).mockReset().mockResolvedValue([womensArtisticFloorProfile])
  vi.mocked(api.getAgeThresholds).mockReset().mockResolvedValue(defaultAgeThresholds)
  vi.mocked(api.createRequirementProfile)
    .mockReset()
    .mockImplementation(async (_club, input: RequirementProfileInput) => ({ ...input }))
  vi.mocked(api.saveRequirementProfile).mockReset()
  vi.mocked(api.deleteRequirementProfile).mockReset().mockResolvedValue(undefined)
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('useAuditSettingsStore: creating and deleting profiles', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('adds a created profile at the end of the list', async () => {
    const store = useAuditSettingsStore()
    store.profiles = [womensArtisticFloorProfile]
    const created = await store.createProfile(clubId, tumblingJunior)
    expect(api.createRequirementProfile).toHaveBeenCalledWith(clubId, tumblingJunior)
    expect(created).toEqual(tumblingJunior)
    expect(store.profiles.map((p) => p.id)).toEqual([
      womensArtisticFloorProfile.id,
      tumblingJunior.id,
    ])
  })

  it('refreshes the list when the id is taken, and lets the error through', async () => {
    const store = useAuditSettingsStore()
    store.profiles = [womensArtisticFloorProfile]
    vi.mocked(api.createRequirementProfile).mockRejectedValue(
      new ApiError(409, 'profile_exists', 'A requirement profile with that id already exists.', [
        { path: 'id', message: 'A requirement profile with that id already exists.' },
      ]),
    )
    vi.mocked(api.listRequirementProfiles).mockResolvedValue([
      womensArtisticFloorProfile,
      tumblingJunior,
    ])
    await expect(store.createProfile(clubId, tumblingJunior)).rejects.toMatchObject({
      status: 409,
    })
    expect(store.profiles.map((p) => p.id)).toEqual([
      womensArtisticFloorProfile.id,
      tumblingJunior.id,
    ])
  })

  it('drops a deleted profile from the list', async () => {
    const store = useAuditSettingsStore()
    store.profiles = [womensArtisticFloorProfile, tumblingJunior]
    await expect(store.deleteProfile(clubId, tumblingJunior.id)).resolves.toBe(true)
    expect(api.deleteRequirementProfile).toHaveBeenCalledWith(clubId, tumblingJunior.id)
    expect(store.profiles).toEqual([womensArtisticFloorProfile])
  })

  it('drops a profile deleted elsewhere meanwhile (404), resolving false', async () => {
    const store = useAuditSettingsStore()
    store.profiles = [womensArtisticFloorProfile, tumblingJunior]
    vi.mocked(api.deleteRequirementProfile).mockRejectedValue(
      new ApiError(404, 'not_found', 'No such requirement profile in this club.'),
    )
    await expect(store.deleteProfile(clubId, tumblingJunior.id)).resolves.toBe(false)
    expect(store.profiles).toEqual([womensArtisticFloorProfile])
  })

  it('keeps the profile and lets any other error through', async () => {
    const store = useAuditSettingsStore()
    store.profiles = [womensArtisticFloorProfile]
    vi.mocked(api.deleteRequirementProfile).mockRejectedValue(
      new ApiError(0, 'network', 'Twofold cannot be reached.'),
    )
    await expect(store.deleteProfile(clubId, womensArtisticFloorProfile.id)).rejects.toThrow(
      'Twofold cannot be reached.',
    )
    expect(store.profiles).toEqual([womensArtisticFloorProfile])
  })
})

// Each of these walks several Naive UI forms under happy-dom, which takes a few seconds.
const slow = { timeout: 30_000 }

describe('RequirementProfilesView: a new profile', slow, () => {
  it('offers New profile and Delete to the director only', async () => {
    mountInProviders(RequirementProfilesView, {}, { role: 'coach' })
    await settle()
    expect(document.body.textContent).toContain(womensArtisticFloorProfile.label)
    expect(byTest('new-profile')).toBeNull()
    expect(byTest('delete-profile')).toBeNull()
    document.body.innerHTML = ''

    mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    expect(byTest('new-profile')).not.toBeNull()
    expect(byTest('delete-profile')).not.toBeNull()
  })

  it('names every missing field of the short form and opens no draft', async () => {
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    await wrapper.find('[data-test="new-profile-form"] form').trigger('submit')
    await settle()
    const form = byTest('new-profile-form')!.textContent!
    expect(form).toContain('Name the profile.')
    expect(form).toContain('Choose a discipline.')
    expect(form).toContain('Choose the apparatus.')
    expect(form).toContain('Choose at least one category.')
    expect(form).toContain('Name the source, or write "from memory".')
    expect(byTest('profile-draft')).toBeNull()
  })

  it('opens the editor on a draft, then creates it under an id derived from its name', async () => {
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    expect(document.activeElement).toBe(
      document.querySelector('[data-test="new-profile-form"] input[aria-label="Profile name"]'),
    )
    await fillNewForm(wrapper, {
      label: 'Tumbling: junior passes',
      discipline: 'tumbling',
      categories: ['junior'],
      source: 'from memory',
    })
    await wrapper.find('[data-test="new-profile-form"] form').trigger('submit')
    await settle()

    expect(byTest('new-profile-form')).toBeNull()
    const draft = wrapper.find('[data-test="profile-draft"]')
    expect(draft.text()).toContain('Not saved yet')
    expect(draft.findAll('fieldset')).toHaveLength(1)
    const first = draft.find('[data-test="requirement-0"]')
    // keyboard users land on the requirement to fill in
    expect(document.activeElement).toBe(first.find('input').element)
    expect(api.createRequirementProfile).not.toHaveBeenCalled()

    const [label, source] = first.findAll('input')
    await label!.setValue('A double salto')
    await source!.setValue('from memory')
    await draft.find('form').trigger('submit')
    await settle()

    expect(api.createRequirementProfile).toHaveBeenCalledTimes(1)
    const [club, input] = vi.mocked(api.createRequirementProfile).mock.calls[0]!
    expect(club).toBe(clubId)
    expect(input).toMatchObject({
      id: 'tumbling-junior-passes',
      label: 'Tumbling: junior passes',
      discipline: 'tumbling',
      // the discipline's own apparatus, suggested when the discipline was chosen
      apparatus: 'tumbling',
      categories: ['junior'],
      source: 'from memory',
      requirements: [
        {
          label: 'A double salto',
          source: 'from memory',
          matches: { minRotationClass: 'single' },
          minStepIndex: 'competition-ready',
        },
      ],
    })
    expect(api.saveRequirementProfile).not.toHaveBeenCalled()
    expect(byTest('profile-draft')).toBeNull()
    expect(byTest('profile-tumbling-junior-passes')!.textContent).toContain(
      'Tumbling: junior passes',
    )
    expect(document.activeElement).toBe(
      byTest('profile-tumbling-junior-passes')!.querySelector('h3'),
    )
    expect(byTest('new-profile')!.hasAttribute('disabled')).toBe(false)
  })

  it('derives an id the club does not use yet', async () => {
    vi.mocked(api.listRequirementProfiles).mockResolvedValue([
      womensArtisticFloorProfile,
      tumblingJunior,
    ])
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    await fillNewForm(wrapper, {
      label: 'Tumbling junior passes',
      discipline: 'tumbling',
      categories: ['senior'],
      source: 'from memory',
    })
    await wrapper.find('[data-test="new-profile-form"] form').trigger('submit')
    await settle()
    const [label, source] = wrapper.find('[data-test="profile-draft"] fieldset').findAll('input')
    await label!.setValue('A double salto')
    await source!.setValue('from memory')
    await wrapper.find('[data-test="profile-draft"] form').trigger('submit')
    await settle()
    expect(vi.mocked(api.createRequirementProfile).mock.calls[0]![1].id).toBe(
      'tumbling-junior-passes-2',
    )
  })

  it('warns when another profile already covers the discipline and category', async () => {
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    await fillNewForm(wrapper, {
      label: 'Floor, second opinion',
      discipline: 'tumbling',
      categories: ['junior'],
      source: 'from memory',
    })
    expect(
      wrapper.find('[data-test="new-profile-form"] [data-test="profile-overlap"]').exists(),
    ).toBe(false)
    await wrapper
      .find('[data-test="new-profile-form"] input[type="radio"][value="artistic-women"]')
      .setValue(true)
    await settle()
    const note = wrapper.find('[data-test="new-profile-form"] [data-test="profile-overlap"]')
    expect(note.text()).toContain(`“${womensArtisticFloorProfile.label}” already applies`)
    expect(note.text()).toContain('junior category')
  })

  it('keeps the draft and tells the director to create again when the id was taken meanwhile', async () => {
    vi.mocked(api.createRequirementProfile).mockRejectedValue(
      new ApiError(409, 'profile_exists', 'A requirement profile with that id already exists.'),
    )
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    await fillNewForm(wrapper, {
      label: 'Tumbling junior passes',
      discipline: 'tumbling',
      categories: ['junior'],
      source: 'from memory',
    })
    await wrapper.find('[data-test="new-profile-form"] form').trigger('submit')
    await settle()
    vi.mocked(api.listRequirementProfiles).mockResolvedValue([
      womensArtisticFloorProfile,
      tumblingJunior,
    ])
    const [label, source] = wrapper.find('[data-test="profile-draft"] fieldset').findAll('input')
    await label!.setValue('A double salto')
    await source!.setValue('from memory')
    await wrapper.find('[data-test="profile-draft"] form').trigger('submit')
    await settle()
    expect(document.body.textContent).toContain(
      'A profile with a similar name was created meanwhile',
    )
    expect(byTest('profile-draft')).not.toBeNull()

    vi.mocked(api.createRequirementProfile).mockImplementation(async (_club, input) => ({
      ...input,
    }))
    await wrapper.find('[data-test="profile-draft"] form').trigger('submit')
    await settle()
    expect(vi.mocked(api.createRequirementProfile).mock.calls[1]![1].id).toBe(
      'tumbling-junior-passes-2',
    )
    expect(byTest('profile-draft')).toBeNull()
  })

  it('discards a draft without saving anything', async () => {
    const { wrapper } = mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('new-profile')!)
    expect(byTest('new-profile')!.hasAttribute('disabled')).toBe(true)
    await fillNewForm(wrapper, {
      label: 'Trampoline seniors',
      discipline: 'trampoline',
      categories: ['senior'],
      source: 'from memory',
    })
    await wrapper.find('[data-test="new-profile-form"] form').trigger('submit')
    await settle()
    await click(button('Discard draft'))
    expect(byTest('profile-draft')).toBeNull()
    expect(api.createRequirementProfile).not.toHaveBeenCalled()
    expect(byTest('new-profile')!.hasAttribute('disabled')).toBe(false)
    expect(document.activeElement).toBe(byTest('new-profile'))
  })
})

describe('RequirementProfilesView: deleting a profile', slow, () => {
  it('asks first, saying stored audits keep their results, then deletes and shows the empty state', async () => {
    mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('delete-profile')!)
    const dialog = document.querySelector('.n-dialog')
    expect(dialog!.textContent).toContain(womensArtisticFloorProfile.label)
    expect(dialog!.textContent).toContain('Audits already stored keep their results')
    expect(api.deleteRequirementProfile).not.toHaveBeenCalled()

    await click(button('Delete profile'))
    expect(api.deleteRequirementProfile).toHaveBeenCalledWith(clubId, womensArtisticFloorProfile.id)
    expect(byTest(`profile-${womensArtisticFloorProfile.id}`)).toBeNull()
    expect(document.body.textContent).toContain('No requirement profile')
    expect(document.body.textContent).toContain(`${womensArtisticFloorProfile.label} was deleted.`)
  })

  it('deletes nothing when the director keeps the profile', async () => {
    mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('delete-profile')!)
    await click(button('Keep it'))
    expect(api.deleteRequirementProfile).not.toHaveBeenCalled()
    expect(byTest(`profile-${womensArtisticFloorProfile.id}`)).not.toBeNull()
  })

  it('shows the error and keeps the profile when the deletion fails', async () => {
    vi.mocked(api.deleteRequirementProfile).mockRejectedValue(
      new ApiError(0, 'network', 'Twofold cannot be reached. Check the connection and try again.'),
    )
    mountInProviders(RequirementProfilesView, {}, { role: 'director' })
    await settle()
    await click(byTest('delete-profile')!)
    await click(button('Delete profile'))
    expect(document.body.textContent).toContain('Twofold cannot be reached.')
    expect(byTest(`profile-${womensArtisticFloorProfile.id}`)).not.toBeNull()
  })
})
