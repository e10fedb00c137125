import { and, asc, desc, eq, inArray, type SQL } from 'drizzle-orm'
import { todayIso } from '../../shared/domain/access.ts'
import { canMoveTo, reminderDay, stillOpen } from '../../shared/domain/visits.ts'
import {
  recommendationInputSchema,
  recommendationQuerySchema,
  recommendationStatusSchema,
  type RecommendationView,
} from '../../shared/schemas/visits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { users } from '../db/schema-accounts.ts'
import { athletes, squads } from '../db/schema-athletes.ts'
import { elementSteps, elements } from '../db/schema-catalogue.ts'
import { clips, recommendationEvents, recommendations, visits } from '../db/schema-visits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { queues } from '../jobs/queue.ts'
import { mailNewRecommendation } from './recommendation-mail.ts'
import { assertCanReadSquad, readableSquadIds } from './scope.ts'
import { openVisitCovering } from './visit-access.ts'

// Recommendations: a clinician leaves them during a visit on the squads it covers; the coaches
// of the squad answer them; the director sees them all.

const invalid = (path: string, message: string) =>
  new AppError(400, 'invalid_input', message, [{ path, message }])

/** Which recommendations the person sees: the club's, their squads', or their own visits'. */
async function visibleWhere(db: DbOrTx, access: ClubAccess): Promise<SQL | undefined> {
  const ofClub = eq(recommendations.clubId, access.clubId)
  if (access.role === 'director') return ofClub
  if (access.role === 'clinician') return and(ofClub, eq(visits.clinicianId, access.userId))
  const readable = await readableSquadIds(db, access)
  if (readable === 'all') return ofClub
  if (readable.length === 0) return undefined
  return and(ofClub, inArray(recommendations.squadId, readable))
}

/** The recommendations the person sees, filtered by the query, newest first. */
export async function listRecommendations(
  db: DbOrTx,
  access: ClubAccess,
  rawQuery: unknown,
): Promise<RecommendationView[]> {
  const query = recommendationQuerySchema.parse(rawQuery)
  if (query.squadId) await assertCanReadSquad(db, access, query.squadId)
  const visible = await visibleWhere(db, access)
  if (!visible) return []
  return recommendationViews(
    db,
    access.clubId,
    and(
      visible,
      query.squadId ? eq(recommendations.squadId, query.squadId) : undefined,
      query.athleteId ? eq(recommendations.athleteId, query.athleteId) : undefined,
      query.elementId ? eq(recommendations.elementId, query.elementId) : undefined,
      query.visitId ? eq(recommendations.visitId, query.visitId) : undefined,
      query.open ? inArray(recommendations.status, ['open', 'accepted']) : undefined,
    )!,
  )
}

async function recommendationViews(
  db: DbOrTx,
  clubId: string,
  where: SQL,
): Promise<RecommendationView[]> {
  const rows = await db
    .select({
      rec: recommendations,
      squadName: squads.name,
      givenName: athletes.givenName,
      familyName: athletes.familyName,
      elementName: elements.name,
      stepName: elementSteps.name,
      clinicianName: users.name,
    })
    .from(recommendations)
    .innerJoin(
      visits,
      and(eq(visits.clubId, recommendations.clubId), eq(visits.id, recommendations.visitId)),
    )
    .innerJoin(
      squads,
      and(eq(squads.clubId, recommendations.clubId), eq(squads.id, recommendations.squadId)),
    )
    .leftJoin(
      athletes,
      and(eq(athletes.clubId, recommendations.clubId), eq(athletes.id, recommendations.athleteId)),
    )
    .leftJoin(
      elements,
      and(eq(elements.clubId, recommendations.clubId), eq(elements.id, recommendations.elementId)),
    )
    .leftJoin(
      elementSteps,
      and(
        eq(elementSteps.clubId, recommendations.clubId),
        eq(elementSteps.elementId, recommendations.elementId),
        eq(elementSteps.position, recommendations.suggestedStepIndex),
      ),
    )
    .leftJoin(users, eq(users.id, recommendations.createdBy))
    .where(where)
    .orderBy(desc(recommendations.createdAt), asc(recommendations.id))
  if (rows.length === 0) return []
  const history = await db
    .select({ event: recommendationEvents, byName: users.name })
    .from(recommendationEvents)
    .leftJoin(users, eq(users.id, recommendationEvents.byUserId))
    .where(
      and(
        eq(recommendationEvents.clubId, clubId),
        inArray(
          recommendationEvents.recommendationId,
          rows.map((r) => r.rec.id),
        ),
      ),
    )
    .orderBy(asc(recommendationEvents.at), asc(recommendationEvents.id))
  return rows.map(({ rec, ...r }) => ({
    id: rec.id,
    visitId: rec.visitId,
    squadId: rec.squadId,
    squadName: r.squadName,
    athleteId: rec.athleteId,
    athleteName: r.givenName ? `${r.givenName} ${r.familyName}` : null,
    elementId: rec.elementId,
    elementName: r.elementName,
    suggestedStepIndex: rec.suggestedStepIndex,
    suggestedStepName: r.stepName,
    clipId: rec.clipId,
    text: rec.text,
    priority: rec.priority,
    dueOn: rec.dueOn,
    status: rec.status,
    clinicianName: r.clinicianName,
    createdAt: rec.createdAt.toISOString(),
    history: history
      .filter((h) => h.event.recommendationId === rec.id)
      .map((h) => ({
        status: h.event.status,
        note: h.event.note,
        byName: h.byName,
        at: h.event.at.toISOString(),
      })),
  }))
}

