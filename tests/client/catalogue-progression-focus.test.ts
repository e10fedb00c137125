import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it, vi } from 'vitest'
import type { ProgressionStep } from '@shared/schemas/progressions'
import CatalogueProgressionEditor from '@/components/catalogue/CatalogueProgressionEditor.vue'
import { mountInProviders } from './catalogue-helpers'

const steps: ProgressionStep[] = [
  { name: 'Floor drills', modality: 'floor-drill', criterion: 'Shows 5 set jumps.' },
  { name: 'Into the foam pit', modality: 'pit', criterion: 'Lands 8 of 10 feet first.' },
  { name: 'In a routine', modality: 'routine', criterion: 'Two sessions.' },
]

const button = (name: string) =>
  [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === name)!
const byLabel = (label: string) =>
  document.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`)!
const nameInputs = () => [...document.querySelectorAll<HTMLInputElement>('input[id*="-name-"]')]

afterEach(() => {
  document.body.innerHTML = ''
})

describe('CatalogueProgressionEditor for keyboard users', () => {
  it('labels each field of a step by its id', () => {
    mountInProviders(CatalogueProgressionEditor, { steps, save: vi.fn() })
    for (const kind of ['name', 'criterion', 'days']) {
      const fields = document.querySelectorAll(`[id*="-${kind}-"]`)
      expect(fields).toHaveLength(3)
      for (const field of fields)
        expect(document.querySelector(`label[for="${field.id}"]`)).not.toBeNull()
    }
  })

  it('keeps focus on the step that moved, on its other button at the end', async () => {
    mountInProviders(CatalogueProgressionEditor, { steps, save: vi.fn() })
    byLabel('Move step 1 down').click()
    await flushPromises()
    expect(document.activeElement).toBe(byLabel('Move step 2 down'))
    byLabel('Move step 2 down').click()
    await flushPromises()
    // Now last, the step cannot move down again: focus goes to its Move up button.
    expect(document.activeElement).toBe(byLabel('Move step 3 up'))
    expect(nameInputs().map((i) => i.value)).toEqual([
      'Into the foam pit',
      'In a routine',
      'Floor drills',
    ])
  })

  it('takes focus to the name of an added step and of the step after a removed one', async () => {
    mountInProviders(CatalogueProgressionEditor, { steps, save: vi.fn() })
    button('Add a step').click()
    await flushPromises()
    // A new step goes in before the competition-ready one.
    expect(document.activeElement).toBe(nameInputs()[2])
    expect(nameInputs()[2]!.value).toBe('')
    byLabel('Remove step 1').click()
    await flushPromises()
    expect(document.activeElement).toBe(nameInputs()[0])
    expect(nameInputs()[0]!.value).toBe('Into the foam pit')
  })

  it('saves what was typed into the fields of a step', async () => {
    const save = vi.fn().mockResolvedValue(undefined)
    mountInProviders(CatalogueProgressionEditor, { steps, save })
    const name = nameInputs()[1]!
    name.value = 'Into the pit'
    name.dispatchEvent(new Event('input'))
    const days = document.querySelectorAll<HTMLInputElement>('input[id*="-days-"]')[1]!
    days.value = '14'
    days.dispatchEvent(new Event('input'))
    days.dispatchEvent(new Event('blur'))
    await flushPromises()
    button('Save progression').click()
    await flushPromises()
    expect(save.mock.calls[0]![0][1]).toEqual({ ...steps[1], name: 'Into the pit', minDays: 14 })
  })
})
