import { crc32, inflateRawSync } from 'node:zlib'

/**
 * Reads a zip file whole: every entry's name and bytes, in the order of its central directory.
 * Enough of the format for the archives Twofold writes (stored or deflated entries, no zip64,
 * no encryption); each entry's CRC-32 is checked against its bytes.
 */
export function readZip(zip: Buffer): Map<string, Buffer> {
  const endSignature = 0x06054b50
  let end = zip.length - 22
  while (end >= 0 && zip.readUInt32LE(end) !== endSignature) end--
  if (end < 0) throw new Error('not a zip: no end of central directory')
  const count = zip.readUInt16LE(end + 10)
  let at = zip.readUInt32LE(end + 16)
  const entries = new Map<string, Buffer>()
  for (let i = 0; i < count; i++) {
    if (zip.readUInt32LE(at) !== 0x02014b50) throw new Error(`bad central directory entry ${i}`)
    const method = zip.readUInt16LE(at + 10)
    const crc = zip.readUInt32LE(at + 16)
    const compressedSize = zip.readUInt32LE(at + 20)
    const size = zip.readUInt32LE(at + 24)
    const nameLength = zip.readUInt16LE(at + 28)
    const extraLength = zip.readUInt16LE(at + 30)
    const commentLength = zip.readUInt16LE(at + 32)
    const localOffset = zip.readUInt32LE(at + 42)
    const name = zip.toString('utf8', at + 46, at + 46 + nameLength)
    at += 46 + nameLength + extraLength + commentLength

    if (zip.readUInt32LE(localOffset) !== 0x04034b50) throw new Error(`bad local header: ${name}`)
    const dataStart =
      localOffset + 30 + zip.readUInt16LE(localOffset + 26) + zip.readUInt16LE(localOffset + 28)
    const raw = zip.subarray(dataStart, dataStart + compressedSize)
    const data = method === 8 ? inflateRawSync(raw) : method === 0 ? raw : null
    if (!data) throw new Error(`${name}: compression method ${method} not supported`)
    if (data.length !== size) throw new Error(`${name}: ${data.length} bytes, expected ${size}`)
    if (crc32(data) !== crc) throw new Error(`${name}: CRC-32 does not match`)
    entries.set(name, Buffer.from(data))
  }
  return entries
}
