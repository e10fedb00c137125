import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm'
import {
  planOutcomeSchema,
  savePlanSchema,
  type PlanOutcome,
  type SavedPlan,
  type SavedPlanSummary,
} from '../../shared/schemas/planner.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { sessionPlans } from '../db/schema-planner.ts'
import { athletes, progressRecords, squads } from '../db/schema-athletes.ts'
import { AppError, notFound } from '../http/errors.ts'
import { recordEvent } from './progress-events.ts'
import { assertCanReadSquad, assertCanWriteSquad, readableSquadIds } from './scope.ts'

type PlanRow = typeof sessionPlans.$inferSelect

function summary(row: PlanRow, squadName: string): SavedPlanSummary {
  return {
    id: row.id,
    squadId: row.squadId,
    squadName,
    sessionDate: row.sessionDate,
    athleteCount: row.model.athletes.length,
    recordedAt: row.recordedAt?.toISOString() ?? null,
    updatedAt: row.updatedAt.toISOString(),
  }
}

function full(row: PlanRow, squadName: string): SavedPlan {
  return {
    ...summary(row, squadName),
    model: row.model,
    placements: row.placements,
    outcome: row.outcome ?? null,
  }
}

/** Checks that every athlete a plan names is in its squad (and still in the club). */
async function assertAthletesOfSquad(db: DbOrTx, clubId: string, squadId: string, ids: string[]) {
  const rows = await db
    .select({ id: athletes.id })
    .from(athletes)
    .where(
      and(eq(athletes.clubId, clubId), eq(athletes.squadId, squadId), inArray(athletes.id, ids)),
    )
  if (rows.length !== new Set(ids).size) {
    throw new AppError(400, 'invalid_input', 'The plan names athletes who are not in this squad.', [
      { path: 'model.athletes', message: 'Plan for athletes of the squad.' },
    ])
  }
}

function checkPlacements(input: ReturnType<typeof savePlanSchema.parse>) {
  const athleteIds = new Set(input.model.athletes.map((a) => a.id))
  const stationIds = new Set(input.model.stations.map((s) => s.id))
  input.placements.forEach((p, i) => {
    if (
      !athleteIds.has(p.athleteId) ||
      !stationIds.has(p.stationId) ||
      p.block >= input.model.blocks
    )
      throw new AppError(
        400,
        'invalid_input',
        'A placement names no athlete, station or block of the plan.',
        [
          {
            path: `placements.${i}`,
            message: 'Place athletes of the plan at its stations and blocks.',
          },
        ],
      )
  })
}

/** Saves a plan for a squad and a date. */
export async function savePlan(db: DbOrTx, access: ClubAccess, raw: unknown): Promise<SavedPlan> {
  const input = savePlanSchema.parse(raw)
  checkPlacements(input)
  const squad = await assertCanWriteSquad(db, access, input.squadId)
  await assertAthletesOfSquad(
    db,
    access.clubId,
    input.squadId,
    input.model.athletes.map((a) => a.id),
  )
  const [row] = await db
    .insert(sessionPlans)
    .values({
      clubId: access.clubId,
      squadId: input.squadId,
      sessionDate: input.sessionDate,
      model: input.model,
      placements: input.placements,
      createdBy: access.userId,
    })
    .returning()
  return full(row!, squad.name)
}

async function planRow(db: DbOrTx, clubId: string, id: string, lock = false) {
  const query = db
    .select()
    .from(sessionPlans)
    .where(and(eq(sessionPlans.clubId, clubId), eq(sessionPlans.id, id)))
  // Recording locks the plan: a second recording waits, then finds it recorded.
  const [row] = lock ? await query.for('update') : await query
  if (!row) throw notFound('No such plan.')
  return row
}

/** Saves the coach's changes to a plan not yet recorded: its date and its placements. */
export async function updatePlan(
  db: DbOrTx,
  access: ClubAccess,
  id: string,
  raw: unknown,
): Promise<SavedPlan> {
  const input = savePlanSchema.parse(raw)
  checkPlacements(input)
  const existing = await planRow(db, access.clubId, id)
  const squad = await assertCanWriteSquad(db, access, existing.squadId)
  if (input.squadId !== existing.squadId)
    throw new AppError(400, 'invalid_input', 'A plan stays with its squad.', [
      { path: 'squadId', message: 'A plan stays with its squad.' },
    ])
  if (existing.recordedAt)
    throw new AppError(
      409,
      'plan_recorded',
      'This plan’s session is recorded; it no longer changes.',
    )
  await assertAthletesOfSquad(
    db,
    access.clubId,
    input.squadId,
    input.model.athletes.map((a) => a.id),
  )
  const [row] = await db
    .update(sessionPlans)
    .set({
      sessionDate: input.sessionDate,
      model: input.model,
      placements: input.placements,
      updatedAt: new Date(),
    })
    .where(and(eq(sessionPlans.clubId, access.clubId), eq(sessionPlans.id, id)))
    .returning()
  return full(row!, squad.name)
}

