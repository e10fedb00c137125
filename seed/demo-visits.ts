import { and, asc, eq } from 'drizzle-orm'
import type { DbOrTx } from '../server/db/client.ts'
import { athletes } from '../server/db/schema-athletes.ts'
import { elements } from '../server/db/schema-catalogue.ts'
import {
  recommendationEvents,
  recommendations,
  visitSquads,
  visits,
} from '../server/db/schema-visits.ts'

const isoDate = (d: Date) => d.toISOString().slice(0, 10)
const addDays = (d: Date, days: number) => new Date(d.getTime() + days * 86_400_000)

/** The squad's athletes by name: the demo's visits and clips are about the first ones. */
export const athletesOfSquad = (tx: DbOrTx, clubId: string, squadId: string) =>
  tx
    .select({ id: athletes.id })
    .from(athletes)
    .where(and(eq(athletes.clubId, clubId), eq(athletes.squadId, squadId)))
    .orderBy(asc(athletes.familyName), asc(athletes.givenName))

/** The simplest forward element on floor: what the demo visit is about. */
export async function forwardFloorElement(tx: DbOrTx, clubId: string) {
  const [element] = await tx
    .select({ id: elements.id, stepsVersion: elements.stepsVersion })
    .from(elements)
    .where(
      and(
        eq(elements.clubId, clubId),
        eq(elements.apparatus, 'floor'),
        eq(elements.direction, 'forward'),
      ),
    )
    .orderBy(asc(elements.quarterRotations), asc(elements.name))
  return element
}

/**
 * One visit open around the day of seeding (a week before to three weeks after) covering one
 * squad, with three recommendations: open on an athlete's element, accepted on an athlete, and
 * declined on the squad. Written straight to the tables: seeding sends no mail.
 */
export async function demoVisit(
  tx: DbOrTx,
  input: {
    clubId: string
    today: Date
    squadId: string
    clinicianId: string
    directorId: string
    coachId: string
  },
) {
  const { clubId, today } = input
  const [visit] = await tx
    .insert(visits)
    .values({
      clubId,
      clinicianId: input.clinicianId,
      firstDay: isoDate(addDays(today, -7)),
      lastDay: isoDate(addDays(today, 21)),
      agenda: 'Forward saltos on floor: where the program trails, and the landings.',
      createdBy: input.directorId,
      createdAt: addDays(today, -14),
    })
    .returning({ id: visits.id })
  await tx.insert(visitSquads).values({ clubId, visitId: visit!.id, squadId: input.squadId })
  const squadAthletes = await athletesOfSquad(tx, clubId, input.squadId)
  const frontTuck = await forwardFloorElement(tx, clubId)
  const made = addDays(today, -5)
  const rows = [
    {
      athleteId: squadAthletes[0]?.id ?? null,
      elementId: frontTuck?.id ?? null,
      suggestedStepIndex: frontTuck ? 1 : null,
      stepsVersion: frontTuck?.stepsVersion ?? null,
      text: 'Two more weeks of spotted attempts before moving on; the tuck opens early.',
      priority: 'high' as const,
      dueOn: isoDate(addDays(today, 14)),
      history: [] as { status: 'accepted' | 'declined'; note: string }[],
    },
    {
      athleteId: squadAthletes[1]?.id ?? null,
      elementId: null,
      suggestedStepIndex: null,
      stepsVersion: null,
      text: 'Add forward rotation drills to the warm-up of every session.',
      priority: 'normal' as const,
      dueOn: isoDate(addDays(today, 28)),
      history: [{ status: 'accepted' as const, note: '' }],
    },
    {
      athleteId: null,
      elementId: null,
      suggestedStepIndex: null,
      stepsVersion: null,
      text: 'Move the squad to the sprung floor for the last half hour.',
      priority: 'low' as const,
      dueOn: isoDate(addDays(today, 7)),
      history: [
        { status: 'declined' as const, note: 'The sprung floor is booked by another squad then.' },
      ],
    },
  ]
  for (const { history, ...row } of rows) {
    const status = history.at(-1)?.status ?? 'open'
    const [rec] = await tx
      .insert(recommendations)
      .values({
        clubId,
        visitId: visit!.id,
        squadId: input.squadId,
        ...row,
        status,
        createdBy: input.clinicianId,
        createdAt: made,
      })
      .returning({ id: recommendations.id })
    await tx.insert(recommendationEvents).values([
      { clubId, recommendationId: rec!.id, status: 'open', byUserId: input.clinicianId, at: made },
      ...history.map((h) => ({
        clubId,
        recommendationId: rec!.id,
        ...h,
        byUserId: input.coachId,
        at: addDays(today, -3),
      })),
    ])
  }
  return rows.length
}
