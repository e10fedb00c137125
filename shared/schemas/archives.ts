import { z } from 'zod'
import { jobProgressSchema } from './jobs.ts'

/** What a club archive's build is doing, in the order it does it. */
export const archivePhases = [
  'queued',
  'club',
  'people',
  'squads',
  'athletes',
  'catalogue',
  'progress',
  'settings',
  'audits',
  'manifest',
  'done',
] as const
export type ArchivePhase = (typeof archivePhases)[number]

/**
 * POST /archives and GET /archives/:id: an archive of the club and how far its build has got.
 * `expired` once its 24 hours are over (the download then answers 410).
 */
export const clubArchiveJobSchema = jobProgressSchema.extend({
  /** SHA-256 of the zip (hex), once built. */
  sha256: z.string().nullable(),
})
export type ClubArchiveJob = z.infer<typeof clubArchiveJobSchema>

export const archiveFormat = 'twofold-club-archive'
export const archiveFormatVersion = 1

/** One file of the archive as its manifest lists it. */
export const archiveManifestFileSchema = z.object({
  name: z.string(),
  /** Data rows: lines after the header of a CSV, items of a JSON list, 1 for a JSON object. */
  rows: z.number().int().nonnegative(),
  bytes: z.number().int().nonnegative(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
})

/** `manifest.json`, the last file of every club archive. */
export const archiveManifestSchema = z.object({
  format: z.literal(archiveFormat),
  formatVersion: z.literal(archiveFormatVersion),
  club: z.object({ id: z.uuid(), name: z.string() }),
  createdAt: z.string(),
  files: z.array(archiveManifestFileSchema),
})
export type ArchiveManifest = z.infer<typeof archiveManifestSchema>
