import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '@/api/athletes'
import AthletesImportDialog from '@/components/athletes/AthletesImportDialog.vue'
import { clubId, mountInProviders } from './progress-helpers'
import { chooseCsvFile, importButton } from './import-helpers'

vi.mock('@/api/athletes', () => ({
  importRoster: vi.fn(),
  listAthletes: vi.fn(async () => []),
}))

const csv = [
  'givenName,familyName,birthYear,squad,discipline',
  'Mia,Novak,2013,,tumbling',
  'Lena,Ortiz,20x3,Junior tumbling,tumbling',
].join('\n')

beforeEach(() => {
  vi.mocked(api.importRoster).mockReset()
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AthletesImportDialog', () => {
  it('checks the file with a dry run, shows the errors of each row and keeps Import disabled', async () => {
    vi.mocked(api.importRoster).mockResolvedValue({
      valid: false,
      errors: [
        { row: 2, field: 'birthYear', message: 'Enter the birth year as a number, e.g. 2014.' },
      ],
      created: 0,
    })
    mountInProviders(AthletesImportDialog, { clubId, squadName: 'Junior tumbling', show: true })
    expect(document.body.textContent).toContain('Nothing is saved until every row is valid')
    await chooseCsvFile(csv)

    const [, rows, dryRun] = vi.mocked(api.importRoster).mock.calls[0]!
    expect(dryRun).toBe(true)
    // A row naming no squad joins the squad on screen.
    expect(rows[0]).toMatchObject({ givenName: 'Mia', squad: 'Junior tumbling' })
    const errors = document.querySelector('[data-test="import-errors"]')!.textContent ?? ''
    expect(errors).toContain('birthYear')
    expect(errors).toContain('Enter the birth year as a number')
    expect(importButton().disabled).toBe(true)
  })

  it('imports for real once every row is valid', async () => {
    vi.mocked(api.importRoster)
      .mockResolvedValueOnce({ valid: true, errors: [], created: 0 })
      .mockResolvedValueOnce({ valid: true, errors: [], created: 2 })
    const { wrapper } = mountInProviders(AthletesImportDialog, {
      clubId,
      squadName: 'Junior tumbling',
      show: true,
    })
    await chooseCsvFile(csv.replace('20x3', '2013'))
    expect(document.body.textContent).toContain('Nothing has been saved yet')
    expect(importButton().disabled).toBe(false)
    importButton().click()
    await flushPromises()
    expect(api.importRoster).toHaveBeenLastCalledWith(clubId, expect.any(Array), false)
    expect(wrapper.findComponent(AthletesImportDialog).emitted('imported')).toEqual([[2]])
  })
})
