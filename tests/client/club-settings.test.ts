import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { Me } from '@shared/schemas/auth'
import * as authApi from '@/api/auth'
import * as clubsApi from '@/api/clubs'
import { ApiError } from '@/api/http'
import { navigationItems } from '@/router/navigation'
import { useSessionStore } from '@/stores/session'
import ClubSettingsView from '@/views/ClubSettingsView.vue'
import { clubId, mountInProviders, wait } from './audit-helpers'

vi.mock('@/api/clubs', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/clubs')>()),
  getClub: vi.fn(),
  deleteClub: vi.fn(),
}))
vi.mock('@/api/auth', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/auth')>()),
  getMe: vi.fn(),
}))

const club = { id: clubId, name: 'Demo club', lostSkillStepDown: 2, role: 'director' as const }
const otherClubId = '11111111-1111-4111-8111-111111111112'
const meAfterwards: Me = {
  user: { id: 'u1', email: 'director@demo.example', name: 'Sam' },
  memberships: [
    {
      clubId: otherClubId,
      clubName: 'Other club',
      role: 'coach',
      accessStartsOn: null,
      accessEndsOn: null,
      accessOpen: true,
    },
  ],
  activeClubId: otherClubId,
}

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)
async function settle() {
  await flushPromises()
  await wait(5)
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(clubsApi.getClub).mockReset().mockResolvedValue(club)
  vi.mocked(clubsApi.deleteClub).mockReset().mockResolvedValue(undefined)
  vi.mocked(authApi.getMe).mockReset().mockResolvedValue(meAfterwards)
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('ClubSettingsView', () => {
  it('is in the navigation of directors only', () => {
    const membership = { ...meAfterwards.memberships[0]!, clubId, role: 'director' as const }
    const me = { ...meAfterwards, memberships: [membership], activeClubId: clubId }
    const keys = (role: 'director' | 'coach' | 'board') =>
      navigationItems(me, { ...membership, role }).map((i) => i.key)
    expect(keys('director')).toContain('club-settings')
    expect(keys('coach')).not.toContain('club-settings')
    expect(keys('board')).not.toContain('club-settings')
  })

  it('shows loading, then an error with a way to try again', async () => {
    vi.mocked(clubsApi.getClub).mockRejectedValueOnce(
      new ApiError(503, 'database_unavailable', 'The database is not answering.'),
    )
    mountInProviders(ClubSettingsView)
    expect(document.body.textContent).toContain('Loading the club…')
    await settle()
    expect(document.body.textContent).toContain('The database is not answering.')
    const retry = [...document.querySelectorAll('button')].find((b) =>
      b.textContent?.includes('Try again'),
    )!
    retry.click()
    await settle()
    expect(byTest('club-name')!.textContent).toBe('Demo club')
  })

  it('deletes the club once its name is typed, then takes the person to their other club', async () => {
    const { router } = mountInProviders(ClubSettingsView)
    await router.push({ name: 'audits' })
    await settle()
    byTest('club-delete')!.querySelector('button')!.click()
    await settle()
    const dialog = byTest('typed-confirm')!
    expect(dialog.textContent).toContain('every audit, published or not')
    expect(dialog.textContent).toContain('This cannot be undone.')
    const input = byTest('typed-confirm-input')!.querySelector('input')!
    const submit = byTest('typed-confirm-submit') as HTMLButtonElement
    input.value = 'demo club'
    input.dispatchEvent(new Event('input'))
    await settle()
    expect(submit.disabled).toBe(true)
    input.value = 'Demo club'
    input.dispatchEvent(new Event('input'))
    await settle()
    submit.click()
    await settle()
    expect(clubsApi.deleteClub).toHaveBeenCalledWith(clubId, { confirmName: 'Demo club' })
    expect(authApi.getMe).toHaveBeenCalled()
    expect(useSessionStore().clubId).toBe(otherClubId)
    expect(router.currentRoute.value.name).toBe('home')
  })
})
