import { flushPromises } from '@vue/test-utils'
import { NSelect } from 'naive-ui'
import { afterEach, describe, expect, it, vi } from 'vitest'
import type { ProgressionStep } from '@shared/schemas/progressions'
import { ApiError } from '@/api/http'
import CatalogueProgressionEditor from '@/components/catalogue/CatalogueProgressionEditor.vue'
import CatalogueStepMapping from '@/components/catalogue/CatalogueStepMapping.vue'
import { mountInProviders } from './catalogue-helpers'

const steps: ProgressionStep[] = [
  { name: 'Floor drills', modality: 'floor-drill', criterion: 'Shows 5 set jumps.' },
  { name: 'Into the foam pit', modality: 'pit', criterion: 'Lands 8 of 10 feet first.' },
  { name: 'Solo on the floor', modality: 'floor-solo', criterion: 'Lands 8 of 10.' },
  { name: 'In a routine', modality: 'routine', criterion: 'Two sessions.' },
]

const button = (name: string) =>
  [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === name)!
const byLabel = (label: string) =>
  document.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`)!

afterEach(() => {
  document.body.innerHTML = ''
})

/** The editor with step 2 removed and saved once, so that the server asks for a mapping. */
async function askedForMapping() {
  const save = vi
    .fn()
    .mockRejectedValueOnce(new ApiError(409, 'steps_need_mapping', '3 athletes have records.'))
    .mockResolvedValueOnce(undefined)
  const { wrapper } = mountInProviders(CatalogueProgressionEditor, { steps, version: 2, save })
  byLabel('Remove step 2').click()
  await flushPromises()
  button('Save progression').click()
  await flushPromises()
  return { save, wrapper }
}

describe('CatalogueStepMapping in the progression editor', () => {
  it('takes focus to its question when it appears, the question naming the section', async () => {
    await askedForMapping()
    const heading = document.activeElement as HTMLElement
    expect(heading.tagName).toBe('H3')
    expect(heading.textContent).toContain('Where do the athletes on each old step go?')
    const section = document.querySelector('section.mapping')!
    expect(section.getAttribute('aria-labelledby')).toBe(heading.id)
    expect(section.textContent).toContain('3 athletes have records.')
  })

  it('sends the new step chosen for an old step with the save', async () => {
    const { save, wrapper } = await askedForMapping()
    const selects = wrapper.findComponent(CatalogueStepMapping).findAllComponents(NSelect)
    expect(selects).toHaveLength(4)
    // The proposal sends the removed pit step back to step 1; the coach chooses step 2 instead.
    selects[1]!.vm.$emit('update:value', 1)
    await flushPromises()
    button('Save with this mapping').click()
    await flushPromises()
    expect(save).toHaveBeenLastCalledWith(expect.any(Array), [0, 1, 1, 2], 2)
  })
})