/** Saved plans of the squads the person may read, newest session first; one squad if given. */
export async function listPlans(
  db: DbOrTx,
  access: ClubAccess,
  squadId?: string,
): Promise<SavedPlanSummary[]> {
  if (squadId) await assertCanReadSquad(db, access, squadId)
  const readable = await readableSquadIds(db, access)
  if (readable !== 'all' && readable.length === 0) return []
  const rows = await db
    .select({ plan: sessionPlans, squadName: squads.name })
    .from(sessionPlans)
    .innerJoin(
      squads,
      and(eq(squads.clubId, sessionPlans.clubId), eq(squads.id, sessionPlans.squadId)),
    )
    .where(
      and(
        eq(sessionPlans.clubId, access.clubId),
        squadId ? eq(sessionPlans.squadId, squadId) : undefined,
        readable === 'all' ? undefined : inArray(sessionPlans.squadId, readable),
      ),
    )
    .orderBy(desc(sessionPlans.sessionDate), desc(sessionPlans.updatedAt))
    .limit(200)
  return rows.map((r) => summary(r.plan, r.squadName))
}

export async function getPlan(db: DbOrTx, access: ClubAccess, id: string): Promise<SavedPlan> {
  const row = await planRow(db, access.clubId, id)
  const squad = await assertCanReadSquad(db, access, row.squadId)
  return full(row, squad.name)
}

/**
 * Records what happened in the session in one go: for each athlete ticked on an element they
 * worked on, a step event to the step after the one they had reached, written through the
 * progress service (its checks, its conflict test, its replay), all in one transaction. Any
 * refusal leaves nothing written.
 */
export async function recordPlanOutcome(
  db: DbOrTx,
  access: ClubAccess,
  id: string,
  raw: unknown,
): Promise<SavedPlan> {
  const input = planOutcomeSchema.parse(raw)
  return db.transaction(async (tx) => {
    const row = await planRow(tx, access.clubId, id, true)
    const squad = await assertCanWriteSquad(tx, access, row.squadId)
    if (row.recordedAt)
      throw new AppError(409, 'plan_recorded', 'This plan’s session is already recorded.')
    const worked = new Set(
      row.placements.map((p) => {
        const option = row.model.athletes.find((a) => a.id === p.athleteId)?.options[p.option]
        return `${p.athleteId}|${option?.elementId}`
      }),
    )
    const passed: PlanOutcome['passed'] = []
    for (const [i, pass] of input.passed.entries()) {
      if (!worked.has(`${pass.athleteId}|${pass.elementId}`)) {
        throw new AppError(
          400,
          'invalid_input',
          'Tick only elements the plan had the athlete work on.',
          [{ path: `passed.${i}`, message: 'Not worked on in this plan.' }],
        )
      }
      const [record] = await tx
        .select({ stepIndex: progressRecords.stepIndex, lastEventId: progressRecords.lastEventId })
        .from(progressRecords)
        .where(
          and(
            eq(progressRecords.clubId, access.clubId),
            eq(progressRecords.athleteId, pass.athleteId),
            eq(progressRecords.elementId, pass.elementId),
          ),
        )
      const stepIndex = (record?.stepIndex ?? -1) + 1
      await recordEvent(tx, access, pass.athleteId, {
        elementId: pass.elementId,
        kind: 'step',
        stepIndex,
        occurredOn: input.occurredOn,
        note: `Session plan of ${row.sessionDate}`,
        expectedLastEventId: record?.lastEventId ?? null,
      })
      passed.push({ ...pass, stepIndex })
    }
    const [updated] = await tx
      .update(sessionPlans)
      .set({
        recordedAt: new Date(),
        outcome: { occurredOn: input.occurredOn, passed, recordedBy: access.userId },
      })
      .where(
        and(
          eq(sessionPlans.clubId, access.clubId),
          eq(sessionPlans.id, id),
          isNull(sessionPlans.recordedAt),
        ),
      )
      .returning()
    return full(updated!, squad.name)
  })
}

/**
 * Erasing an athlete for good takes them out of every saved plan: their name, focus steps,
 * placements and recorded passes. The plans stay for the rest of the squad.
 */
export async function removeAthleteFromPlans(tx: DbOrTx, clubId: string, athleteId: string) {
  // The text search only narrows the rows to read.
  const rows = await tx
    .select()
    .from(sessionPlans)
    .where(
      and(
        eq(sessionPlans.clubId, clubId),
        sql`strpos(${sessionPlans.model}::text, ${athleteId}) > 0`,
      ),
    )
  for (const row of rows) {
    const outcome = row.outcome && {
      ...row.outcome,
      passed: row.outcome.passed.filter((p) => p.athleteId !== athleteId),
    }
    await tx
      .update(sessionPlans)
      .set({
        model: { ...row.model, athletes: row.model.athletes.filter((a) => a.id !== athleteId) },
        placements: row.placements.filter((p) => p.athleteId !== athleteId),
        outcome,
      })
      .where(and(eq(sessionPlans.clubId, clubId), eq(sessionPlans.id, row.id)))
  }
}
