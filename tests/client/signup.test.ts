import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import type { Me } from '@shared/schemas/auth'
import * as authApi from '@/api/auth'
import { ApiError } from '@/api/http'
import * as api from '@/api/signup'
import { routes } from '@/router'
import { useSessionStore } from '@/stores/session'
import ConfirmClubView from '@/views/ConfirmClubView.vue'
import SignInView from '@/views/SignInView.vue'
import StartClubView from '@/views/StartClubView.vue'
import { mountWithProviders } from './mount'

vi.mock('@/api/signup', () => ({
  requestClubSignup: vi.fn(),
  previewClubSignup: vi.fn(),
  confirmClubSignup: vi.fn(),
}))
vi.mock('@/api/auth', () => ({
  getLocalMail: vi.fn(),
  getMe: vi.fn(),
}))

const blank = { render: () => null }

/** The routes the pages link to, at the page's own path (so that its links resolve). */
async function signupRouter(at = '/start-club'): Promise<Router> {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: ['sign-in', 'forgot-password', 'start-club', 'confirm-club', 'catalogue'].map(
      (name) => ({
        path: `/${name}`,
        name,
        component: blank,
      }),
    ),
  })
  await router.push(at)
  return router
}

const fieldText = () =>
  [...document.querySelectorAll('.n-form-item-feedback__line')].map((e) => e.textContent?.trim())
const input = (id: string) => document.getElementById(id) as HTMLInputElement
async function type(id: string, value: string) {
  input(id).value = value
  input(id).dispatchEvent(new Event('input'))
  await flushPromises()
}
async function submit() {
  document.querySelector('form')!.dispatchEvent(new Event('submit'))
  await flushPromises()
}

const me: Me = {
  user: { id: 'u1', email: 'ines@lowfield.example', name: 'Ines Marwick' },
  memberships: [
    {
      clubId: '11111111-1111-4111-8111-111111111111',
      clubName: 'Lowfield Tumbling Club',
      role: 'director',
      accessStartsOn: null,
      accessEndsOn: null,
      accessOpen: true,
    },
  ],
  activeClubId: '11111111-1111-4111-8111-111111111111',
}

beforeEach(() => {
  vi.mocked(authApi.getLocalMail).mockResolvedValue({ url: 'http://127.0.0.1:40000/' })
})
afterEach(() => {
  vi.clearAllMocks()
  document.body.innerHTML = ''
  window.location.hash = ''
})

describe('the Start a club page', () => {
  it('is public and reached from the sign-in page', async () => {
    const route = (name: string) => routes.find((r) => r.name === name)
    expect(route('start-club')?.meta?.public).toBe(true)
    expect(route('confirm-club')?.meta?.public).toBe(true)
    mountWithProviders(SignInView, {}, { router: await signupRouter('/sign-in') })
    const link = document.querySelector<HTMLAnchorElement>('a[href="/start-club"]')
    expect(link?.textContent?.trim()).toBe('Start a club')
  })

  it('puts the shared schema’s messages on the fields and sends nothing', async () => {
    mountWithProviders(StartClubView, {}, { router: await signupRouter() })
    await type('f-club-name', 'L')
    await type('f-email', 'not-an-address')
    await submit()
    expect(fieldText()).toEqual([
      'Enter the club name (at least 2 characters).',
      'Enter your name.',
      'Enter an e-mail address such as name@example.org.',
    ])
    expect(api.requestClubSignup).not.toHaveBeenCalled()
  })

  it('sends the request and says where the link went, with the local mail note', async () => {
    vi.mocked(api.requestClubSignup).mockResolvedValue({
      message: 'A confirmation link is on its way to ines@lowfield.example.',
    })
    mountWithProviders(StartClubView, {}, { router: await signupRouter() })
    await type('f-club-name', ' Lowfield Tumbling Club ')
    await type('f-name', 'Ines Marwick')
    await type('f-email', 'Ines@Lowfield.example')
    await submit()
    expect(api.requestClubSignup).toHaveBeenCalledWith({
      clubName: 'Lowfield Tumbling Club',
      name: 'Ines Marwick',
      email: 'ines@lowfield.example',
    })
    expect(document.querySelector('.n-alert')?.textContent).toContain('on its way')
    expect(document.querySelector('a[href="http://127.0.0.1:40000/"]')).not.toBeNull()
  })

  it('shows a refusal of the server, such as too many requests', async () => {
    vi.mocked(api.requestClubSignup).mockRejectedValue(
      new ApiError(429, 'too_many_attempts', 'Too many sign-up requests. Try again in 60 seconds.'),
    )
    mountWithProviders(StartClubView, {}, { router: await signupRouter() })
    await type('f-club-name', 'Lowfield Tumbling Club')
    await type('f-name', 'Ines Marwick')
    await type('f-email', 'ines@lowfield.example')
    await submit()
    expect(document.querySelector('[role="alert"]')?.textContent).toContain('Try again in 60')
  })
})

