import { and, asc, desc, eq, inArray, isNull, or } from 'drizzle-orm'
import { athleteFullName } from '../../shared/domain/erasure.ts'
import { explainInfeasible } from '../../shared/domain/planner/explain.ts'
import { focusSteps } from '../../shared/domain/planner/model.ts'
import type { PlanAthlete, PlanModel } from '../../shared/domain/planner/types.ts'
import {
  planRequestSchema,
  stationInputSchema,
  type PlanResult,
  type Station,
} from '../../shared/schemas/planner.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { plannerStations } from '../db/schema-planner.ts'
import { athletes, progressRecords } from '../db/schema-athletes.ts'
import { audits } from '../db/schema-audits.ts'
import { elements, elementSteps } from '../db/schema-catalogue.ts'
import { AppError, notFound } from '../http/errors.ts'
import { unpackAuditResult } from './audit-storage.ts'
import { solvePlanOffThread } from './planner-pool.ts'
import { assertCanWriteSquad } from './scope.ts'

/** How many of an athlete's largest forward gaps the default focus takes. */
export const gapsPerAthlete = 3

const stationColumns = {
  id: plannerStations.id,
  name: plannerStations.name,
  modality: plannerStations.modality,
  capacity: plannerStations.capacity,
  secondsPerTurn: plannerStations.secondsPerTurn,
  needsSpotter: plannerStations.needsSpotter,
}

export async function listStations(db: DbOrTx, clubId: string): Promise<Station[]> {
  return db
    .select(stationColumns)
    .from(plannerStations)
    .where(eq(plannerStations.clubId, clubId))
    .orderBy(asc(plannerStations.name))
}

function sameName(err: unknown): boolean {
  const code = (err as { code?: string; cause?: { code?: string } }).cause?.code
  return code === '23505' || (err as { code?: string }).code === '23505'
}

/** Adds a station to the club's gym; names are unique within the club. */
export async function createStation(db: DbOrTx, clubId: string, raw: unknown): Promise<Station> {
  const input = stationInputSchema.parse(raw)
  try {
    const [row] = await db
      .insert(plannerStations)
      .values({ clubId, ...input })
      .returning(stationColumns)
    return row!
  } catch (err) {
    if (sameName(err)) throw nameTaken(input.name)
    throw err
  }
}

const nameTaken = (name: string) =>
  new AppError(409, 'name_taken', `The club already has a station named ${name}.`, [
    { path: 'name', message: 'Another station has this name.' },
  ])

export async function updateStation(
  db: DbOrTx,
  clubId: string,
  id: string,
  raw: unknown,
): Promise<Station> {
  const input = stationInputSchema.parse(raw)
  try {
    const [row] = await db
      .update(plannerStations)
      .set(input)
      .where(and(eq(plannerStations.clubId, clubId), eq(plannerStations.id, id)))
      .returning(stationColumns)
    if (!row) throw notFound('No such station in this club.')
    return row
  } catch (err) {
    if (sameName(err)) throw nameTaken(input.name)
    throw err
  }
}

export async function deleteStation(db: DbOrTx, clubId: string, id: string) {
  const rows = await db
    .delete(plannerStations)
    .where(and(eq(plannerStations.clubId, clubId), eq(plannerStations.id, id)))
    .returning({ id: plannerStations.id })
  if (!rows.length) throw notFound('No such station in this club.')
}

/**
 * The focus elements of each athlete from the latest audit of the squad or of the club: the
 * forward counterparts of their largest gaps, largest first. Null when no audit exists.
 */
async function gapFocus(db: DbOrTx, clubId: string, squadId: string) {
  const [row] = await db
    .select({ result: audits.result, asOf: audits.asOf })
    .from(audits)
    .where(and(eq(audits.clubId, clubId), or(eq(audits.squadId, squadId), isNull(audits.squadId))))
    .orderBy(desc(audits.asOf), desc(audits.createdAt))
    .limit(1)
  if (!row) return null
  const result = unpackAuditResult(row.result)
  const byAthlete = new Map<string, string[]>()
  for (const gap of result.gaps) {
    if (!gap.counterpartId || gap.counterpartMissing) continue
    const list = byAthlete.get(gap.athleteId) ?? []
    if (list.length < gapsPerAthlete && !list.includes(gap.counterpartId))
      list.push(gap.counterpartId)
    byAthlete.set(gap.athleteId, list)
  }
  return { asOf: row.asOf, byAthlete }
}

/**
 * For athletes the audit lists no gap for (it predates their progress, or they have none): the
 * forward elements they have started and not paused, those furthest behind first.
 */
async function forwardInProgress(db: DbOrTx, clubId: string, athleteIds: string[]) {
  const rows = await db
    .select({
      athleteId: progressRecords.athleteId,
      elementId: progressRecords.elementId,
      stepIndex: progressRecords.stepIndex,
    })
    .from(progressRecords)
    .innerJoin(
      elements,
      and(eq(elements.clubId, progressRecords.clubId), eq(elements.id, progressRecords.elementId)),
    )
    .where(
      and(
        eq(progressRecords.clubId, clubId),
        inArray(progressRecords.athleteId, athleteIds),
        eq(elements.direction, 'forward'),
        eq(progressRecords.paused, false),
      ),
    )
    .orderBy(asc(progressRecords.stepIndex), asc(elements.name))
  const out = new Map<string, string[]>()
  for (const r of rows) {
    if (r.stepIndex === null) continue
    const list = out.get(r.athleteId) ?? []
    if (list.length < gapsPerAthlete) list.push(r.elementId)
    out.set(r.athleteId, list)
  }
  return out
}

/**
 * Builds the plan's model from the request: the athletes present (of the squad, in the coach's
 * reach), their step on each focus element and the steps around it, the chosen stations.
 */
