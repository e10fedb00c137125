// The squad grid: athletes × elements, each cell the step reached. It is the screen a coach keeps
// open on the floor, so it reads only what it shows, all at once (bench/grid.bench.ts).

import { and, asc, eq, type SQL } from 'drizzle-orm'
import { figNotation } from '../../shared/domain/catalogue.ts'
import type { RotationClass } from '../../shared/domain/element.ts'
import type { Grid } from '../../shared/schemas/progress.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes, progressRecords } from '../db/schema-athletes.ts'
import { elements } from '../db/schema-catalogue.ts'
import { squadRoster } from './athletes.ts'
import { counterpart, counterpartOfElement, progressionLength } from './catalogue-columns.ts'
import { athleteOfRecord } from './progress-records.ts'
import { assertCanReadSquad } from './scope.ts'

/**
 * The columns of the grid: the catalogue's elements (in the catalogue's order, filtered as
 * asked) with what a column shows, each one's number of steps and its mirror found by key as the
 * catalogue finds it.
 */
function gridElements(
  db: DbOrTx,
  clubId: string,
  query: { apparatus?: string; rotationClass?: RotationClass },
) {
  const where: SQL[] = [eq(elements.clubId, clubId)]
  if (query.apparatus) where.push(eq(elements.apparatus, query.apparatus))
  if (query.rotationClass) where.push(eq(elements.rotationClass, query.rotationClass))
  return db
    .select({
      id: elements.id,
      name: elements.name,
      apparatus: elements.apparatus,
      direction: elements.direction,
      rotationClass: elements.rotationClass,
      quarterRotations: elements.quarterRotations,
      twists: elements.twists,
      shape: elements.shape,
      counterpartId: counterpart.id,
      stepCount: progressionLength(0),
    })
    .from(elements)
    .leftJoin(counterpart, counterpartOfElement)
    .where(and(...where))
    .orderBy(asc(elements.apparatus), asc(elements.quarterRotations), asc(elements.name))
}

/**
 * The squad grid: athletes × elements, each cell the step reached. Backward elements stand next
 * to their forward mirror so that a trailing counterpart shows at a glance.
 */
export async function squadGrid(
  db: DbOrTx,
  access: ClubAccess,
  squadId: string,
  query: { apparatus?: string; rotationClass?: RotationClass } = {},
): Promise<Grid> {
  // The check first (one row by key), so that a refused caller reads nothing; then every read at
  // once, three connections of the pool at most.
  const squad = await assertCanReadSquad(db, access, squadId)
  const [list, roster, records] = await Promise.all([
    gridElements(db, access.clubId, query),
    squadRoster(db, access.clubId, squadId),
    db
      .select({
        athleteId: progressRecords.athleteId,
        elementId: progressRecords.elementId,
        stepIndex: progressRecords.stepIndex,
        paused: progressRecords.paused,
        flagged: progressRecords.flagged,
      })
      .from(progressRecords)
      .innerJoin(athletes, athleteOfRecord)
      .where(and(eq(progressRecords.clubId, access.clubId), eq(athletes.squadId, squadId))),
  ])
  const byId = new Map(list.map((e) => [e.id, e]))
  const placed = new Set<string>()
  const columns: Grid['columns'] = []
  const push = (id: string, pairKey: string) => {
    const e = byId.get(id)!
    placed.add(id)
    columns.push({
      elementId: e.id,
      name: e.name,
      apparatus: e.apparatus,
      direction: e.direction,
      rotationClass: e.rotationClass,
      notation: figNotation(e),
      stepCount: e.stepCount,
      counterpartId: e.counterpartId && byId.has(e.counterpartId) ? e.counterpartId : null,
      pairKey,
    })
  }
  for (const e of list) {
    if (placed.has(e.id) || e.direction !== 'backward') continue
    push(e.id, e.id)
    if (e.counterpartId && byId.has(e.counterpartId) && !placed.has(e.counterpartId))
      push(e.counterpartId, e.id)
  }
  for (const e of list) if (!placed.has(e.id)) push(e.id, e.id)

  const column = new Map(columns.map((c, i) => [c.elementId, i]))
  const row = new Map(roster.map((a, i) => [a.id, i]))
  const cells: Grid['cells'] = roster.map(() =>
    columns.map(() => ({ step: null, paused: false, flagged: false })),
  )
  for (const r of records) {
    const i = row.get(r.athleteId)
    const j = column.get(r.elementId)
    if (i === undefined || j === undefined) continue
    cells[i]![j] = { step: r.stepIndex, paused: r.paused, flagged: r.flagged }
  }
  return { squad: { id: squad.id, name: squad.name }, athletes: roster, columns, cells }
}
