import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { trampolineDifficultyEdition } from '@shared/domain/catalogue'
import type { ElementInput } from '@shared/schemas/elements'
import * as api from '@/api/elements'
import { ApiError } from '@/api/http'
import CatalogueElementForm from '@/components/catalogue/CatalogueElementForm.vue'
import { useCatalogueStore } from '@/stores/catalogue'
import { catalogueElement, linked, mountInProviders } from './catalogue-helpers'

vi.mock('@/api/elements', () => ({
  listElements: vi.fn(),
  createElement: vi.fn(),
  updateElement: vi.fn(),
}))

const clubId = '11111111-1111-4111-8111-111111111111'
const frontTuck = catalogueElement({ name: 'Front tuck', direction: 'forward' })
const backPike = catalogueElement({ name: 'Back pike', shape: 'pike' })

// FIG Trampoline Code of Points 2005 (as in tests/shared/catalogue.test.ts): back tuck 40o, 0.5.
const backTuck: ElementInput = {
  name: 'Back tuck',
  apparatus: 'trampoline',
  direction: 'backward',
  quarterRotations: 4,
  twists: [0],
  shape: 'tuck',
  takeOff: 'trampoline-bounce',
}

function mountForm(initial?: ElementInput) {
  vi.mocked(api.listElements).mockResolvedValue(linked([frontTuck, backPike]))
  const mounted = mountInProviders(CatalogueElementForm, { clubId, initial })
  return mounted
}

async function withCatalogue(initial?: ElementInput) {
  const mounted = mountForm(initial)
  await useCatalogueStore().load(clubId)
  await flushPromises()
  return mounted
}

const text = (selector: string) => document.querySelector(selector)?.textContent?.trim()

beforeEach(() => {
  vi.mocked(api.createElement).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('CatalogueElementForm', () => {
  it('previews the notation 40o and the difficulty 0.5 of a back tuck, with its edition', async () => {
    await withCatalogue(backTuck)
    expect(text('[data-test="notation"]')).toBe('40o')
    expect(text('[data-test="trampoline-difficulty"]')).toBe('0.5')
    expect(text('[data-test="preview"]')).toContain(trampolineDifficultyEdition)
  })

  it('finds the counterpart among the loaded elements and links to it', async () => {
    const { router } = await withCatalogue(backTuck)
    const link = document.querySelector<HTMLAnchorElement>('[data-test="counterpart"] a')
    expect(link?.textContent?.trim()).toBe('Front tuck')
    expect(link?.getAttribute('href')).toBe(
      router.resolve({ name: 'element', params: { id: frontTuck.id } }).href,
    )
  })

  it('says so when the catalogue has no counterpart', async () => {
    await withCatalogue({ ...backTuck, name: 'Back layout', shape: 'straight' })
    expect(text('[data-test="counterpart"]')).toBe('No counterpart in the catalogue')
  })

  it('shows one twist input per salto, following the rotation as it is typed', async () => {
    await withCatalogue(backTuck)
    const labels = () =>
      [...document.querySelectorAll('label')]
        .map((l) => l.textContent?.trim() ?? '')
        .filter((t) => t.startsWith('Twist in salto'))
    expect(labels()).toEqual(['Twist in salto 1 (half turns)'])
    const quarters = document.querySelector<HTMLInputElement>('input[name="quarterRotations"]')!
    quarters.value = '8'
    quarters.dispatchEvent(new Event('input'))
    await flushPromises()
    expect(labels()).toEqual(['Twist in salto 1 (half turns)', 'Twist in salto 2 (half turns)'])
    expect(text('[data-test="notation"]')).toBe('800o')
  })

  it('follows a twist as it is typed into its salto', async () => {
    await withCatalogue(backTuck)
    const twist = document.querySelector<HTMLInputElement>('input[name="twists.0"]')!
    twist.value = '2'
    twist.dispatchEvent(new Event('input'))
    await flushPromises()
    // FIG numeric notation (Trampoline Code of Points, from memory): quarter saltos, then the
    // half twists of each salto, then the shape; a back tuck with a full twist is 42o.
    expect(text('[data-test="notation"]')).toBe('42o')
  })

  it('checks the input with the shared schema before sending it', async () => {
    await withCatalogue({ ...backTuck, name: '' })
    document.querySelector('form')!.dispatchEvent(new Event('submit'))
    await flushPromises()
    expect(document.body.textContent).toContain('Enter the element name.')
    expect(api.createElement).not.toHaveBeenCalled()
  })

  it('links to the existing element when the server refuses a duplicate description', async () => {
    const existingId = '22222222-2222-4222-8222-222222222222'
    vi.mocked(api.createElement).mockRejectedValue(
      new ApiError(409, 'duplicate_description', 'Back tuck is already in the catalogue.', [], {
        error: { code: 'duplicate_description', message: '…', existingId },
      }),
    )
    await withCatalogue({ ...backTuck, name: 'Back salto' })
    document.querySelector('form')!.dispatchEvent(new Event('submit'))
    await flushPromises()
    expect(api.createElement).toHaveBeenCalledWith(
      clubId,
      expect.objectContaining({ name: 'Back salto' }),
    )
    const link = [...document.querySelectorAll('a')].find(
      (a) => a.textContent?.trim() === 'Open the existing element',
    )
    expect(link?.getAttribute('href')).toBe(`/catalogue/${existingId}`)
  })
})
