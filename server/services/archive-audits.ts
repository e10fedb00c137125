import { and, asc, eq } from 'drizzle-orm'
import type { DbOrTx } from '../db/client.ts'
import { audits } from '../db/schema-audits.ts'
import { csvFile, iso, jsonFile, type ArchiveFile } from './archive-files.ts'
import { unpackAuditResult } from './audit-storage.ts'

// The audits' part of the club's archive (see archive-contents.ts).

/** The audits' summary figures in one file, then each stored result whole, one at a time. */
export function auditFiles(
  db: DbOrTx,
  clubId: string,
  list: { id: string; asOf: string }[],
): ArchiveFile[] {
  const ofAudit = (id: string) => and(eq(audits.clubId, clubId), eq(audits.id, id))
  const summary = csvFile(
    'audits.csv',
    'audits',
    [
      'id',
      'squadId',
      'asOf',
      'inputHash',
      'hashVersion',
      'createdAt',
      'createdBy',
      'publishedAt',
      'publishedBy',
      'athleteCount',
      'clubFrontLag',
      'clubBackLag',
      'balanceRatio',
      'catalogueGaps',
      'gapCount',
      'athletesWithGaps',
      'readinessAlerts',
      'file',
    ],
    async () => {
      const rows = await db
        .select({
          id: audits.id,
          squadId: audits.squadId,
          asOf: audits.asOf,
          inputHash: audits.inputHash,
          hashVersion: audits.hashVersion,
          createdAt: audits.createdAt,
          createdBy: audits.createdBy,
          publishedAt: audits.publishedAt,
          publishedBy: audits.publishedBy,
          figures: audits.figures,
        })
        .from(audits)
        .where(eq(audits.clubId, clubId))
        .orderBy(asc(audits.asOf), asc(audits.id))
      return rows.map(({ figures, ...a }) => {
        const { squadFrontLags: _squads, ...headline } = figures.headline
        return {
          ...a,
          ...headline,
          createdAt: iso(a.createdAt),
          publishedAt: iso(a.publishedAt),
          file: auditFileName(a),
        }
      })
    },
  )
  const results = list.map((a): ArchiveFile =>
    jsonFile(
      auditFileName(a),
      'audits',
      async () => {
        const [row] = await db.select().from(audits).where(ofAudit(a.id))
        const { clubId: _club, result, figures: _figures, ...meta } = row!
        return {
          ...meta,
          createdAt: iso(meta.createdAt),
          publishedAt: iso(meta.publishedAt),
          result: unpackAuditResult(result),
        }
      },
      { compact: true },
    ),
  )
  return [summary, ...results]
}

const auditFileName = (a: { id: string; asOf: string }) => `audits/${a.asOf}-${a.id}.json`
