import { inflateSync, constants as zlib } from 'node:zlib'

// Readers for the files the product hands out (PDF, PNG), enough to check what a person would
// see in them without a PDF or image library: both the server's PDF (pdfkit) and Chromium's
// printed PDF compress their content and write text as glyph ids, so the text is recovered
// through each font's ToUnicode map.

interface PdfObject {
  dict: string
  stream: Buffer | null
}

/** The uncompressed stream of an object, or its raw bytes when it has no filter we know. */
function streamOf(dict: string, raw: Buffer): Buffer {
  if (!/\/Filter\s*\/FlateDecode/.test(dict)) return raw
  return inflateSync(raw, { finishFlush: zlib.Z_SYNC_FLUSH })
}

function parseObjects(pdf: Buffer): Map<number, PdfObject> {
  const text = pdf.toString('latin1')
  const objects = new Map<number, PdfObject>()
  const header = /(\d+)\s+(\d+)\s+obj\b/g
  let match: RegExpExecArray | null
  while ((match = header.exec(text))) {
    const start = match.index + match[0].length
    // The dictionary ends where the stream or the object does, whichever comes first; the end
    // of an object with a stream is looked for after the stream, whose bytes may hold anything.
    const next = /\bstream\r?\n|\bendobj\b/g
    next.lastIndex = start
    const found = next.exec(text)
    if (!found) break
    const dict = text.slice(start, found.index)
    let stream: Buffer | null = null
    let end = found.index
    if (found[0] !== 'endobj') {
      const dataStart = found.index + found[0].length
      const length = dict.match(/\/Length\s+(\d+)(?!\s+\d+\s+R)/)
      const dataEnd = length ? dataStart + Number(length[1]) : text.indexOf('endstream', dataStart)
      stream = streamOf(dict, pdf.subarray(dataStart, dataEnd))
      end = text.indexOf('endobj', dataEnd)
      if (end < 0) break
    }
    objects.set(Number(match[1]), { dict, stream })
    header.lastIndex = end
  }
  return objects
}

const refs = (s: string) => [...s.matchAll(/(\d+)\s+\d+\s+R/g)].map((m) => Number(m[1]))

/** Glyph code → text, from a ToUnicode CMap's bfchar and bfrange sections. */
function parseCMap(cmap: string): Map<number, string> {
  const map = new Map<number, string>()
  // A destination may hold several characters (a ligature), written with spaces between them.
  const utf16 = (spaced: string) => {
    const hex = spaced.replace(/\s+/g, '')
    const units: number[] = []
    for (let i = 0; i + 4 <= hex.length; i += 4) units.push(parseInt(hex.slice(i, i + 4), 16))
    return String.fromCharCode(...units)
  }
  for (const section of cmap.matchAll(/beginbfchar([\s\S]*?)endbfchar/g)) {
    for (const m of section[1]!.matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F\s]+)>/g)) {
      map.set(parseInt(m[1]!, 16), utf16(m[2]!))
    }
  }
  for (const section of cmap.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
    const entries = section[1]!.matchAll(
      /<([0-9a-fA-F]+)>\s*<([0-9a-fA-F]+)>\s*(?:<([0-9a-fA-F\s]+)>|\[([^\]]*)\])/g,
    )
    for (const m of entries) {
      const lo = parseInt(m[1]!, 16)
      const hi = parseInt(m[2]!, 16)
      if (m[3] !== undefined) {
        const first = utf16(m[3])
        for (let code = lo; code <= hi; code++) {
          const last = first.charCodeAt(first.length - 1) + (code - lo)
          map.set(code, first.slice(0, -1) + String.fromCharCode(last))
        }
      } else {
        const list = [...m[4]!.matchAll(/<([0-9a-fA-F\s]+)>/g)].map((x) => utf16(x[1]!))
        list.forEach((s, i) => map.set(lo + i, s))
      }
    }
  }
  return map
}

interface Font {
  bytesPerCode: number
  toUnicode: Map<number, string> | null
}

export interface PdfContents {
  pageCount: number
  /** The text of each page, a line per text object or line move. */
  pages: string[]
  /** The whole text with runs of white space collapsed, for searching. */
  text: string
}

