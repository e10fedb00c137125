import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { AuditJob } from '@shared/schemas/audits'
import * as api from '@/api/audits'
import { ApiError } from '@/api/http'
import AuditRunForm from '@/components/audit/AuditRunForm.vue'
import {
  describeChange,
  endedQuarters,
  type FigureAim,
  type FigureKind,
} from '@/components/audit/auditFormat'
import { auditId, clubId, mountInProviders, wait } from './audit-helpers'

vi.mock('@/api/audits', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/audits')>()),
  startAudit: vi.fn(),
  getAuditJob: vi.fn(),
  listAudits: vi.fn(),
}))

const job = (partial: Partial<AuditJob>): AuditJob => ({
  id: '88888888-8888-4888-8888-888888888801',
  status: 'running',
  phase: 'queued',
  done: 0,
  total: 1,
  auditId: null,
  error: null,
  ...partial,
})

const byTest = (name: string) => document.querySelector<HTMLElement>(`[data-test="${name}"]`)

beforeEach(() => {
  vi.mocked(api.startAudit).mockReset()
  vi.mocked(api.getAuditJob).mockReset()
  vi.mocked(api.listAudits).mockReset().mockResolvedValue([])
})
afterEach(() => {
  document.body.innerHTML = ''
})

describe('AuditRunForm', () => {
  it('polls the job, shows its phase, and opens the report when it is done', async () => {
    vi.mocked(api.startAudit).mockResolvedValue(job({}))
    let release: () => void = () => undefined
    const held = new Promise<void>((resolve) => (release = resolve))
    vi.mocked(api.getAuditJob)
      .mockResolvedValueOnce(job({ phase: 'athletes', done: 3, total: 10 }))
      .mockImplementationOnce(async () => {
        await held
        return job({ status: 'done', phase: 'done', done: 1, total: 1, auditId })
      })
    const { wrapper, router } = mountInProviders(AuditRunForm, { clubId, pollIntervalMs: 1 })
    await router.isReady()

    await wrapper.find('form').trigger('submit')
    await flushPromises()
    await wait(10)
    await flushPromises()
    expect(byTest('run-phase')!.textContent).toContain('Balancing each athlete · 3 of 10')
    expect(document.querySelector('.n-progress')).not.toBeNull()

    release()
    await flushPromises()
    await wait(10)
    await flushPromises()
    expect(api.startAudit).toHaveBeenCalledWith(clubId, { squadId: null })
    expect(api.getAuditJob).toHaveBeenCalledTimes(2)
    expect(router.currentRoute.value.name).toBe('audit')
    expect(router.currentRoute.value.params.id).toBe(auditId)
  })

  it('shows the error of a failed run and stays on the form', async () => {
    vi.mocked(api.startAudit).mockResolvedValue(job({}))
    vi.mocked(api.getAuditJob).mockResolvedValue(
      job({ status: 'failed', error: 'The database went away.' }),
    )
    const { wrapper, router } = mountInProviders(AuditRunForm, { clubId, pollIntervalMs: 1 })
    await router.isReady()
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    await wait(10)
    await flushPromises()
    expect(byTest('run-failure')!.textContent).toContain('The database went away.')
    expect(router.currentRoute.value.name).toBe('home')
  })

  it('puts the server’s refusal of a future quarter on the quarter field', async () => {
    vi.mocked(api.startAudit).mockRejectedValue(
      new ApiError(400, 'invalid_input', 'An audit cannot describe a day still to come.', [
        { path: 'quarter', message: 'Choose a day up to today.' },
      ]),
    )
    const { wrapper } = mountInProviders(AuditRunForm, { clubId, pollIntervalMs: 1 })
    await wrapper.find('input[type="radio"][value="quarter"]').setValue(true)
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    const quarter = endedQuarters(new Date().toISOString().slice(0, 10))[0]!.quarter
    expect(api.startAudit).toHaveBeenCalledWith(clubId, { squadId: null, quarter })
    expect(document.body.textContent).toContain('Choose a day up to today.')
  })
})

describe('endedQuarters', () => {
  it('offers the quarters that have ended, newest first, across a year boundary', () => {
    expect(endedQuarters('2025-02-10', 3)).toEqual([
      { quarter: '2024-Q4', endsOn: '2024-12-31' },
      { quarter: '2024-Q3', endsOn: '2024-09-30' },
      { quarter: '2024-Q2', endsOn: '2024-06-30' },
    ])
    expect(endedQuarters('2025-03-31', 1)).toEqual([{ quarter: '2025-Q1', endsOn: '2025-03-31' }])
  })
})

describe('describeChange', () => {
  it.each<[FigureKind, FigureAim, number, number, string]>([
    ['percent', 'lower', 0.3, 0.325, 'up 2.5 pts since the previous audit (worse)'],
    ['percent', 'lower', 0.3, 0.30001, 'unchanged since the previous audit'],
    ['ratio', 'balanced', 1.2, 1.1, 'down 0.10 since the previous audit (better)'],
    ['ratio', 'balanced', 0.9, 1.2, 'up 0.30 since the previous audit (worse)'],
    ['count', 'lower', 5, 3, 'down 2 since the previous audit (better)'],
  ])('%s aiming %s, %d → %d: %s', (kind, aim, previous, current, words) => {
    const change = describeChange(kind, aim, { previous, current, change: current - previous })
    expect(change.words).toBe(words)
  })

  it('calls a change that rounds to nothing unchanged, not better or worse', () => {
    // 0.001 pts shows as "+0.0 pts": the tile must not read "±0 worse"
    const change = describeChange('percent', 'lower', {
      previous: 0.3,
      current: 0.30001,
      change: 0.00001,
    })
    expect(change).toMatchObject({ arrow: '=', signed: '±0', verdict: 'same' })
  })
})
