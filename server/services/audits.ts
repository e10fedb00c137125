import { and, asc, desc, eq, getTableColumns, inArray, isNull } from 'drizzle-orm'
import { todayIso } from '../../shared/domain/access.ts'
import {
  baselineAudit,
  compareAudits,
  type AuditComparison,
  isRerun,
  onePerDate,
} from '../../shared/domain/audit/comparison.ts'
import {
  auditHashVersion,
  auditInputHash,
  isAuditHashVersion,
} from '../../shared/domain/audit/hashing.ts'
import { runAudit } from '../../shared/domain/audit/run.ts'
import {
  auditFigures,
  type AuditProgress,
  type AuditResult,
} from '../../shared/domain/audit/types.ts'
import { athleteFullName, erasedAthleteLabel } from '../../shared/domain/erasure.ts'
import { quarterEnd } from '../../shared/domain/quarters.ts'
import type {
  AuditReport,
  AuditRun,
  AuditSummary,
  BoardSummary,
} from '../../shared/schemas/audits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import { packAuditResult, unpackAuditResult } from './audit-storage.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { athletes, squads } from '../db/schema-athletes.ts'
import { audits } from '../db/schema-audits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { gatherSnapshot } from './audit-inputs.ts'
import { assertCanReadSquad, readableSquadIds } from './scope.ts'
import { gatherVisitOutcomes, outcomesForReport } from './visit-outcomes.ts'

/** The as-of date of a run: the given date, the end of the quarter, or today. */
export function runDate(run: AuditRun): string {
  const date = run.asOf ?? (run.quarter ? quarterEnd(run.quarter) : todayIso())
  if (date > todayIso()) {
    throw new AppError(400, 'invalid_input', 'An audit cannot describe a day still to come.', [
      { path: run.quarter ? 'quarter' : 'asOf', message: 'Choose a day up to today.' },
    ])
  }
  return date
}

/**
 * Checks a run before any work starts: a date up to today and, for a squad's audit, a squad of
 * this club the person may read (another club's or an unknown id answers 404). Returns the as-of
 * date.
 */
export async function checkRun(db: DbOrTx, access: ClubAccess, run: AuditRun): Promise<string> {
  const asOf = runDate(run)
  if (run.squadId) await assertCanReadSquad(db, access, run.squadId)
  return asOf
}

export type ProgressListener = (progress: { phase: string; done: number; total: number }) => void

/**
 * What `computeAudit` produces: the row to store for the run. A stored row is never changed
 * afterwards, but for the id of an athlete erased for good (see erasure.ts).
 */
export type ComputedAudit = typeof audits.$inferInsert

/** Reads the inputs of a run and computes its result: the audit row to store, not yet stored. */
export async function computeAudit(
  db: DbOrTx,
  access: ClubAccess,
  run: AuditRun,
  onProgress: ProgressListener = () => {},
): Promise<ComputedAudit> {
  const asOf = await checkRun(db, access, run)
  onProgress({ phase: 'reading', done: 0, total: 1 })
  const inputs = await gatherSnapshot(db, access.clubId, run.squadId, asOf)
  onProgress({ phase: 'reading', done: 1, total: 1 })
  // The hash's text is built first; its digest (Web Crypto, on a thread of Node's pool) then runs
  // while the audit computes.
  const hashing = auditInputHash(inputs)
  hashing.catch(() => undefined) // awaited below; not an unhandled rejection should the audit throw
  const result = runAudit(inputs, {}, (p: AuditProgress) => onProgress(p))
  onProgress({ phase: 'hashing', done: 0, total: 1 })
  const inputHash = await hashing
  const visitOutcomes = await gatherVisitOutcomes(db, access.clubId, run.squadId, asOf)
  return {
    clubId: access.clubId,
    squadId: run.squadId,
    asOf,
    inputHash,
    hashVersion: auditHashVersion,
    result: packAuditResult(result),
    figures: auditFigures(result),
    visitOutcomes,
    createdBy: access.userId,
  }
}

/** Computes and stores an audit at once (the demo's audits; tests). */
export async function runAndStore(
  db: DbOrTx,
  access: ClubAccess,
  run: AuditRun,
  onProgress: ProgressListener = () => {},
) {
  const values = await computeAudit(db, access, run, onProgress)
  const [row] = await db.insert(audits).values(values).returning({ id: audits.id })
  onProgress({ phase: 'done', done: 1, total: 1 })
  return row!.id
}

async function squadNames(db: DbOrTx, clubId: string) {
  const rows = await db
    .select({ id: squads.id, name: squads.name })
    .from(squads)
    .where(eq(squads.clubId, clubId))
  return Object.fromEntries(rows.map((r) => [r.id, r.name]))
}

// Every column but the full result, which can run to megabytes: lists, trends, the board and
// the checks before publishing read only these.
const { result: _result, ...summaryColumns } = getTableColumns(audits)
type SummaryRow = Omit<typeof audits.$inferSelect, 'result'>

