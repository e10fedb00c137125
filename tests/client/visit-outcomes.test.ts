import { afterEach, describe, expect, it } from 'vitest'
import AuditVisitOutcomes from '@/components/audit/AuditVisitOutcomes.vue'
import { mountInProviders } from './catalogue-helpers'

afterEach(() => {
  document.body.innerHTML = ''
})

describe('AuditVisitOutcomes', () => {
  it('shows the counts with their shares, and each row with steps counted from 1', () => {
    mountInProviders(AuditVisitOutcomes, {
      // 3 of 4 = 75 %, 1 of 8 = 13 % (12.5 rounded half up), computed by hand.
      summary: { accepted: 4, acceptedMoved: 3, comparable: 8, comparableMoved: 1 },
      rows: [
        {
          recommendationId: 'r1',
          squadId: 's',
          athleteId: 'a',
          elementId: 'e',
          status: 'accepted',
          madeOn: '2026-05-10',
          suggestedStepIndex: 2,
          stepBefore: null,
          stepAtAudit: 0,
          moved: true,
        },
      ],
      athleteName: () => 'Ada Example',
      elementNames: { e: 'Front tuck' },
    })
    const text = document.body.textContent ?? ''
    expect(text).toContain('3 of 4')
    expect(text).toContain('75 %')
    expect(text).toContain('1 of 8')
    expect(text).toContain('13 %')
    expect(text).toContain('Ada Example')
    expect(text).toContain('Front tuck')
    expect(text).toContain('not started')
    expect(text).toContain('step 1')
    expect(text).toContain('step 3')
  })

  it('shows only the counts to the board', () => {
    mountInProviders(AuditVisitOutcomes, {
      summary: { accepted: 0, acceptedMoved: 0, comparable: 0, comparableMoved: 0 },
    })
    const text = document.body.textContent ?? ''
    expect(text).toContain('0 of 0')
    expect(document.querySelector('table')).toBeNull()
  })
})
