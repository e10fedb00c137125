import { flushPromises } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import type { AthleteView as Athlete } from '@shared/schemas/athletes'
import * as athletesApi from '@/api/athletes'
import { ApiError } from '@/api/http'
import * as progressApi from '@/api/progress'
import * as squadsApi from '@/api/squads'
import AthletesEraseDialog from '@/components/athletes/AthletesEraseDialog.vue'
import AthleteView from '@/views/AthleteView.vue'
import { clubId, mountInProviders, signInAs, wait } from './audit-helpers'
import { mountWithProviders } from './mount'
import { progressRouter } from './progress-helpers'

vi.mock('@/api/athletes', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/athletes')>()),
  getAthlete: vi.fn(),
  eraseAthlete: vi.fn(),
}))
vi.mock('@/api/progress', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/progress')>()),
  listRecords: vi.fn(),
}))
vi.mock('@/api/squads', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/squads')>()),
  getSquadGrid: vi.fn(),
}))

const athlete: Athlete = {
  id: '22222222-2222-4222-8222-222222222222',
  givenName: 'Mia',
  familyName: 'Novak',
  birthYear: 2012,
  squadId: '66666666-6666-4666-8666-666666666601',
  discipline: 'artistic-women',
  squadName: 'Kites',
  archived: false,
}

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
const field = () => byTest('typed-confirm-input')!.querySelector('input')!
const submitButton = () => byTest('typed-confirm-submit') as HTMLButtonElement | null

async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}
async function type(text: string) {
  field().value = text
  field().dispatchEvent(new Event('input'))
  await settle()
}

/** The dialog as a page holds it, opened once the page is there, listening for the erasure. */
async function openDialog() {
  const show = ref(false)
  const erased = vi.fn()
  const page = defineComponent({
    setup: () => () =>
      h(AthletesEraseDialog, {
        show: show.value,
        'onUpdate:show': (open: boolean) => (show.value = open),
        clubId,
        athlete,
        onErased: erased,
      }),
  })
  mountInProviders(page)
  await settle()
  show.value = true
  await settle()
  return { show, erased }
}

beforeEach(() => {
  vi.mocked(athletesApi.eraseAthlete).mockReset().mockResolvedValue(undefined)
  vi.mocked(athletesApi.getAthlete).mockReset().mockResolvedValue(athlete)
  vi.mocked(progressApi.listRecords).mockReset().mockResolvedValue([])
  vi.mocked(squadsApi.getSquadGrid)
    .mockReset()
    .mockResolvedValue({
      squad: { id: athlete.squadId, name: 'Kites' },
      athletes: [],
      columns: [],
      cells: [],
    })
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AthletesEraseDialog', () => {
  it('states what goes, and works only once the full name is typed exactly', async () => {
    await openDialog()
    const text = byTest('typed-confirm')!.textContent!
    expect(text).toContain('Erase Mia Novak for good')
    expect(text).toContain('every progress entry and record')
    expect(text).toContain('“Erased athlete”')
    expect(text).toContain('This cannot be undone.')
    expect(submitButton()!.disabled).toBe(true)
    for (const attempt of ['Mia', 'mia novak', 'Mia  Novak']) {
      await type(attempt)
      expect(submitButton()!.disabled, attempt).toBe(true)
    }
    await type('Mia Novak')
    expect(submitButton()!.disabled).toBe(false)
  })

  it('erases with the typed name, closes and tells the page', async () => {
    const { show, erased } = await openDialog()
    await type('Mia Novak')
    submitButton()!.click()
    await settle()
    expect(athletesApi.eraseAthlete).toHaveBeenCalledWith(clubId, athlete.id, {
      confirmName: 'Mia Novak',
    })
    expect(erased).toHaveBeenCalledOnce()
    expect(show.value).toBe(false)
  })

  it('puts the server’s refusal on the field and stays open', async () => {
    const refusal = 'Type “Mia Novak” exactly to erase this athlete.'
    vi.mocked(athletesApi.eraseAthlete).mockRejectedValue(
      new ApiError(400, 'confirmation_mismatch', refusal, [
        { path: 'confirmName', message: refusal },
      ]),
    )
    const { show, erased } = await openDialog()
    await type('Mia Novak')
    submitButton()!.click()
    await settle()
    expect(byTest('typed-confirm')!.textContent).toContain(refusal)
    expect(erased).not.toHaveBeenCalled()
    expect(show.value).toBe(true)
  })

  it('shows any other failure in the dialog and lets the person try again', async () => {
    vi.mocked(athletesApi.eraseAthlete).mockRejectedValueOnce(
      new ApiError(0, 'network', 'Twofold cannot be reached. Check the connection and try again.'),
    )
    const { erased } = await openDialog()
    await type('Mia Novak')
    submitButton()!.click()
    await settle()
    expect(byTest('typed-confirm-error')!.textContent).toContain('cannot be reached')
    expect(submitButton()!.disabled).toBe(false)
    submitButton()!.click()
    await settle()
    expect(erased).toHaveBeenCalledOnce()
  })

  it('is used from the keyboard: the field has the focus and a label, Enter erases', async () => {
    // The dialog's focus trap cannot be followed here; the field is what the dialog focuses.
    const focus = vi.spyOn(HTMLInputElement.prototype, 'focus')
    await openDialog()
    expect(focus.mock.contexts).toContain(field())
    focus.mockRestore()
    const label = document.querySelector(`label[for="${field().id}"]`)
    expect(label?.textContent).toContain("Type the athlete's full name to confirm")
    await type('Mia Novak')
    // Enter in the field submits its form, as a browser does with a submit button in it.
    field().form!.requestSubmit()
    await settle()
    expect(athletesApi.eraseAthlete).toHaveBeenCalledOnce()
  })
})

describe('AthleteView', () => {
  async function mountView(role: 'director' | 'coach') {
    const router = progressRouter()
    await router.push({ name: 'athlete', params: { athleteId: athlete.id } })
    const pinia = createPinia()
    setActivePinia(pinia)
    signInAs(role)
    const mounted = mountWithProviders(AthleteView, { athleteId: athlete.id }, { router, pinia })
    await settle()
    return mounted
  }

  it('offers directors to erase the athlete, and goes back to the squad afterwards', async () => {
    const { router } = await mountView('director')
    const card = byTest('athlete-erase')!
    expect(card.textContent).toContain('Erase for good')
    card.querySelector('button')!.click()
    await settle()
    await type('Mia Novak')
    submitButton()!.click()
    await settle()
    expect(athletesApi.eraseAthlete).toHaveBeenCalledOnce()
    expect(router.currentRoute.value).toMatchObject({
      name: 'squad',
      params: { squadId: athlete.squadId },
    })
  })

  it('does not offer coaches to erase', async () => {
    await mountView('coach')
    expect(document.body.textContent).toContain('Mia Novak')
    expect(byTest('athlete-erase')).toBeNull()
  })
})
