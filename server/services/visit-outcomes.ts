import { and, desc, eq, gt, inArray, isNotNull, isNull, lt, lte, sql } from 'drizzle-orm'
import type { TimelinePoint } from '../../shared/domain/progress.ts'
import {
  visitOutcomes,
  type OutcomeRecommendation,
  type VisitOutcomes,
} from '../../shared/domain/visit-outcomes.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressRecords } from '../db/schema-athletes.ts'
import { audits } from '../db/schema-audits.ts'
import { elements } from '../db/schema-catalogue.ts'
import { recommendationEvents, recommendations, visits } from '../db/schema-visits.ts'

// Reads what the visit outcomes of an audit need: the recommendations of the visits since the
// previous audit of the same scope, their status as of the audit date, and the timelines of the
// records concerned.

/**
 * The outcomes an audit of the scope as of `asOf` reports: those of the recommendations naming
 * an athlete and an element, made on or before `asOf`, during visits not cancelled that had not
 * ended by the previous audit of the scope (so the next audit after a visit reports it). Null
 * when there are none.
 */
export async function gatherVisitOutcomes(
  db: DbOrTx,
  clubId: string,
  squadId: string | null,
  asOf: string,
): Promise<VisitOutcomes | null> {
  const [previous] = await db
    .select({ asOf: audits.asOf })
    .from(audits)
    .where(
      and(
        eq(audits.clubId, clubId),
        squadId ? eq(audits.squadId, squadId) : isNull(audits.squadId),
        lt(audits.asOf, asOf),
      ),
    )
    .orderBy(desc(audits.asOf))
    .limit(1)
  const madeOn = sql<string>`(${recommendations.createdAt} at time zone 'UTC')::date::text`
  const rows = await db
    .select({
      id: recommendations.id,
      squadId: recommendations.squadId,
      athleteId: recommendations.athleteId,
      elementId: recommendations.elementId,
      suggestedStepIndex: recommendations.suggestedStepIndex,
      madeOn,
    })
    .from(recommendations)
    .innerJoin(
      visits,
      and(eq(visits.clubId, recommendations.clubId), eq(visits.id, recommendations.visitId)),
    )
    .where(
      and(
        eq(recommendations.clubId, clubId),
        squadId ? eq(recommendations.squadId, squadId) : undefined,
        isNotNull(recommendations.athleteId),
        isNotNull(recommendations.elementId),
        isNull(visits.cancelledAt),
        previous ? gt(visits.lastDay, previous.asOf) : undefined,
        lte(madeOn, asOf),
      ),
    )
  if (rows.length === 0) return null
  const ids = rows.map((r) => r.id)
  // The status as of the end of the audit date: the last one recorded by then.
  const history = await db
    .select({ id: recommendationEvents.recommendationId, status: recommendationEvents.status })
    .from(recommendationEvents)
    .where(
      and(
        eq(recommendationEvents.clubId, clubId),
        inArray(recommendationEvents.recommendationId, ids),
        lte(sql`(${recommendationEvents.at} at time zone 'UTC')::date::text`, asOf),
      ),
    )
    .orderBy(recommendationEvents.at, recommendationEvents.id)
  const statusOf = new Map(history.map((h) => [h.id, h.status]))
  const squadIds = [...new Set(rows.map((r) => r.squadId))]
  const elementIds = [...new Set(rows.map((r) => r.elementId!))]
  const roster = await db
    .select({ id: athletes.id, squadId: athletes.squadId })
    .from(athletes)
    .where(and(eq(athletes.clubId, clubId), inArray(athletes.squadId, squadIds)))
  const athletesBySquad = new Map<string, string[]>()
  for (const a of roster)
    athletesBySquad.set(a.squadId, [...(athletesBySquad.get(a.squadId) ?? []), a.id])
  const records = await db
    .select({
      athleteId: progressRecords.athleteId,
      elementId: progressRecords.elementId,
      timeline: progressRecords.timeline,
    })
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, clubId),
        inArray(
          progressRecords.athleteId,
          roster.map((a) => a.id),
        ),
        inArray(progressRecords.elementId, elementIds),
      ),
    )
  const timelines = new Map<string, readonly TimelinePoint[]>(
    records.map((r) => [`${r.athleteId}:${r.elementId}`, r.timeline ?? []]),
  )
  return visitOutcomes({
    asOf,
    recommendations: rows.map((r): OutcomeRecommendation => ({
      id: r.id,
      squadId: r.squadId,
      athleteId: r.athleteId!,
      elementId: r.elementId!,
      status: statusOf.get(r.id) ?? 'open',
      madeOn: r.madeOn,
      suggestedStepIndex: r.suggestedStepIndex,
    })),
    timelines,
    athletesBySquad,
  })
}

/**
 * The stored outcomes as a report shows them: only the rows of squads the person reads (the
 * counts stay the scope's), with the elements' names.
 */
export async function outcomesForReport(
  db: DbOrTx,
  clubId: string,
  outcomes: VisitOutcomes | null,
  keep: (squadId: string) => boolean,
) {
  if (!outcomes) return null
  const shown = outcomes.recommendations.filter((r) => keep(r.squadId))
  const ids = [...new Set(shown.map((r) => r.elementId))]
  const names =
    ids.length === 0
      ? []
      : await db
          .select({ id: elements.id, name: elements.name })
          .from(elements)
          .where(and(eq(elements.clubId, clubId), inArray(elements.id, ids)))
  return {
    ...outcomes,
    recommendations: shown,
    elementNames: Object.fromEntries(names.map((e) => [e.id, e.name])),
  }
}
