import { afterEach, describe, expect, it, vi } from 'vitest'
import { ApiError, request, setUnauthorizedListener } from '@/api/http'

function answer(status: number, body: unknown) {
  return vi.fn(
    async () =>
      new Response(JSON.stringify(body), {
        status,
        headers: { 'Content-Type': 'application/json' },
      }),
  )
}

afterEach(() => {
  vi.unstubAllGlobals()
  setUnauthorizedListener(undefined)
})

describe('request()', () => {
  it('calls /api with the query and resolves with the JSON body', async () => {
    const fetchMock = answer(200, { ok: true })
    vi.stubGlobal('fetch', fetchMock)
    await expect(
      request('/things', { query: { q: 'tuck', empty: '', none: undefined } }),
    ).resolves.toEqual({ ok: true })
    expect(fetchMock).toHaveBeenCalledWith(
      '/api/things?q=tuck',
      expect.objectContaining({ method: 'GET' }),
    )
  })

  it('throws an ApiError carrying the code, message and field issues', async () => {
    vi.stubGlobal(
      'fetch',
      answer(400, {
        error: {
          code: 'invalid_input',
          message: 'Some fields are not valid.',
          issues: [{ path: 'birthYear', message: 'Too early.' }],
        },
      }),
    )
    const err = await request('/athletes', { method: 'POST', body: {} }).catch((e: unknown) => e)
    expect(err).toBeInstanceOf(ApiError)
    expect((err as ApiError).status).toBe(400)
    expect((err as ApiError).code).toBe('invalid_input')
    expect((err as ApiError).issueFor('birthYear')).toBe('Too early.')
  })

  it('tells the session listener about a 401', async () => {
    vi.stubGlobal('fetch', answer(401, { error: { code: 'unauthenticated', message: 'Sign in.' } }))
    const listener = vi.fn()
    setUnauthorizedListener(listener)
    await expect(request('/me')).rejects.toBeInstanceOf(ApiError)
    expect(listener).toHaveBeenCalledOnce()
  })

  it('turns a network failure into a readable ApiError', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    )
    await expect(request('/health')).rejects.toMatchObject({ code: 'network', status: 0 })
  })
})
