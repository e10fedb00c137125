import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { safetyCaution } from '@shared/domain/element'
import type { ProgressionStep } from '@shared/schemas/progressions'
import { ApiError } from '@/api/http'
import CatalogueProgressionEditor from '@/components/catalogue/CatalogueProgressionEditor.vue'
import { mountInProviders } from './catalogue-helpers'

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
    ])
    expect(document.body.textContent).toContain('Where do the athletes on each old step go?')
    expect(document.body.textContent).toContain('Old step 2. Into the foam pit')

    button('Save with this mapping').click()
    await flushPromises()
    // The removed pit step sends its athletes back to the step before it, never forward.
    expect(save).toHaveBeenLastCalledWith(expect.any(Array), [0, 0, 1, 2])
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
