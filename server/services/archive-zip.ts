import { createHash } from 'node:crypto'
import { Readable } from 'node:stream'
import { ZipArchive, type EntryData } from 'archiver'
import { eq } from 'drizzle-orm'
import {
  archiveFormat,
  archiveFormatVersion,
  type ArchiveManifest,
  type ArchivePhase,
} from '../../shared/schemas/archives.ts'
import type { Db } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { archiveFiles } from './archive-contents.ts'

export interface ArchiveProgress {
  phase: ArchivePhase
  done: number
  total: number
}

export interface BuiltArchive {
  bytes: Buffer
  sha256: string
  manifest: ArchiveManifest
  /** The parts its progress counted, all done. */
  total: number
}

/** Rows per page of the large tables: a few megabytes of rows at most in memory at once. */
export const defaultArchivePageSize = 5_000

const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex')

/**
 * Adds one entry and waits until the zip has taken all of it, so that entries are read one at
 * a time. A source that fails rejects here: archiver would otherwise wait for it forever.
 */
function appendEntry(zip: ZipArchive, source: Readable | Buffer, data: EntryData) {
  return new Promise<void>((resolve, reject) => {
    const cleanup = () => {
      zip.off('entry', onEntry)
      zip.off('error', onError)
      zip.off('warning', onError)
    }
    const onEntry = (entry: EntryData) => {
      if (entry.name !== data.name) return
      cleanup()
      resolve()
    }
    const onError = (err: Error) => {
      cleanup()
      reject(err)
    }
    zip.on('entry', onEntry)
    zip.on('error', onError)
    zip.on('warning', onError)
    if (source instanceof Readable) source.once('error', onError)
    zip.append(source, data)
  })
}

/**
 * Writes everything the club holds into one zip, in memory: each file streamed into the zip
 * chunk by chunk (the large tables page by page), hashed and counted on the way, then
 * `manifest.json` listing every file with its rows, bytes and SHA-256. All of it is read in one
 * read-only snapshot, so the files agree with each other even while the club goes on working.
 * `onProgress` hears of every chunk written.
 */
export async function buildClubArchive(
  db: Db,
  clubId: string,
  options: {
    pageSize?: number
    onProgress?: (progress: ArchiveProgress) => void
    createdAt?: Date
  } = {},
): Promise<BuiltArchive> {
  const pageSize = options.pageSize ?? defaultArchivePageSize
  const createdAt = options.createdAt ?? new Date()
  const report = options.onProgress ?? (() => undefined)
  return db.transaction(
    async (tx) => {
      const [club] = await tx.select().from(clubs).where(eq(clubs.id, clubId))
      if (!club) throw new Error(`No club ${clubId}.`)
      const files = await archiveFiles(tx, clubId, pageSize)
      // One part per chunk of every file, and one for the manifest.
      const total = files.reduce((n, f) => n + f.parts, 0) + 1
      let done = 0

      const zip = new ZipArchive({ zlib: { level: 6 } })
      const output: Buffer[] = []
      zip.on('data', (chunk: Buffer) => output.push(chunk))
      const ended = new Promise<void>((resolve, reject) => {
        zip.once('end', resolve)
        zip.on('error', reject)
      })
      // A failure is reported through `ended` too; this keeps it from going unhandled meanwhile.
      ended.catch(() => undefined)

      const manifest: ArchiveManifest = {
        format: archiveFormat,
        formatVersion: archiveFormatVersion,
        club: { id: club.id, name: club.name },
        createdAt: createdAt.toISOString(),
        files: [],
      }
      try {
        for (const file of files) {
          report({ phase: file.phase, done, total })
          const hash = createHash('sha256')
          let bytes = 0
          let rows = 0
          const source = async function* () {
            for await (const chunk of file.chunks()) {
              const data = Buffer.from(chunk.text, 'utf8')
              hash.update(data)
              bytes += data.length
              rows += chunk.rows
              yield data
              done = Math.min(done + 1, total - 1)
              report({ phase: file.phase, done, total })
            }
          }
          await appendEntry(zip, Readable.from(source()), { name: file.name, date: createdAt })
          manifest.files.push({ name: file.name, rows, bytes, sha256: hash.digest('hex') })
        }
        report({ phase: 'manifest', done, total })
        const manifestBytes = Buffer.from(JSON.stringify(manifest, null, 2), 'utf8')
        await appendEntry(zip, manifestBytes, { name: 'manifest.json', date: createdAt })
        await zip.finalize()
        await ended
      } catch (err) {
        zip.abort()
        throw err
      }
      report({ phase: 'manifest', done: total, total })
      const bytes = Buffer.concat(output)
      return { bytes, sha256: sha256(bytes), manifest, total }
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  )
}
