import { flushPromises } from '@vue/test-utils'

/** Chooses a CSV file in the open import dialog, then waits for the parse and the dry run. */
export async function chooseCsvFile(content: string, name = 'import.csv') {
  const input = document.querySelector<HTMLInputElement>('[data-test="import-file"]')!
  const file = new File([content], name, { type: 'text/csv' })
  // happy-dom cannot pick a file, so the input is given one as a browser would.
  Object.defineProperty(input, 'files', { value: [file], configurable: true })
  input.dispatchEvent(new Event('change'))
  await flushPromises()
  await flushPromises()
}

/** The import dialog's primary button. */
export const importButton = () =>
  document.querySelector<HTMLButtonElement>('[data-test="import-submit"]')!
