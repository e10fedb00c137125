import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it, vi } from 'vitest'
import type { ImportResult } from '@shared/schemas/catalogue'
import { ApiError } from '@/api/http'
import CommonCsvImportDialog, {
  type CsvImportRequest,
} from '@/components/common/CommonCsvImportDialog.vue'
import { chooseCsvFile, importButton } from './import-helpers'
import { mountInProviders } from './progress-helpers'

const header = 'name,size,colour'
const csv = [header, 'Blue mat,2m,blue', 'Red mat,3x,red', 'Crash mat,4m,green'].join('\n')

function mountDialog(importRows: CsvImportRequest, props: Record<string, unknown> = {}) {
  const onUpdateShow = vi.fn()
  const mounted = mountInProviders(CommonCsvImportDialog, {
    show: true,
    'onUpdate:show': onUpdateShow,
    title: 'Import mats from CSV',
    noun: { one: 'mat', other: 'mats' },
    columns: ['name', 'size', 'colour'],
    example: 'Blue mat,2m,blue',
    importRows,
    ...props,
  })
  const dialog = () => mounted.wrapper.findComponent(CommonCsvImportDialog)
  return { ...mounted, dialog, onUpdateShow }
}

const text = (selector: string) => document.querySelector(selector)?.textContent ?? ''

/** The cells of each body row of a data table, as text. */
function tableRows(selector: string): string[][] {
  return [...document.querySelectorAll(`${selector} tbody tr`)].map((tr) =>
    [...tr.querySelectorAll('td')].map((td) => td.textContent?.trim() ?? ''),
  )
}

/** A promise the test settles itself, to look at the dialog while a request is in flight. */
function deferred<T>() {
  let resolve!: (value: T) => void
  const promise = new Promise<T>((r) => (resolve = r))
  return { promise, resolve }
}

const allValid: ImportResult = { valid: true, errors: [], created: 0 }
const sizeError = { row: 2, field: 'size', message: 'Write the size in metres, e.g. 3m.' }

afterEach(() => {
  document.body.innerHTML = ''
})

