import { flushPromises } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import { safetyCaution } from '@shared/domain/element'
import type { ElementDetail } from '@shared/schemas/catalogue'
import type { ProgressionStep } from '@shared/schemas/progressions'
import * as api from '@/api/elements'
import { ApiError } from '@/api/http'
import CatalogueProgressionEditor from '@/components/catalogue/CatalogueProgressionEditor.vue'
import { useElementStore } from '@/stores/element'
import { catalogueElement, mountInProviders } from './catalogue-helpers'

vi.mock('@/api/elements', () => ({ getElement: vi.fn(), updateSteps: vi.fn() }))

const steps: ProgressionStep[] = [
  { name: 'Floor drills and timers', modality: 'floor-drill', criterion: 'Shows 5 set jumps.' },
  { name: 'Into the foam pit', modality: 'pit', criterion: 'Lands 8 of 10 feet first.' },
  { name: 'Solo on the floor', modality: 'floor-solo', criterion: 'Lands 8 of 10.' },
  { name: 'Competition-ready in a routine', modality: 'routine', criterion: 'Two sessions.' },
]

const button = (name: string) =>
  [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === name)!
const byLabel = (label: string) =>
  document.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`)!
const stepNames = () =>
  [...document.querySelectorAll<HTMLInputElement>('input[id*="-name-"]')].map((i) => i.value)

afterEach(() => {
  document.body.innerHTML = ''
})

describe('CatalogueProgressionEditor', () => {
  it('shows the safety caution and marks the last step competition-ready', () => {
    mountInProviders(CatalogueProgressionEditor, { steps, save: vi.fn() })
    expect(document.body.textContent).toContain(safetyCaution)
    const rows = document.querySelectorAll('li.row')
    expect(rows).toHaveLength(4)
    expect(rows[3]!.textContent).toContain('Competition-ready')
    expect(rows[2]!.textContent).not.toContain('Competition-ready')
  })

  it('reorders the steps with the Move buttons, for keyboard users', async () => {
    mountInProviders(CatalogueProgressionEditor, { steps, save: vi.fn() })
    byLabel('Move step 2 up').click()
    await flushPromises()
    expect(stepNames().slice(0, 2)).toEqual(['Into the foam pit', 'Floor drills and timers'])
    expect(byLabel('Move step 1 up').disabled).toBe(true)
  })

  it('asks where the athletes on each old step go when the server needs a mapping', async () => {
    const save = vi
      .fn()
      .mockRejectedValueOnce(
        new ApiError(409, 'steps_need_mapping', '3 athletes have records on this element.'),
      )
      .mockResolvedValueOnce(undefined)
    const { wrapper } = mountInProviders(CatalogueProgressionEditor, {
      steps,
      version: 4,
      save,
      athletesWithRecords: 3,
    })
    byLabel('Remove step 2').click()
    await flushPromises()
    button('Save progression').click()
    await flushPromises()

    expect(save).toHaveBeenCalledTimes(1)
    expect(save.mock.calls[0]).toEqual([
      steps.filter((_, i) => i !== 1).map((s) => ({ ...s, minDays: null })),
      undefined,
      4,
    ])
    expect(document.body.textContent).toContain('Where do the athletes on each old step go?')
    expect(document.body.textContent).toContain('Old step 2. Into the foam pit')

    button('Save with this mapping').click()
    await flushPromises()
    // The removed pit step sends its athletes back to the step before it, never forward.
    expect(save).toHaveBeenLastCalledWith(expect.any(Array), [0, 0, 1, 2], 4)
    expect(wrapper.findComponent(CatalogueProgressionEditor).emitted('saved')).toHaveLength(1)
  })

  it('checks the steps with the shared schema before saving', async () => {
    const save = vi.fn()
    mountInProviders(CatalogueProgressionEditor, { steps, save })
    button('Add a step').click()
    await flushPromises()
    button('Save progression').click()
    await flushPromises()
    expect(save).not.toHaveBeenCalled()
    expect(document.body.textContent).toContain('Enter the step name.')
    expect(document.body.textContent).toContain('Choose where the step is done (the modality).')
  })
})

/** What the page holds: the saved steps and their version, replaced when the server answers. */
function editorOnPage(save: (steps: ProgressionStep[], mapping?: number[], v?: number) => void) {
  const current = ref({ steps, version: 4 })
  const page = defineComponent({
    setup: () => () =>
      h(CatalogueProgressionEditor, {
        steps: current.value.steps,
        version: current.value.version,
        save: async (next: ProgressionStep[], mapping?: number[], version?: number) =>
          save(next, mapping, version),
      }),
  })
  return { current, ...mountInProviders(page) }
}

describe('CatalogueProgressionEditor when someone else changed the progression', () => {
  const theirs: ProgressionStep[] = [steps[0]!, steps[2]!, steps[1]!, steps[3]!]

  it('says so, shows the current steps, keeps the unsaved version and puts it back on request', async () => {
    const save = vi.fn()
    const { current } = editorOnPage(save)
    save.mockImplementationOnce(() => {
      current.value = { steps: theirs, version: 5 }
      throw new ApiError(
        409,
        'conflict',
        'Someone else has just changed this progression. Here it is as it stands now.',
      )
    })
    byLabel('Remove step 2').click()
    await flushPromises()
    button('Save progression').click()
    await flushPromises()

    expect(save).toHaveBeenCalledWith(expect.any(Array), undefined, 4)
    const alert = document.querySelector('[data-test="steps-conflict"]')!
    expect(alert.textContent).toContain('Someone else changed this progression')
    expect(alert.textContent).toContain('Your changes were not saved.')
    expect(alert.textContent).toContain('Your unsaved version (3 steps)')
    expect(document.activeElement?.textContent).toContain('Someone else changed this progression')
    // The editor now holds the current progression, to be edited against its version.
    expect(stepNames()).toEqual(theirs.map((s) => s.name))

    button('Put my changes back').click()
    await flushPromises()
    expect(document.querySelector('[data-test="steps-conflict"]')).toBeNull()
    expect(stepNames()).toEqual([steps[0]!.name, steps[2]!.name, steps[3]!.name])
    expect(document.querySelectorAll('li.row')[1]!.textContent).not.toContain('New')

    save.mockResolvedValueOnce(undefined)
    button('Save progression').click()
    await flushPromises()
    expect(save).toHaveBeenLastCalledWith(
      [steps[0], steps[2], steps[3]].map((s) => ({ ...s, minDays: null })),
      undefined,
      5,
    )
  })
})

describe('useElementStore().saveSteps', () => {
  const clubId = '11111111-1111-4111-8111-111111111111'
  const detail = (stepsVersion: number, progression: ProgressionStep[]): ElementDetail => ({
    ...catalogueElement({ name: 'Back tuck' }),
    steps: progression,
    prerequisites: [],
    athletesWithRecords: 2,
    templateFamily: 'single-salto',
    stepsVersion,
  })

  it('sends the version the edit was made against and keeps what the server answers', async () => {
    setActivePinia(createPinia())
    const store = useElementStore()
    const saved = detail(5, steps.slice(1))
    vi.mocked(api.updateSteps).mockResolvedValueOnce(saved)
    await store.saveSteps(clubId, saved.id, steps.slice(1), 4, [0, 0, 1, 2])
    expect(api.updateSteps).toHaveBeenLastCalledWith(clubId, saved.id, {
      steps: steps.slice(1),
      mapping: [0, 0, 1, 2],
      stepsVersion: 4,
    })
    expect(store.detail).toEqual(saved)
  })

  it('on a conflict keeps the current element from the answer and lets the error through', async () => {
    setActivePinia(createPinia())
    const store = useElementStore()
    const now = detail(6, [steps[1]!, steps[0]!, steps[2]!, steps[3]!])
    const refusal = new ApiError(409, 'conflict', 'Someone else has just changed this.', [], {
      error: { code: 'conflict', message: 'Someone else has just changed this.', element: now },
    })
    vi.mocked(api.updateSteps).mockRejectedValueOnce(refusal)
    await expect(store.saveSteps(clubId, now.id, steps, 5)).rejects.toBe(refusal)
    expect(store.detail).toEqual(now)
    expect(api.getElement).not.toHaveBeenCalled()
  })
})
