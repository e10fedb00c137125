import { createHash } from 'node:crypto'
import { createRequire } from 'node:module'
import { describe, expect, it } from 'vitest'
import { defaultAgeThresholds } from '../../shared/domain/age-categories.ts'
import { auditInputHash, canonicalJson } from '../../shared/domain/audit/hashing.ts'
import { defaultRequirementProfiles } from '../../shared/domain/audit/readiness.ts'
import {
  fnv1a32,
  murmur3Words,
  RecordPrinter,
  sortedRecordPrints,
} from '../../shared/domain/audit/record-prints.ts'
import { resolveAuditOptions } from '../../shared/domain/audit/run.ts'
import type { AuditInputs } from '../../shared/domain/audit/types.ts'
import { inputs, records } from '../support/audit-example.ts'

// An independent MurmurHash3 (x86, 32 bits) written for JavaScript strings, which hashes each
// character below 256 as one byte.
const murmurReference = createRequire(import.meta.url)('imurmurhash') as (
  key: string,
  seed: number,
) => { result(): number }
const wordBytes = (...words: number[]) =>
  words
    .map((w) => String.fromCharCode(w & 255, (w >>> 8) & 255, (w >>> 16) & 255, w >>> 24))
    .join('')

describe('the hashes behind the record fingerprints', () => {
  // FNV-1a 32-bit test vectors from the FNV reference (IETF draft-eastlake-fnv, its test suite):
  // from memory, and they agree with the offset basis 0x811c9dc5 for the empty text.
  it.each([
    ['', 0x811c9dc5],
    ['a', 0xe40c292c],
    ['foobar', 0xbf9cf968],
  ])('FNV-1a of %j is the published value', (text, expected) => {
    expect(fnv1a32(text)).toBe(expected)
  })

  // MurmurHash3 x86_32 test vectors, from memory, checked here against the reference package.
  it.each([
    ['', 0, 0],
    ['', 1, 0x514e28b7],
    ['\u0000\u0000\u0000\u0000', 0, 0x2362f9de],
    ['aaaa', 0x9747b28c, 0x5a97808a],
    ['Hello, world!', 0x9747b28c, 0x24884cba],
  ])('the reference MurmurHash3 of %j with seed %i is the published value', (key, seed, value) => {
    expect(murmurReference(key, seed).result()).toBe(value)
  })

  it('hashes three words as MurmurHash3 hashes their twelve little-endian bytes', () => {
    let state = 12345
    const next = () => (state = (Math.imul(state, 1103515245) + 12345) | 0)
    for (let i = 0; i < 200; i++) {
      const [a, b, c, seed] = [next(), next(), next(), next() >>> 0]
      expect(murmur3Words(a, b, c, seed)).toBe(murmurReference(wordBytes(a, b, c), seed).result())
    }
  })
})

describe('record fingerprints', () => {
  it('are whole numbers a double holds exactly, and differ over a club-sized set', () => {
    const printer = new RecordPrinter()
    const prints = new Set<number>()
    const id = (kind: string, n: number) =>
      `${kind}${n.toString(16).padStart(7, '0')}-0000-4000-8000-000000000000`
    for (let a = 0; a < 1000; a++)
      for (let e = 0; e < 100; e++) {
        const print = printer.print({ athleteId: id('a', a), elementId: id('e', e), stepIndex: 2 })
        expect(Number.isSafeInteger(print)).toBe(true)
        prints.add(print)
      }
    // 100,000 records with 53-bit prints: a shared one would come once in about 2 million sets.
    expect(prints.size).toBe(100_000)
  })

  it('tell apart a step, a swap of ids, and a record never started', () => {
    const printer = new RecordPrinter()
    const base = { athleteId: 'x', elementId: 'y', stepIndex: 0 }
    const variants = [
      base,
      { ...base, stepIndex: 1 },
      { ...base, stepIndex: null },
      { athleteId: 'y', elementId: 'x', stepIndex: 0 },
    ]
    expect(new Set(variants.map((r) => printer.print(r))).size).toBe(4)
  })

  it('come out the same bytes in any order and count a repeated record twice', () => {
    const forward = sortedRecordPrints(records)
    expect(sortedRecordPrints([...records].reverse())).toStrictEqual(forward)
    expect(forward.length).toBe(records.length * 8)
    expect(sortedRecordPrints([...records, records[0]!]).length).toBe(forward.length + 8)
  })
})

describe('auditInputHash by version', () => {
  const described = {
    ...inputs,
    paces: inputs.paces ?? {},
    profiles: defaultRequirementProfiles,
    ageThresholds: defaultAgeThresholds,
  }
  it('version 1 is the SHA-256 of the canonical JSON, as stored audits hold it', async () => {
    // FIPS 180-4 SHA-256 through Node's own implementation, over the text version 1 describes.
    const text = canonicalJson({ inputs: described, options: resolveAuditOptions({}) })
    const expected = createHash('sha256').update(text).digest('hex')
    expect(await auditInputHash(inputs, {}, 1)).toBe(expected)
  })

  it('version 1 gives, for the shared example, the hashes the code before version 2 stored', async () => {
    // Recorded on 2026-12-02 by running the first version's code (commit 7b5bdaa) over the shared
    // example: audits stored with these hashes must re-check as unchanged for good.
    expect(await auditInputHash(inputs, {}, 1)).toBe(
      'c2447220a8d91fe78c87240196b3bec046d2c6859822b768e4db7629ad0336f1',
    )
    expect(await auditInputHash(inputs, { gapThresholdSteps: 3 }, 1)).toBe(
      '067d7e6bc6c6a5bb07577948c2ecb8ff2d88242d85e035f47180c80dd75df1da',
    )
  })

  it('version 2 is the SHA-256 of the rest as canonical JSON, a newline, then the prints', async () => {
    const { records: list, ...rest } = described
    const text = canonicalJson({ inputs: rest, options: resolveAuditOptions({}) })
    const expected = createHash('sha256')
      .update(text)
      .update('\n')
      .update(sortedRecordPrints(list))
      .digest('hex')
    expect(await auditInputHash(inputs)).toBe(expected)
    expect(await auditInputHash(inputs, {}, 1)).not.toBe(expected)
  })

  it('version 2 sees every kind of change to the records', async () => {
    const hash = await auditInputHash(inputs)
    const changed = (list: AuditInputs['records']) => auditInputHash({ ...inputs, records: list })
    // Two records trading steps keep the same set of steps but not the same records.
    const first = records[0]!
    const second = records.find((r) => r.stepIndex !== first.stepIndex)!
    const traded = records.map((r) =>
      r === first
        ? { ...r, stepIndex: second!.stepIndex }
        : r === second
          ? { ...r, stepIndex: first!.stepIndex }
          : r,
    )
    expect(await changed(traded)).not.toBe(hash)
    expect(await changed(records.slice(1))).not.toBe(hash)
    expect(await changed([...records, records[0]!])).not.toBe(hash)
    expect(
      await changed(records.map((r, i) => (i === 0 ? { ...r, stepIndex: null } : r))),
    ).not.toBe(hash)
    expect(await changed([...records].reverse())).toBe(hash)
  })
})