describe('CommonCsvImportDialog', () => {
  it('labels the file input and shows the expected header with an example row', () => {
    mountDialog(vi.fn())
    const input = document.querySelector<HTMLInputElement>('[data-test="import-file"]')!
    const label = document.querySelector(`label[for="${input.id}"]`)
    expect(label?.textContent).toBe('CSV file')
    expect(input.accept).toContain('.csv')
    expect(text('.example')).toBe('name,size,colour\nBlue mat,2m,blue')
    expect(importButton().disabled).toBe(true)
    expect(importButton().textContent?.trim()).toBe('Import mats')
  })

  it('reports a malformed file row by row and keeps Import disabled though the server accepts it', async () => {
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue(allValid)
    mountDialog(importRows)
    await chooseCsvFile([header, 'Blue mat,2m,blue', 'Red mat,3m', 'Crash mat,4m,green'].join('\n'))

    const problems = text('[data-test="import-file-problems"]')
    expect(problems).toContain('Problems reading the file')
    expect(problems).toMatch(/Row 2: Too few fields: expected 3 fields but parsed 2/)
    expect(problems).toContain('Nothing can be imported until the file is corrected')
    expect(importRows).toHaveBeenCalledTimes(1)
    expect(importRows.mock.calls[0]![1]).toBe(true)
    expect(importButton().disabled).toBe(true)
  })

  it('names the missing required columns, and lets a lenient dialog import anyway', async () => {
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue(allValid)
    mountDialog(importRows, { requiredColumns: ['name'], importDespiteFileProblems: true })
    await chooseCsvFile('size,colour\n2m,blue\n')

    expect(text('[data-test="import-file-problems"]')).toContain('The file has no column name.')
    expect(text('[data-test="import-file-problems"]')).not.toContain('Nothing can be imported')
    expect(importButton().disabled).toBe(false)
  })

  it('sends nothing for a file with no rows below its header', async () => {
    const importRows = vi.fn<CsvImportRequest>()
    mountDialog(importRows)
    await chooseCsvFile(`${header}\n\n`)

    expect(document.body.textContent).toContain('The file has no rows below its header.')
    expect(importRows).not.toHaveBeenCalled()
    expect(document.querySelector('[data-test="import-preview"]')).toBeNull()
    expect(importButton().disabled).toBe(true)
  })

  it('shows the dry run errors by row and field, in the error table and in the preview', async () => {
    const colourError = { row: 3, field: 'colour', message: 'Choose a colour from the list.' }
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue({
      valid: false,
      errors: [sizeError, colourError],
      created: 0,
    })
    mountDialog(importRows)
    await chooseCsvFile(csv)

    expect(importRows).toHaveBeenCalledTimes(1)
    const [rows, dryRun] = importRows.mock.calls[0]!
    expect(dryRun).toBe(true)
    expect(rows).toEqual([
      { name: 'Blue mat', size: '2m', colour: 'blue' },
      { name: 'Red mat', size: '3x', colour: 'red' },
      { name: 'Crash mat', size: '4m', colour: 'green' },
    ])

    expect(tableRows('[data-test="import-errors"]')).toEqual([
      ['2', 'size', 'Write the size in metres, e.g. 3m.'],
      ['3', 'colour', 'Choose a colour from the list.'],
    ])
    expect(document.body.textContent).toContain('2 of 3 rows have errors (2 in all)')

    // Rows with errors are shown alone at first; the switch brings back the valid row.
    const preview = tableRows('[data-test="import-preview"]')
    expect(preview.map((cells) => cells.slice(0, 3))).toEqual([
      ['2', '✗ size: Write the size in metres, e.g. 3m.', 'Red mat'],
      ['3', '✗ colour: Choose a colour from the list.', 'Crash mat'],
    ])
    const onlyErrors = document.querySelector<HTMLElement>(
      '[aria-label="Show only rows with errors"]',
    )!
    expect(onlyErrors.getAttribute('aria-checked')).toBe('true')
    onlyErrors.click()
    await flushPromises()
    expect(tableRows('[data-test="import-preview"]').map((cells) => cells.slice(0, 2))).toEqual([
      ['1', '✓ OK'],
      ['2', '✗ size: Write the size in metres, e.g. 3m.'],
      ['3', '✗ colour: Choose a colour from the list.'],
    ])
  })

  it('imports nothing while a row is invalid', async () => {
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue({
      valid: false,
      errors: [sizeError],
      created: 0,
    })
    const { dialog, onUpdateShow } = mountDialog(importRows)
    await chooseCsvFile(csv)

    expect(importButton().disabled).toBe(true)
    importButton().click()
    await flushPromises()
    expect(importRows).toHaveBeenCalledTimes(1)
    expect(importRows).not.toHaveBeenCalledWith(expect.anything(), false)
    expect(dialog().emitted('imported')).toBeUndefined()
    expect(onUpdateShow).not.toHaveBeenCalled()
  })

  it('shows the rows the server refused when the import itself fails, and stays open', async () => {
    const refused = [{ row: 1, field: 'name', message: 'A mat with this name already exists.' }]
    const importRows = vi
      .fn<CsvImportRequest>()
      .mockResolvedValueOnce(allValid)
      .mockRejectedValueOnce(
        new ApiError(422, 'invalid_rows', '1 rows have problems: nothing was imported.', [], {
          error: { code: 'invalid_rows', message: 'nothing was imported', rows: refused },
        }),
      )
    const { dialog, onUpdateShow } = mountDialog(importRows)
    await chooseCsvFile(csv)
    importButton().click()
    await flushPromises()

    expect(importRows).toHaveBeenLastCalledWith(expect.any(Array), false)
    expect(tableRows('[data-test="import-errors"]')).toEqual([
      ['1', 'name', 'A mat with this name already exists.'],
    ])
    expect(document.body.textContent).toContain('nothing was saved')
    expect(importButton().disabled).toBe(true)
    expect(dialog().emitted('imported')).toBeUndefined()
    expect(onUpdateShow).not.toHaveBeenCalled()
  })

  it('shows cells the server would not read by row and field, and imports nothing', async () => {
    const message =
      'Remove a tab from the cell: a cell is one line of text without control characters.'
    const importRows = vi
      .fn<CsvImportRequest>()
      .mockRejectedValue(
        new ApiError(400, 'invalid_input', 'Some fields are not valid.', [
          { path: 'rows.2.size', message },
        ]),
      )
    mountDialog(importRows)
    await chooseCsvFile([header, 'Blue mat,2m,blue', 'Red mat,"3\tm",red'].join('\n'))

    expect(importRows.mock.calls[0]![0][1]).toEqual({
      name: 'Red mat',
      size: '3\tm',
      colour: 'red',
    })
    expect(tableRows('[data-test="import-errors"]')).toEqual([['2', 'size', message]])
    expect(importButton().disabled).toBe(true)
    expect(importRows).not.toHaveBeenCalledWith(expect.anything(), false)
  })

  it('sends only the header’s columns of a row with more cells than the header', async () => {
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue(allValid)
    mountDialog(importRows)
    await chooseCsvFile([header, 'Blue mat,2m,blue,spare'].join('\n'))

    expect(text('[data-test="import-file-problems"]')).toContain('Too many fields')
    expect(importRows.mock.calls[0]![0]).toEqual([{ name: 'Blue mat', size: '2m', colour: 'blue' }])
  })

  it('shows progress, imports every row once the dry run is valid and emits the result', async () => {
    const dryRun = deferred<ImportResult>()
    const realRun = deferred<ImportResult>()
    const importRows = vi
      .fn<CsvImportRequest>()
      .mockReturnValueOnce(dryRun.promise)
      .mockReturnValueOnce(realRun.promise)
    const { dialog, onUpdateShow } = mountDialog(importRows)

    await chooseCsvFile(csv)
    expect(document.body.textContent).toContain('Checking 3 rows…')
    dryRun.resolve(allValid)
    await flushPromises()
    expect(document.body.textContent).toContain('3 rows are ready to import')
    expect(importButton().disabled).toBe(false)
    expect(importButton().textContent?.trim()).toBe('Import 3 mats')

    importButton().click()
    await flushPromises()
    expect(document.body.textContent).toContain('Importing 3 rows…')
    const [rows, dry] = importRows.mock.calls[1]!
    expect(dry).toBe(false)
    expect(rows).toHaveLength(3)

    const result: ImportResult = { valid: true, errors: [], created: 3 }
    realRun.resolve(result)
    await flushPromises()
    expect(dialog().emitted('imported')).toEqual([[result]])
    expect(onUpdateShow).toHaveBeenCalledWith(false)
    expect(document.body.textContent).toContain('3 mats imported.')
  })

  it('fills defaults into the rows before the check and says so', async () => {
    const importRows = vi.fn<CsvImportRequest>().mockResolvedValue(allValid)
    mountDialog(importRows, {
      prepareRows: (rows: Record<string, string>[]) => ({
        rows: rows.map((row) => ({ ...row, colour: row.colour || 'grey' })),
        notice: 'Rows with no colour will be grey.',
      }),
    })
    await chooseCsvFile(`${header}\nBlue mat,2m,\n`)

    expect(importRows.mock.calls[0]![0]).toEqual([{ name: 'Blue mat', size: '2m', colour: 'grey' }])
    expect(document.body.textContent).toContain('Rows with no colour will be grey.')
  })
})
