import { and, eq, inArray } from 'drizzle-orm'
import { previousQuarter, quarterEnd, quarterOf } from '../shared/domain/quarters.ts'
import { stepsAsOf } from '../shared/domain/pace.ts'
import type { TimelinePoint } from '../shared/domain/progress.ts'
import { addDaysIso, type RecommendationStatus } from '../shared/domain/visits.ts'
import type { DbOrTx } from '../server/db/client.ts'
import { progressRecords } from '../server/db/schema-athletes.ts'
import {
  recommendationEvents,
  recommendations,
  visitSquads,
  visits,
} from '../server/db/schema-visits.ts'
import { athletesOfSquad } from './demo-visits.ts'

const at = (day: string) => new Date(`${day}T10:00:00Z`)

/**
 * A visit that ended ten days before the end of the quarter before last, so that the audit as
 * of that quarter's end reports its outcomes: four recommendations on athletes' elements, one
 * in each state. The accepted and the done one are on records the demo history moves before
 * that audit, the declined one on a record it does not; written straight to the tables.
 */
export async function demoPastVisit(
  tx: DbOrTx,
  input: { clubId: string; today: Date; squadId: string; clinicianId: string; coachId: string },
) {
  const { clubId } = input
  const auditDay = quarterEnd(previousQuarter(previousQuarter(quarterOf(isoDate(input.today)))))
  const lastDay = addDaysIso(auditDay, -10)
  const firstDay = addDaysIso(lastDay, -4)
  const madeOn = addDaysIso(firstDay, 1)
  const roster = (await athletesOfSquad(tx, clubId, input.squadId)).map((a) => a.id)
  if (roster.length === 0) return 0
  const records = await tx
    .select({
      athleteId: progressRecords.athleteId,
      elementId: progressRecords.elementId,
      timeline: progressRecords.timeline,
    })
    .from(progressRecords)
    .where(and(eq(progressRecords.clubId, clubId), inArray(progressRecords.athleteId, roster)))
  const step = (t: readonly TimelinePoint[], day: string) => stepsAsOf(t, day)?.[1] ?? -1
  const started = records.filter((r) => step(r.timeline ?? [], addDaysIso(madeOn, -1)) >= 0)
  const moving = started.filter(
    (r) => step(r.timeline ?? [], auditDay) > step(r.timeline ?? [], addDaysIso(madeOn, -1)),
  )
  const still = started.filter((r) => !moving.includes(r))
  // Each athlete once: the moving records first for the accepted and done ones.
  const used = new Set<string>()
  const take = (from: typeof records) => {
    const r = from.find((x) => !used.has(x.athleteId))
    if (r) used.add(r.athleteId)
    return r
  }
  const plan: { status: RecommendationStatus; note: string; record?: (typeof records)[number] }[] =
    [
      { status: 'done', note: 'Reached with spotting, then alone.', record: take(moving) },
      { status: 'accepted', note: '', record: take(moving) },
      {
        status: 'declined',
        note: 'She is preparing a competition routine this month.',
        record: take(still),
      },
      { status: 'open', note: '', record: take(still) ?? take(started) },
    ]
  const [visit] = await tx
    .insert(visits)
    .values({
      clubId,
      clinicianId: input.clinicianId,
      firstDay,
      lastDay,
      agenda: 'Landings of forward and backward saltos; the order of the progressions.',
      createdAt: at(addDaysIso(firstDay, -21)),
    })
    .returning({ id: visits.id })
  await tx.insert(visitSquads).values({ clubId, visitId: visit!.id, squadId: input.squadId })
  let n = 0
  for (const { status, note, record } of plan) {
    if (!record) continue
    const stepNow = step(record.timeline ?? [], addDaysIso(madeOn, -1))
    const [rec] = await tx
      .insert(recommendations)
      .values({
        clubId,
        visitId: visit!.id,
        squadId: input.squadId,
        athleteId: record.athleteId,
        elementId: record.elementId,
        suggestedStepIndex: stepNow + 1,
        stepsVersion: 1,
        text: 'Work towards the next step with a spotter, three sessions a week.',
        priority: 'normal',
        dueOn: addDaysIso(madeOn, 45),
        status,
        createdBy: input.clinicianId,
        createdAt: at(madeOn),
      })
      .returning({ id: recommendations.id })
    const answered = status === 'open' ? [] : status === 'done' ? ['accepted', 'done'] : [status]
    await tx.insert(recommendationEvents).values([
      {
        clubId,
        recommendationId: rec!.id,
        status: 'open',
        byUserId: input.clinicianId,
        at: at(madeOn),
      },
      ...answered.map((s, i) => ({
        clubId,
        recommendationId: rec!.id,
        status: s as RecommendationStatus,
        note: s === status ? note : '',
        byUserId: input.coachId,
        at: at(addDaysIso(madeOn, 2 + i * 10)),
      })),
    ])
    n++
  }
  return n
}

const isoDate = (d: Date) => d.toISOString().slice(0, 10)
