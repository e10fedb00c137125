import { describe, expect, it } from 'vitest'
import { parseByteRange, sniffClipContainer } from '../../shared/domain/clips.ts'

const bytes = (...parts: (number[] | string)[]) =>
  new Uint8Array(
    parts.flatMap((p) => (typeof p === 'string' ? [...p].map((c) => c.charCodeAt(0)) : p)),
  )

describe('sniffClipContainer', () => {
  it.each([
    // ISO/IEC 14496-12 §4.3: the file type box, size then 'ftyp' then the major brand.
    ['MP4 (brand isom)', bytes([0, 0, 0, 0x20], 'ftypisom'), 'mp4'],
    ['MP4 (brand mp42)', bytes([0, 0, 0, 0x18], 'ftypmp42'), 'mp4'],
    // QuickTime File Format: major brand 'qt  ' (Apple, QuickTime File Format Specification).
    ['QuickTime', bytes([0, 0, 0, 0x14], 'ftypqt  '), 'mov'],
    // RFC 8794 §8.1: the EBML element ID 0x1A45DFA3 opens every Matroska/WebM file.
    ['WebM', bytes([0x1a, 0x45, 0xdf, 0xa3, 0x9f, 0x42, 0x86, 0x81]), 'webm'],
    // PNG signature (RFC 2083 §3.1), JPEG SOI (FF D8 FF) and plain text are refused.
    ['PNG', bytes([0x89], 'PNG', [0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0]), null],
    ['JPEG', bytes([0xff, 0xd8, 0xff, 0xe0, 0, 0x10], 'JFIF', [0, 1]), null],
    ['text', bytes('hello world!'), null],
    ['too short for ftyp', bytes([0, 0, 0, 0x20], 'ftyp'), null],
  ])('%s → %s', (_name, head, expected) => {
    expect(sniffClipContainer(head)).toBe(expected)
  })
})

describe('parseByteRange', () => {
  // RFC 9110 §14.1.2 examples, on a file of 10,000 bytes.
  it.each([
    [undefined, null],
    ['bytes=0-499', { start: 0, end: 499 }],
    ['bytes=500-999', { start: 500, end: 999 }],
    ['bytes=-500', { start: 9500, end: 9999 }],
    ['bytes=9500-', { start: 9500, end: 9999 }],
    // An end past the file is clamped to its last byte (§14.1.2: "less than the last-pos").
    ['bytes=9000-20000', { start: 9000, end: 9999 }],
    // A first byte past the end cannot be satisfied (§15.5.17, 416).
    ['bytes=10000-', 'unsatisfiable'],
    ['bytes=-0', 'unsatisfiable'],
    // Not a single bytes range: the whole file is sent (§14.2, a server MAY ignore Range).
    ['bytes=0-1,5-6', null],
    ['items=0-1', null],
    ['bytes=500-100', null],
  ] as const)('%s', (header, expected) => {
    expect(parseByteRange(header, 10_000)).toEqual(expected)
  })
})