/** A stored audit as the choice of a baseline and the re-run label see it. */
const listing = (row: SummaryRow) => ({
  row,
  asOf: row.asOf,
  createdAt: row.createdAt.getTime(),
  published: row.publishedAt !== null,
})

function summary(
  row: SummaryRow,
  names: Record<string, string>,
  scope: readonly SummaryRow[],
): AuditSummary {
  const { headline } = row.figures
  return {
    id: row.id,
    squadId: row.squadId,
    scopeName: row.squadId ? (names[row.squadId] ?? 'Squad') : 'Whole club',
    asOf: row.asOf,
    inputHash: row.inputHash,
    createdAt: row.createdAt.toISOString(),
    publishedAt: row.publishedAt?.toISOString() ?? null,
    rerun: isRerun(scope.filter(sameScope(row)).map(listing), listing(row)),
    clubFrontLag: headline.clubFrontLag,
    balanceRatio: headline.balanceRatio,
    athleteCount: headline.athleteCount,
  }
}

export async function listAudits(db: DbOrTx, clubId: string): Promise<AuditSummary[]> {
  const names = await squadNames(db, clubId)
  const rows = await db
    .select(summaryColumns)
    .from(audits)
    .where(eq(audits.clubId, clubId))
    .orderBy(desc(audits.asOf), desc(audits.createdAt))
  return rows.map((r) => summary(r, names, rows))
}

const withoutSquads = ({ squadFrontLags: _bySquad, ...rest }: AuditComparison) => rest

const sameScope = (row: SummaryRow) => (other: SummaryRow) => other.squadId === row.squadId

/**
 * The audit a stored one's changes are measured from, with the changes: the same function for
 * the director's report and the board (see {@link baselineAudit}).
 */
function changesOf(scope: readonly SummaryRow[], row: SummaryRow) {
  const listed = scope.filter(sameScope(row)).map(listing)
  const previous = baselineAudit(listed, listing(row))?.row ?? null
  return { previous, comparison: compareAudits(previous?.figures ?? null, row.figures) }
}

async function auditSummaryRow(db: DbOrTx, clubId: string, id: string): Promise<SummaryRow> {
  const [row] = await db
    .select(summaryColumns)
    .from(audits)
    .where(and(eq(audits.clubId, clubId), eq(audits.id, id)))
  if (!row) throw notFound('No such audit.')
  return row
}

async function auditRow(db: DbOrTx, clubId: string, id: string) {
  const [row] = await db
    .select()
    .from(audits)
    .where(and(eq(audits.clubId, clubId), eq(audits.id, id)))
  if (!row) throw notFound('No such audit.')
  return row
}

/** A report; for a coach the athlete rows are limited to their squads. */
export async function getReport(db: DbOrTx, access: ClubAccess, id: string): Promise<AuditReport> {
  return reportWithin(db, access.clubId, id, await readableSquadIds(db, access))
}

/**
 * The report of an audit limited to the squads in `readable`, as someone with that reach reads
 * it (a PDF drawn by a worker for the person who asked).
 */
export async function reportWithin(
  db: DbOrTx,
  clubId: string,
  id: string,
  readable: 'all' | string[],
): Promise<AuditReport> {
  const row = await auditRow(db, clubId, id)
  const names = await squadNames(db, clubId)
  const scope = await db
    .select(summaryColumns)
    .from(audits)
    .where(
      and(
        eq(audits.clubId, clubId),
        row.squadId ? eq(audits.squadId, row.squadId) : isNull(audits.squadId),
      ),
    )
  const self = scope.find((r) => r.id === row.id)!
  const { previous, comparison } = changesOf(scope, self)
  const full = unpackAuditResult(row.result)
  const keep = (squadId: string) => readable === 'all' || readable.includes(squadId)
  const result: AuditResult = {
    ...full,
    athletes: full.athletes.filter((a) => keep(a.squadId)),
    gaps: full.gaps.filter((g) => keep(g.squadId)),
    readiness: full.readiness.filter((r) => keep(r.squadId)),
  }
  const visitOutcomes = await outcomesForReport(db, clubId, row.visitOutcomes, keep)
  const ids = [
    ...new Set([
      ...result.athletes.map((a) => a.athleteId),
      ...result.readiness.map((r) => r.athleteId),
      ...(visitOutcomes?.recommendations.map((r) => r.athleteId) ?? []),
    ]),
  ]
  const people =
    ids.length === 0
      ? []
      : await db
          .select({
            id: athletes.id,
            givenName: athletes.givenName,
            familyName: athletes.familyName,
          })
          .from(athletes)
          .where(and(eq(athletes.clubId, clubId), inArray(athletes.id, ids)))
  return {
    audit: summary(self, names, scope),
    result,
    comparison,
    previous: previous ? summary(previous, names, scope) : null,
    trend: onePerDate(scope.map(listing)).map(({ row: r }) => ({
      id: r.id,
      asOf: r.asOf,
      clubFrontLag: r.figures.headline.clubFrontLag,
      balanceRatio: r.figures.headline.balanceRatio,
    })),
    athleteNames: namesOrErased(ids, people),
    squadNames: names,
    limitedToSquads: readable !== 'all',
    visitOutcomes,
  }
}

