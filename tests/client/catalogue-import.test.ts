import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '@/api/elements'
import CatalogueImportDialog from '@/components/catalogue/CatalogueImportDialog.vue'
import { mountInProviders } from './catalogue-helpers'
import { chooseCsvFile, importButton } from './import-helpers'

vi.mock('@/api/elements', () => ({
  listElements: vi.fn(async () => []),
  importElements: vi.fn(),
}))

const clubId = '11111111-1111-4111-8111-111111111111'
const csv = [
  'name,apparatus,direction,quarterRotations,twists,shape,takeOff,difficultyLetter,notes',
  'Back tuck,floor,backward,4,0,tuck,round-off,A,',
  'Front tuck,floor,upward,4,0,tuck,punch,,',
  '',
  'Double back tuck,floor,backward,8,0,tuck,round-off,,"from a round-off, back handspring"',
].join('\n')

beforeEach(() => {
  vi.mocked(api.importElements).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('CatalogueImportDialog', () => {
  it('parses the file, runs a dry run and shows the errors of each row', async () => {
    vi.mocked(api.importElements).mockResolvedValue({
      valid: false,
      errors: [
        {
          row: 2,
          field: 'direction',
          message: 'Choose the direction of the salto: forward, backward or sideward.',
        },
      ],
      created: 0,
    })
    mountInProviders(CatalogueImportDialog, { clubId, show: true })
    await chooseCsvFile(csv)

    expect(api.importElements).toHaveBeenCalledTimes(1)
    const [sentClub, rows, dryRun] = vi.mocked(api.importElements).mock.calls[0]!
    expect(sentClub).toBe(clubId)
    expect(dryRun).toBe(true)
    // The empty line is skipped and the quoted comma stays inside its cell.
    expect(rows).toHaveLength(3)
    expect(rows[2]).toMatchObject({ notes: 'from a round-off, back handspring' })

    const errors = document.querySelector('[data-test="import-errors"]')!.textContent ?? ''
    expect(errors).toContain('2')
    expect(errors).toContain('direction')
    expect(errors).toContain('Choose the direction of the salto')
    const preview = document.querySelector('[data-test="import-preview"]')!.textContent ?? ''
    expect(preview).toContain('direction: Choose the direction of the salto')
    expect(document.body.textContent).toContain('nothing was saved')
    expect(importButton().disabled).toBe(true)
  })

  it('enables the import only once the dry run is valid, then imports for real', async () => {
    vi.mocked(api.importElements)
      .mockResolvedValueOnce({ valid: true, errors: [], created: 0 })
      .mockResolvedValueOnce({ valid: true, errors: [], created: 3 })
    const { wrapper } = mountInProviders(CatalogueImportDialog, { clubId, show: true })
    expect(importButton().disabled).toBe(true)
    await chooseCsvFile(csv)
    expect(document.body.textContent).toContain('Nothing has been saved yet')
    expect(importButton().disabled).toBe(false)

    importButton().click()
    await flushPromises()
    expect(api.importElements).toHaveBeenLastCalledWith(clubId, expect.any(Array), false)
    const dialog = wrapper.findComponent(CatalogueImportDialog)
    expect(dialog.emitted('imported')).toEqual([[3]])
  })

  it('names the columns missing from the header', async () => {
    vi.mocked(api.importElements).mockResolvedValue({ valid: false, errors: [], created: 0 })
    mountInProviders(CatalogueImportDialog, { clubId, show: true })
    await chooseCsvFile('name,direction\nBack tuck,backward\n')
    expect(document.body.textContent).toContain(
      'The file has no column apparatus, quarterRotations, twists, shape, takeOff, difficultyLetter, notes.',
    )
  })
})