describe('the confirmation page', () => {
  const preview = {
    clubName: 'Lowfield Tumbling Club',
    name: 'Ines Marwick',
    email: 'ines@lowfield.example',
    existingAccount: false,
  }

  it('reads the token from the fragment, confirms and lands on the catalogue signed in', async () => {
    window.location.hash = '#token=abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG'
    vi.mocked(api.previewClubSignup).mockResolvedValue(preview)
    vi.mocked(api.confirmClubSignup).mockResolvedValue(me)
    const router = await signupRouter('/confirm-club')
    mountWithProviders(ConfirmClubView, {}, { router })
    await flushPromises()
    expect(api.previewClubSignup).toHaveBeenCalledWith(
      'abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG',
    )
    expect(window.location.hash).toBe('')
    expect(document.querySelector('[data-test="signup-summary"]')?.textContent).toContain(
      'Lowfield Tumbling Club',
    )
    await type('f-password', 'quill-harbour-sorrel-58')
    await submit()
    expect(api.confirmClubSignup).toHaveBeenCalledWith({
      token: 'abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG',
      password: 'quill-harbour-sorrel-58',
    })
    expect(useSessionStore().role).toBe('director')
    expect(router.currentRoute.value.name).toBe('catalogue')
  })

  it('puts the server’s weak-password advice on the field', async () => {
    window.location.hash = '#token=abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG'
    vi.mocked(api.previewClubSignup).mockResolvedValue(preview)
    vi.mocked(api.confirmClubSignup).mockRejectedValue(
      new ApiError(400, 'weak_password', 'This password is too easy to guess.', [
        { path: 'password', message: 'This password is too easy to guess.' },
      ]),
    )
    mountWithProviders(ConfirmClubView, {}, { router: await signupRouter('/confirm-club') })
    await flushPromises()
    await type('f-password', 'password1')
    await submit()
    expect(fieldText()).toContain('This password is too easy to guess.')
  })

  it('says a spent link is spent, and offers to start again', async () => {
    window.location.hash = '#token=abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG'
    vi.mocked(api.previewClubSignup).mockRejectedValue(
      new ApiError(
        410,
        'signup_invalid',
        'This confirmation link has expired or was already used.',
      ),
    )
    mountWithProviders(ConfirmClubView, {}, { router: await signupRouter('/confirm-club') })
    await flushPromises()
    expect(document.querySelector('[role="alert"]')?.textContent).toContain('already used')
    expect(document.querySelector('a[href="/start-club"]')).not.toBeNull()
    expect(document.getElementById('f-password')).toBeNull()
  })

  it('says a link without its token is incomplete, asking the server nothing', async () => {
    mountWithProviders(ConfirmClubView, {}, { router: await signupRouter('/confirm-club') })
    await flushPromises()
    expect(document.querySelector('[role="alert"]')?.textContent).toContain('incomplete')
    expect(api.previewClubSignup).not.toHaveBeenCalled()
  })
})
