// Fingerprints of an audit's records for its input hash (version 2, see hashing.ts): a number per
// record instead of a text, so that putting 100,000 records into a set order is a sort of
// numbers rather than of strings.

import type { AuditRecord } from './types.ts'

const fnvOffsetBasis = 0x811c9dc5
const fnvPrime = 0x01000193

/** FNV-1a, 32 bits, over UTF-16 code units below 256 as bytes (ids and digits are ASCII). */
export function fnv1a32(text: string, hash = fnvOffsetBasis): number {
  let h = hash
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), fnvPrime)
  return h >>> 0
}

/** A second, unrelated 32-bit hash of the same text: multiply-xorshift steps, then a final mix. */
function mix32(text: string): number {
  let h = 0x9747b28c
  for (let i = 0; i < text.length; i++) {
    h = Math.imul(h ^ text.charCodeAt(i), 0x5bd1e995)
    h ^= h >>> 15
  }
  return finalMix(h)
}

/** MurmurHash3's final mix (fmix32): every input bit reaches every output bit. */
function finalMix(hash: number): number {
  let h = hash
  h ^= h >>> 16
  h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13
  h = Math.imul(h, 0xc2b2ae35)
  h ^= h >>> 16
  return h >>> 0
}

const rotl = (x: number, r: number) => (x << r) | (x >>> (32 - r))

/** MurmurHash3 (x86, 32 bits) of three 32-bit words, as its body and tail handle 12 bytes. */
export function murmur3Words(a: number, b: number, c: number, seed: number): number {
  let h = murmur3Step(seed, a)
  h = murmur3Step(h, b)
  h = murmur3Step(h, c)
  return finalMix(h ^ 12)
}

function murmur3Step(hash: number, word: number): number {
  let k = Math.imul(word, 0xcc9e2d51)
  k = rotl(k, 15)
  k = Math.imul(k, 0x1b873593)
  const h = rotl(hash ^ k, 13)
  return (Math.imul(h, 5) + 0xe6546b64) | 0
}

/**
 * Fingerprints records, hashing each id once however many records name it (a club has about a
 * thousand athletes and a few hundred elements for 100,000 records).
 */
export class RecordPrinter {
  private readonly ids = new Map<string, readonly [number, number]>()

  private idHashes(id: string): readonly [number, number] {
    let known = this.ids.get(id)
    if (!known) {
      known = [fnv1a32(id), mix32(id)]
      this.ids.set(id, known)
    }
    return known
  }

  /**
   * A 53-bit fingerprint of one record (an integer a double holds exactly): two MurmurHash3
   * words over the two hashes of its ids and its step (-1 when never started), 32 bits of one
   * and 21 of the other. Two different records share one by chance about once in 2⁵³; the hash
   * it feeds detects changed inputs and is no defence against someone crafting records to
   * collide (who could change the audit's inputs openly anyway).
   */
  print(record: AuditRecord): number {
    const [a1, a2] = this.idHashes(record.athleteId)
    const [e1, e2] = this.idHashes(record.elementId)
    const step = record.stepIndex ?? -1
    const high = murmur3Words(a1, e1, step, 0x2f0d9b1e)
    const low = murmur3Words(a2, e2, step, 0x6a09e667)
    return high * 2 ** 21 + (low >>> 11)
  }
}

/**
 * The records' fingerprints in ascending order, as little-endian 64-bit floats: the same bytes
 * for the same records in any order (a record listed twice counts twice).
 */
export function sortedRecordPrints(records: readonly AuditRecord[]): Uint8Array {
  const printer = new RecordPrinter()
  const prints = new Float64Array(records.length)
  for (let i = 0; i < records.length; i++) prints[i] = printer.print(records[i]!)
  prints.sort()
  const bytes = new Uint8Array(prints.length * 8)
  const view = new DataView(bytes.buffer)
  for (let i = 0; i < prints.length; i++) view.setFloat64(i * 8, prints[i]!, true)
  return bytes
}