export async function buildPlanModel(
  db: DbOrTx,
  access: ClubAccess,
  raw: unknown,
): Promise<{ model: PlanModel; focusSource: string }> {
  const request = planRequestSchema.parse(raw)
  await assertCanWriteSquad(db, access, request.squadId)
  const clubId = access.clubId
  const people = await db
    .select({ id: athletes.id, givenName: athletes.givenName, familyName: athletes.familyName })
    .from(athletes)
    .where(
      and(
        eq(athletes.clubId, clubId),
        eq(athletes.squadId, request.squadId),
        isNull(athletes.archivedAt),
        inArray(athletes.id, request.athleteIds),
      ),
    )
  if (people.length !== new Set(request.athleteIds).size) {
    throw new AppError(400, 'invalid_input', 'Some athletes chosen are not in this squad.', [
      { path: 'athleteIds', message: 'Choose athletes of the squad.' },
    ])
  }
  const stations = await db
    .select(stationColumns)
    .from(plannerStations)
    .where(and(eq(plannerStations.clubId, clubId), inArray(plannerStations.id, request.stationIds)))
  if (stations.length !== new Set(request.stationIds).size) {
    throw new AppError(400, 'invalid_input', 'Some stations chosen are not the club’s.', [
      { path: 'stationIds', message: 'Choose the club’s stations.' },
    ])
  }

  let focusSource = 'chosen elements'
  let focus: Map<string, string[]>
  if (request.focus.mode === 'elements') {
    const ids = request.focus.elementIds
    focus = new Map(people.map((p) => [p.id, ids]))
  } else {
    const gaps = await gapFocus(db, clubId, request.squadId)
    if (!gaps) {
      throw new AppError(
        409,
        'no_audit',
        'No audit of this squad or club yet: run one, or choose the focus elements.',
        [{ path: 'focus', message: 'Choose elements: there is no audit to take gaps from.' }],
      )
    }
    focusSource = `the largest forward gaps in the audit as of ${gaps.asOf}`
    focus = gaps.byAthlete
    const without = people.filter((p) => !focus.get(p.id)?.length).map((p) => p.id)
    if (without.length) {
      for (const [athleteId, ids] of await forwardInProgress(db, clubId, without))
        focus.set(athleteId, ids)
      focusSource += '; for athletes without a gap there, the forward elements they are on'
    }
  }
  const elementIds = [...new Set([...focus.values()].flat())]
  const model: PlanModel = {
    minutes: request.minutes,
    blocks: request.blocks,
    changeoverSeconds: request.changeoverSeconds,
    coaches: request.coaches,
    stations: request.stationIds.map((id) => stations.find((s) => s.id === id)!),
    athletes: [],
  }
  const [elementRows, stepRows, records] = elementIds.length
    ? await Promise.all([
        db
          .select({ id: elements.id, name: elements.name, direction: elements.direction })
          .from(elements)
          .where(and(eq(elements.clubId, clubId), inArray(elements.id, elementIds))),
        db
          .select({
            elementId: elementSteps.elementId,
            name: elementSteps.name,
            modality: elementSteps.modality,
          })
          .from(elementSteps)
          .where(and(eq(elementSteps.clubId, clubId), inArray(elementSteps.elementId, elementIds)))
          .orderBy(asc(elementSteps.elementId), asc(elementSteps.position)),
        db
          .select({
            athleteId: progressRecords.athleteId,
            elementId: progressRecords.elementId,
            stepIndex: progressRecords.stepIndex,
            paused: progressRecords.paused,
          })
          .from(progressRecords)
          .where(
            and(
              eq(progressRecords.clubId, clubId),
              inArray(progressRecords.athleteId, request.athleteIds),
              inArray(progressRecords.elementId, elementIds),
            ),
          ),
      ])
    : [[], [], []]
  if (request.focus.mode === 'elements' && elementRows.length !== elementIds.length) {
    throw new AppError(400, 'invalid_input', 'Some elements chosen are not in the catalogue.', [
      { path: 'focus.elementIds', message: 'Choose elements of the catalogue.' },
    ])
  }
  const elementById = new Map(elementRows.map((e) => [e.id, e]))
  const recordOf = new Map(records.map((r) => [`${r.athleteId}|${r.elementId}`, r]))
  const sorted = [...people].sort(
    (a, b) => a.familyName.localeCompare(b.familyName) || a.givenName.localeCompare(b.givenName),
  )
  model.athletes = sorted.map((person): PlanAthlete => {
    const mine = (focus.get(person.id) ?? []).flatMap((elementId) => {
      const element = elementById.get(elementId)
      const record = recordOf.get(`${person.id}|${elementId}`)
      // A paused record (an injury, a lost skill) is not planned: the coach decides its return.
      if (!element || record?.paused) return []
      return [
        {
          elementId,
          elementName: element.name,
          direction: element.direction,
          stepIndex: record?.stepIndex ?? null,
          steps: stepRows.filter((s) => s.elementId === elementId),
        },
      ]
    })
    return { id: person.id, name: athleteFullName(person), options: focusSteps(mine) }
  })
  return { model, focusSource }
}

/** Builds the model and solves it: the plan, the solver's report and any reasons it falls short. */
export async function planSession(
  db: DbOrTx,
  access: ClubAccess,
  raw: unknown,
): Promise<PlanResult> {
  const { model, focusSource } = await buildPlanModel(db, access, raw)
  const solved = await solvePlanOffThread(model)
  const reasons = explainInfeasible(model)
  if (!reasons.length && solved.minTurns < 1)
    reasons.push('Not every athlete can get a turn with these stations, minutes and coaches.')
  return {
    model,
    placements: solved.placements,
    solverMinTurns: solved.minTurns,
    solver: solved.report,
    reasons,
    focusSource,
  }
}
