import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { Readable } from 'node:stream'
import type { DbOrTx } from '../server/db/client.ts'
import { clips } from '../server/db/schema-visits.ts'
import { projectDir } from '../server/paths.ts'
import { clipObjectKey, type ClipStore } from '../server/storage/clip-store.ts'
import { athletesOfSquad, forwardFloorElement } from './demo-visits.ts'

/**
 * Three short WebM clips (a ball on an arc over a bar, drawn on a canvas and recorded once in
 * Chromium: a few kilobytes each, no people) of the first athletes of the visited squad on the
 * forward element the visit is about, for the demo clinician to review.
 */
export async function demoClips(
  tx: DbOrTx,
  store: ClipStore,
  input: { clubId: string; squadId: string; coachId: string; today: Date },
) {
  const { clubId } = input
  const squadAthletes = (await athletesOfSquad(tx, clubId, input.squadId)).slice(0, 3)
  const frontTuck = await forwardFloorElement(tx, clubId)
  if (!frontTuck) return 0
  let n = 0
  for (const [i, athlete] of squadAthletes.entries()) {
    const bytes = readFileSync(join(projectDir, 'seed/clips', `attempt-${i + 1}.webm`))
    const id = randomUUID()
    const key = clipObjectKey(clubId, id)
    await store.put(key, Readable.from([bytes]), bytes.length, 'video/webm')
    await tx.insert(clips).values({
      clubId,
      id,
      athleteId: athlete.id,
      elementId: frontTuck.id,
      objectKey: key,
      contentType: 'video/webm',
      sizeBytes: bytes.length,
      fileName: `attempt-${i + 1}.webm`,
      note: i === 0 ? 'Third attempt of the session, spotted.' : '',
      uploadedBy: input.coachId,
      createdAt: new Date(input.today.getTime() - (3 - i) * 86_400_000),
    })
    n++
  }
  return n
}