/** Page count and text of a PDF whose fonts carry ToUnicode maps (pdfkit's and Chromium's do). */
export function readPdf(pdf: Buffer): PdfContents {
  const objects = parseObjects(pdf)
  const get = (n: number) => objects.get(n)
  const fonts = new Map<number, Font>()
  const fontOf = (n: number): Font => {
    let font = fonts.get(n)
    if (!font) {
      const dict = get(n)?.dict ?? ''
      const unicodeRef = dict.match(/\/ToUnicode\s+(\d+)\s+\d+\s+R/)
      const cmap = unicodeRef ? get(Number(unicodeRef[1]))?.stream : null
      font = {
        bytesPerCode: /\/Subtype\s*\/Type0/.test(dict) ? 2 : 1,
        toUnicode: cmap ? parseCMap(cmap.toString('latin1')) : null,
      }
      fonts.set(n, font)
    }
    return font
  }
  const decode = (font: Font | undefined, bytes: number[]) => {
    if (!font) return ''
    let out = ''
    for (let i = 0; i + font.bytesPerCode <= bytes.length; i += font.bytesPerCode) {
      const code = font.bytesPerCode === 2 ? (bytes[i]! << 8) | bytes[i + 1]! : bytes[i]!
      out += font.toUnicode?.get(code) ?? (font.bytesPerCode === 1 ? String.fromCharCode(code) : '')
    }
    return out
  }

  // Pages in document order: the Pages tree from the catalogue down.
  const pageIds: number[] = []
  const walk = (n: number) => {
    const dict = get(n)?.dict ?? ''
    if (/\/Type\s*\/Pages\b/.test(dict)) {
      const kids = dict.match(/\/Kids\s*\[([^\]]*)\]/)
      for (const kid of refs(kids?.[1] ?? '')) walk(kid)
    } else if (/\/Type\s*\/Page\b/.test(dict)) pageIds.push(n)
  }
  const catalogue = [...objects.values()].find((o) => /\/Type\s*\/Catalog\b/.test(o.dict))
  const root = catalogue?.dict.match(/\/Pages\s+(\d+)\s+\d+\s+R/)
  if (root) walk(Number(root[1]))

  const pages = pageIds.map((id) => {
    const page = get(id)!.dict
    const resourcesRef = page.match(/\/Resources\s+(\d+)\s+\d+\s+R/)
    const resources = resourcesRef ? (get(Number(resourcesRef[1]))?.dict ?? '') : page
    const fontDictRef = resources.match(/\/Font\s+(\d+)\s+\d+\s+R/)
    const fontDict = fontDictRef
      ? (get(Number(fontDictRef[1]))?.dict ?? '')
      : (resources.match(/\/Font\s*<<([^>]*)>>/)?.[1] ?? '')
    const fontsByName = new Map<string, Font>()
    for (const m of fontDict.matchAll(/\/([^\s/<>[\]()]+)\s+(\d+)\s+\d+\s+R/g)) {
      fontsByName.set(m[1]!, fontOf(Number(m[2])))
    }
    const contents = page.match(/\/Contents\s*(\[[^\]]*\]|\d+\s+\d+\s+R)/)?.[1] ?? ''
    const content = refs(contents)
      .map((n) => get(n)?.stream?.toString('latin1') ?? '')
      .join('\n')
    return pageText(content, fontsByName, decode)
  })
  return { pageCount: pageIds.length, pages, text: pages.join('\n').replace(/\s+/g, ' ') }
}

function literalBytes(literal: string): number[] {
  const bytes: number[] = []
  const escapes: Record<string, number> = { n: 10, r: 13, t: 9, b: 8, f: 12 }
  for (let i = 1; i < literal.length - 1; i++) {
    const c = literal[i]!
    if (c !== '\\') {
      bytes.push(c.charCodeAt(0))
      continue
    }
    const next = literal[++i]!
    const octal = literal.slice(i).match(/^[0-7]{1,3}/)
    if (octal) {
      bytes.push(parseInt(octal[0], 8))
      i += octal[0].length - 1
    } else bytes.push(escapes[next] ?? next.charCodeAt(0))
  }
  return bytes
}

function pageText(
  content: string,
  fonts: Map<string, Font>,
  decode: (font: Font | undefined, bytes: number[]) => string,
) {
  // A text object, a new matrix or a move down starts a new line; Chromium moves along a line
  // glyph by glyph with horizontal Td, which stays on it.
  const tokens =
    /\/([^\s/<>[\]()]+)\s+[-\d.]+\s+Tf|<([0-9a-fA-F\s]*)>|(\((?:\\[\s\S]|[^\\)])*\))|[-\d.]+\s+([-\d.]+)\s+T[dD]\b|\b(T\*|Tm|ET|')(?![\w*])/g
  let font: Font | undefined
  let out = ''
  for (const m of content.matchAll(tokens)) {
    if (m[1] !== undefined) font = fonts.get(m[1])
    else if (m[2] !== undefined) {
      const hex = m[2].replace(/\s+/g, '')
      const bytes: number[] = []
      for (let i = 0; i + 2 <= hex.length; i += 2) bytes.push(parseInt(hex.slice(i, i + 2), 16))
      out += decode(font, bytes)
    } else if (m[3] !== undefined) out += decode(font, literalBytes(m[3]))
    else if (m[4] === undefined || Number(m[4]) !== 0) out += '\n'
  }
  return out
}

/** The width and height in a PNG's IHDR chunk, after checking the signature. */
export function pngSize(png: Buffer): { width: number; height: number } {
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])
  if (!png.subarray(0, 8).equals(signature)) throw new Error('not a PNG: wrong signature')
  if (png.subarray(12, 16).toString('latin1') !== 'IHDR') throw new Error('PNG without IHDR first')
  return { width: png.readUInt32BE(16), height: png.readUInt32BE(20) }
}
