/** The video containers a clip may be in, told apart by their first bytes. */
export type ClipContainer = 'mp4' | 'mov' | 'webm'

export const clipContentTypes: Record<ClipContainer, string> = {
  mp4: 'video/mp4',
  mov: 'video/quicktime',
  webm: 'video/webm',
}

/** How many leading bytes `sniffClipContainer` needs. */
export const clipSniffBytes = 12

/**
 * The container of a file from its own first bytes, never from its name or declared type:
 * ISO base media (MP4, QuickTime) opens with a box whose type at offset 4 is `ftyp` (ISO/IEC
 * 14496-12 §4.3), QuickTime's brand being `qt  `; WebM is Matroska, whose EBML header starts
 * 1A 45 DF A3 (RFC 8794 §8.1). Anything else is null.
 */
export function sniffClipContainer(head: Uint8Array): ClipContainer | null {
  if (
    head.length >= 4 &&
    head[0] === 0x1a &&
    head[1] === 0x45 &&
    head[2] === 0xdf &&
    head[3] === 0xa3
  )
    return 'webm'
  if (head.length < 12) return null
  const ascii = (from: number, to: number) => String.fromCharCode(...head.subarray(from, to))
  if (ascii(4, 8) !== 'ftyp') return null
  return ascii(8, 12) === 'qt  ' ? 'mov' : 'mp4'
}

export type ByteRange = { start: number; end: number }

/**
 * The byte range a `Range` header asks of a file of `size` bytes (RFC 9110 §14.1.2): `null`
 * when there is no header or it is not a single bytes range (the whole file is sent), or
 * 'unsatisfiable' (416) when it starts past the end. The end is clamped to the last byte.
 */
export function parseByteRange(
  header: string | undefined,
  size: number,
): ByteRange | null | 'unsatisfiable' {
  if (!header) return null
  const match = /^bytes=(\d*)-(\d*)$/.exec(header.trim())
  if (!match || (match[1] === '' && match[2] === '')) return null
  if (size === 0) return 'unsatisfiable'
  if (match[1] === '') {
    const suffix = Number(match[2])
    if (suffix === 0) return 'unsatisfiable'
    return { start: Math.max(0, size - suffix), end: size - 1 }
  }
  const start = Number(match[1])
  const end = match[2] === '' ? size - 1 : Math.min(Number(match[2]), size - 1)
  if (start >= size) return 'unsatisfiable'
  if (end < start) return null
  return { start, end }
}
