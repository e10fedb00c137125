import { afterEach, describe, expect, it, vi } from 'vitest'
import { auditInputHash, CanonicalList, canonicalJson } from '../../shared/domain/audit/hashing.ts'
import type { AuditInputs, AuditRecord } from '../../shared/domain/audit/types.ts'

// The input hash must not depend on how the records were put together: texts worked out while
// the records were read (CanonicalList) give the same canonical JSON as a plain array in any
// order. Expected texts are written out by hand from the definition (keys sorted, array items
// sorted by their text).

const record = (athleteId: string, elementId: string, stepIndex: number): AuditRecord => ({
  athleteId,
  elementId,
  stepIndex,
})

const a1 = '{"athleteId":"a","elementId":"e1","stepIndex":1}'
const a2 = '{"athleteId":"a","elementId":"e2","stepIndex":0}'
const b1 = '{"athleteId":"b","elementId":"e1","stepIndex":3}'

afterEach(() => {
  vi.restoreAllMocks()
})

describe('canonical text of a list whose item texts were worked out as it was built', () => {
  it('is the sorted text whether the items came in order or not', () => {
    const inOrder = new CanonicalList<AuditRecord>()
    for (const r of [record('a', 'e1', 1), record('a', 'e2', 0), record('b', 'e1', 3)]) {
      inOrder.push(r)
    }
    const shuffled = new CanonicalList<AuditRecord>()
    for (const r of [record('b', 'e1', 3), record('a', 'e1', 1), record('a', 'e2', 0)]) {
      shuffled.push(r)
    }
    expect(canonicalJson(inOrder.items)).toBe(`[${a1},${a2},${b1}]`)
    expect(canonicalJson(shuffled.items)).toBe(`[${a1},${a2},${b1}]`)
  })

  it('works the texts out again when the array was changed behind the list', () => {
    const list = new CanonicalList<AuditRecord>()
    list.push(record('b', 'e1', 3))
    list.items.push(record('a', 'e1', 1))
    expect(canonicalJson(list.items)).toBe(`[${a1},${b1}]`)
  })

  it('uses the texts worked out when the items were added', () => {
    // Items must not change once added (the audit's records never do); changing one behind the
    // list shows that its text was not worked out again.
    const list = new CanonicalList<AuditRecord>()
    const item = record('a', 'e1', 1)
    list.push(item)
    item.stepIndex = 5
    expect(canonicalJson(list.items)).toBe(`[${a1}]`)
  })

  it('does not sort again texts that are already in order, equal neighbours included', () => {
    // The point of the list (bench/audit.bench.ts): 100,000 records arrive in order, and
    // checking that is one pass where sorting is many.
    const list = new CanonicalList<AuditRecord>()
    for (const r of [record('a', 'e1', 1), record('a', 'e1', 1), record('b', 'e1', 3)]) {
      list.push(r)
    }
    const sort = vi.spyOn(Array.prototype, 'sort')
    expect(canonicalJson(list.items)).toBe(`[${a1},${a1},${b1}]`)
    expect(sort).not.toHaveBeenCalled()
    const shuffled = new CanonicalList<AuditRecord>()
    for (const r of [record('b', 'e1', 3), record('a', 'e1', 1)]) shuffled.push(r)
    expect(canonicalJson(shuffled.items)).toBe(`[${a1},${b1}]`)
    expect(sort).toHaveBeenCalledTimes(1)
  })

  it('gives the same input hash as a plain array of the same records in another order', async () => {
    const list = new CanonicalList<AuditRecord>()
    const records = [record('a', 'e1', 1), record('a', 'e2', 0), record('b', 'e1', 3)]
    for (const r of records) list.push(r)
    const inputs = (rs: readonly AuditRecord[]): AuditInputs => ({
      asOf: '2026-09-30',
      elements: [],
      athletes: [],
      records: rs,
    })
    const plain = await auditInputHash(inputs([...records].reverse()))
    expect(await auditInputHash(inputs(list.items))).toBe(plain)
    // …and a different record changes it.
    expect(await auditInputHash(inputs([...records.slice(1), record('a', 'e1', 2)]))).not.toBe(
      plain,
    )
  })
})