async function oneView(db: DbOrTx, clubId: string, id: string) {
  const [view] = await recommendationViews(
    db,
    clubId,
    and(eq(recommendations.clubId, clubId), eq(recommendations.id, id))!,
  )
  return view!
}

/** The element's steps version and how many steps it has, for the suggested step. */
async function elementStepsOf(db: DbOrTx, clubId: string, elementId: string) {
  const [element] = await db
    .select({ stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(and(eq(elements.clubId, clubId), eq(elements.id, elementId)))
  if (!element) throw notFound('No such element in this club.')
  const steps = await db
    .select({ position: elementSteps.position })
    .from(elementSteps)
    .where(and(eq(elementSteps.clubId, clubId), eq(elementSteps.elementId, elementId)))
  return { stepsVersion: element.stepsVersion, count: steps.length }
}

/**
 * A clinician's recommendation, during a visit open today that covers the squad. In one
 * transaction: the row, its first status, a mail to each coach of the squad, and the reminder
 * job held back until its day.
 */
export async function createRecommendation(
  ctx: AppContext,
  access: ClubAccess,
  body: unknown,
): Promise<RecommendationView> {
  const input = recommendationInputSchema.parse(body)
  const today = todayIso()
  const squad = await assertCanReadSquad(ctx.db, access, input.squadId)
  const visit = await openVisitCovering(ctx.db, access.clubId, access.userId, squad.id, today)
  if (!visit)
    throw new AppError(403, 'forbidden', `Your visit open today does not cover ${squad.name}.`)
  if (input.dueOn < today) throw invalid('dueOn', 'The due date cannot be before today.')
  if (input.athleteId) {
    const [athlete] = await ctx.db
      .select({ squadId: athletes.squadId })
      .from(athletes)
      .where(and(eq(athletes.clubId, access.clubId), eq(athletes.id, input.athleteId)))
    if (!athlete) throw notFound('No such athlete in this club.')
    if (athlete.squadId !== squad.id)
      throw invalid('athleteId', `This athlete is not in ${squad.name}.`)
  }
  if (input.clipId) {
    const [clip] = await ctx.db
      .select({ athleteId: clips.athleteId })
      .from(clips)
      .where(and(eq(clips.clubId, access.clubId), eq(clips.id, input.clipId)))
    if (!clip || clip.athleteId !== input.athleteId)
      throw invalid('clipId', 'Choose a clip of this athlete.')
  }
  let stepsVersion: number | null = null
  if (input.elementId) {
    const steps = await elementStepsOf(ctx.db, access.clubId, input.elementId)
    if (input.suggestedStepIndex! >= steps.count)
      throw invalid(
        'suggestedStepIndex',
        `This element has ${steps.count} steps: choose one of them.`,
      )
    stepsVersion = steps.stepsVersion
  }
  const origin = publicOrigin(ctx.env)
  const id = await ctx.db.transaction(async (tx) => {
    const [rec] = await tx
      .insert(recommendations)
      .values({
        clubId: access.clubId,
        visitId: visit.id,
        squadId: squad.id,
        athleteId: input.athleteId ?? null,
        elementId: input.elementId ?? null,
        suggestedStepIndex: input.suggestedStepIndex ?? null,
        stepsVersion,
        clipId: input.clipId ?? null,
        text: input.text,
        priority: input.priority,
        dueOn: input.dueOn,
        createdBy: access.userId,
      })
      .returning()
    await tx.insert(recommendationEvents).values({
      clubId: access.clubId,
      recommendationId: rec!.id,
      status: 'open',
      byUserId: access.userId,
    })
    await mailNewRecommendation(tx, ctx.jobs, rec!, origin)
    const day = reminderDay(today, input.dueOn, ctx.env.RECOMMENDATION_REMINDER_DAYS)
    if (day)
      await ctx.jobs.send(
        tx,
        queues.recommendationReminder,
        { clubId: access.clubId, recommendationId: rec!.id, origin },
        { startAfter: new Date(`${day}T00:00:00Z`) },
      )
    return rec!.id
  })
  return oneView(ctx.db, access.clubId, id)
}

/**
 * A coach of the squad accepts, declines (with a reason) or marks done (with a note); the new
 * status and its entry in the history are written together.
 */
export async function setRecommendationStatus(
  db: DbOrTx,
  access: ClubAccess,
  id: string,
  body: unknown,
): Promise<RecommendationView> {
  const input = recommendationStatusSchema.parse(body)
  await db.transaction(async (tx) => {
    const [rec] = await tx
      .select()
      .from(recommendations)
      .where(and(eq(recommendations.clubId, access.clubId), eq(recommendations.id, id)))
      .for('update')
    if (!rec) throw notFound('No such recommendation in this club.')
    await assertCanReadSquad(tx, access, rec.squadId)
    if (!canMoveTo(rec.status, input.status))
      throw new AppError(
        409,
        'status_final',
        stillOpen(rec.status)
          ? `This recommendation is already ${rec.status}.`
          : `This recommendation is ${rec.status}: that is final.`,
      )
    await tx
      .update(recommendations)
      .set({ status: input.status })
      .where(and(eq(recommendations.clubId, access.clubId), eq(recommendations.id, id)))
    await tx.insert(recommendationEvents).values({
      clubId: access.clubId,
      recommendationId: id,
      status: input.status,
      note: input.note,
      byUserId: access.userId,
    })
  })
  return oneView(db, access.clubId, id)
}
