import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '@/api/elements'
import { ApiError } from '@/api/http'
import { useCatalogueStore } from '@/stores/catalogue'
import { catalogueElement, linked } from './catalogue-helpers'

vi.mock('@/api/elements', () => ({
  listElements: vi.fn(),
  createElement: vi.fn(),
  updateElement: vi.fn(),
  deleteElement: vi.fn(),
  importElements: vi.fn(),
}))

const clubId = '11111111-1111-4111-8111-111111111111'
const backTuck = catalogueElement({ name: 'Back tuck' })
const frontTuck = catalogueElement({ name: 'Front tuck', direction: 'forward' })
const backLayout = catalogueElement({ name: 'Back layout', shape: 'straight' })
const fullInDouble = catalogueElement({
  name: 'Full-in double back tuck',
  quarterRotations: 8,
  twists: [2, 0],
})
const catalogue = linked([backTuck, frontTuck, backLayout, fullInDouble])

beforeEach(() => {
  setActivePinia(createPinia())
  vi.mocked(api.listElements).mockReset().mockResolvedValue(catalogue)
})

describe('useCatalogueStore', () => {
  it('loads the whole catalogue of the club once and keeps it', async () => {
    const store = useCatalogueStore()
    await store.load(clubId)
    expect(api.listElements).toHaveBeenCalledWith(clubId)
    expect(store.elements.map((e) => e.name)).toEqual([
      'Back tuck',
      'Front tuck',
      'Back layout',
      'Full-in double back tuck',
    ])
    await store.ensureLoaded(clubId)
    expect(api.listElements).toHaveBeenCalledTimes(1)
  })

  it('keeps the error message for the view when the list cannot be loaded', async () => {
    vi.mocked(api.listElements).mockRejectedValue(
      new ApiError(0, 'network', 'Twofold cannot be reached.'),
    )
    const store = useCatalogueStore()
    await store.load(clubId)
    expect(store.error).toBe('Twofold cannot be reached.')
    expect(store.loading).toBe(false)
  })

  it('filters by direction, rotation class, twist band and shape', async () => {
    const store = useCatalogueStore()
    await store.load(clubId)
    store.filters.direction = 'backward'
    expect(store.visible.map((e) => e.name)).toEqual([
      'Back tuck',
      'Back layout',
      'Full-in double back tuck',
    ])
    store.filters.rotationClass = 'double'
    store.filters.twistBand = 'full'
    expect(store.visible.map((e) => e.name)).toEqual(['Full-in double back tuck'])
    store.clearFilters()
    store.filters.shape = 'straight'
    expect(store.visible.map((e) => e.name)).toEqual(['Back layout'])
    expect(store.filtered).toBe(true)
  })

  it('searches the name and the notation from its start', async () => {
    const store = useCatalogueStore()
    await store.load(clubId)
    store.filters.q = 'layout'
    expect(store.visible.map((e) => e.name)).toEqual(['Back layout'])
    // The notation does not carry the direction: a front and a back tuck are both 40o.
    store.filters.q = '40o'
    expect(store.visible.map((e) => e.name)).toEqual(['Back tuck', 'Front tuck'])
    store.filters.q = '820'
    expect(store.visible.map((e) => e.name)).toEqual(['Full-in double back tuck'])
  })

  it('lists the catalogue gaps over the whole list, whatever the filters', async () => {
    const store = useCatalogueStore()
    await store.load(clubId)
    store.filters.direction = 'backward'
    expect(store.gaps.backwardWithoutForward.map((e) => e.name)).toEqual([
      'Back layout',
      'Full-in double back tuck',
    ])
    expect(store.gaps.forwardWithoutBackward).toEqual([])
  })

  it('links a new element to its counterpart and gives the counterpart its link back', async () => {
    const frontLayout = catalogueElement({
      name: 'Front layout',
      direction: 'forward',
      shape: 'straight',
    })
    vi.mocked(api.createElement).mockResolvedValue(frontLayout)
    const store = useCatalogueStore()
    await store.load(clubId)
    await store.create(clubId, frontLayout)
    expect(store.byId.get(frontLayout.id)?.counterpartId).toBe(backLayout.id)
    expect(store.byId.get(backLayout.id)?.counterpartId).toBe(frontLayout.id)
    expect(store.gaps.backwardWithoutForward.map((e) => e.name)).toEqual([
      'Full-in double back tuck',
    ])
  })

  it('reloads the list after a real import but not after a dry run', async () => {
    vi.mocked(api.importElements).mockResolvedValue({ valid: true, errors: [], created: 0 })
    const store = useCatalogueStore()
    await store.load(clubId)
    await store.importRows(clubId, [{ name: 'Back pike' }], true)
    expect(api.importElements).toHaveBeenCalledWith(clubId, [{ name: 'Back pike' }], true)
    expect(api.listElements).toHaveBeenCalledTimes(1)
    vi.mocked(api.importElements).mockResolvedValue({ valid: true, errors: [], created: 1 })
    await store.importRows(clubId, [{ name: 'Back pike' }], false)
    expect(api.listElements).toHaveBeenCalledTimes(2)
  })
})