/**
 * The name of each athlete a report lists. One it lists but the club no longer has was erased
 * for good: the report keeps the row and its figures under a neutral label.
 */
function namesOrErased(
  ids: string[],
  people: { id: string; givenName: string; familyName: string }[],
): Record<string, string> {
  const names = new Map(people.map((p) => [p.id, athleteFullName(p)]))
  return Object.fromEntries(ids.map((id) => [id, names.get(id) ?? erasedAthleteLabel]))
}

/** Gathers the inputs again as of the audit's date: the same hash means nothing has changed since. */
export async function recheck(db: DbOrTx, access: ClubAccess, id: string) {
  const row = await auditSummaryRow(db, access.clubId, id)
  if (!isAuditHashVersion(row.hashVersion)) {
    throw new AppError(
      409,
      'hash_version_unknown',
      'This audit’s inputs were hashed by a later release of Twofold; it cannot be re-checked here.',
    )
  }
  const inputs = await gatherSnapshot(db, access.clubId, row.squadId, row.asOf)
  // Made the way the stored hash was, so that an audit stored before version 2 compares alike.
  const hash = await auditInputHash(inputs, {}, row.hashVersion)
  return { inputHash: row.inputHash, currentHash: hash, unchanged: hash === row.inputHash }
}

/**
 * Publishes the audit to the board. Publishing is idempotent: an audit published already stays
 * as it was and answers `newly: false`. Of two publishes at once, only one changes the row (its
 * update waits for the other's and finds the audit published), so the board is told once.
 */
export async function publish(db: DbOrTx, access: ClubAccess, id: string) {
  const row = await auditSummaryRow(db, access.clubId, id)
  const changed = await db
    .update(audits)
    .set({ publishedAt: new Date(), publishedBy: access.userId })
    .where(and(eq(audits.clubId, access.clubId), eq(audits.id, id), isNull(audits.publishedAt)))
    .returning({ id: audits.id })
  return { row, newly: changed.length > 0 }
}

/**
 * The board's page: published club-wide audits only (the latest created for each date), figures
 * and squad names, no athletes.
 */
export async function boardSummary(db: DbOrTx, clubId: string): Promise<BoardSummary> {
  const [club] = await db.select({ name: clubs.name }).from(clubs).where(eq(clubs.id, clubId))
  const names = await squadNames(db, clubId)
  const published = (
    await db
      .select(summaryColumns)
      .from(audits)
      .where(and(eq(audits.clubId, clubId), isNull(audits.squadId)))
      .orderBy(asc(audits.asOf), asc(audits.createdAt))
  ).filter((r) => r.publishedAt !== null)
  // One point per date: an audit published again for the same day replaces the earlier one.
  const rows = onePerDate(published.map(listing)).map((l) => l.row)
  const last = rows.at(-1)
  const latest = last?.figures ?? null
  const changes = last ? changesOf(published, last).comparison : null
  return {
    clubName: club!.name,
    trend: rows.map((r) => {
      const h = r.figures.headline
      return {
        asOf: r.asOf,
        clubFrontLag: h.clubFrontLag,
        clubBackLag: h.clubBackLag,
        balanceRatio: h.balanceRatio,
      }
    }),
    latest:
      last && latest && changes
        ? {
            asOf: last.asOf,
            publishedAt: last.publishedAt!.toISOString(),
            athleteCount: latest.headline.athleteCount,
            clubFrontLag: latest.headline.clubFrontLag,
            clubBackLag: latest.headline.clubBackLag,
            balanceRatio: latest.headline.balanceRatio,
            catalogueGaps: latest.headline.catalogueGaps,
            athletesWithGaps: latest.headline.athletesWithGaps,
            readinessAlerts: latest.headline.readinessAlerts,
            // The board reads no squad ids: its squads are named in `squads`.
            comparison: withoutSquads(changes),
            squads: latest.squads
              .flatMap((s) =>
                s.frontLag === null
                  ? []
                  : [
                      {
                        name: names[s.squadId] ?? 'Squad',
                        frontLag: s.frontLag,
                        athleteCount: s.athleteCount,
                      },
                    ],
              )
              .sort((a, b) => a.name.localeCompare(b.name)),
            squadsWithoutRecords: latest.squads.filter((s) => s.frontLag === null).length,
            visitOutcomes: last.visitOutcomes?.summary ?? null,
          }
        : null,
  }
}
