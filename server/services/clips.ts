import { randomUUID } from 'node:crypto'
import { pipeline } from 'node:stream/promises'
import type { Request, Response } from 'express'
import { and, desc, eq, inArray, isNull, type SQL } from 'drizzle-orm'
import {
  clipContentTypes,
  clipSniffBytes,
  parseByteRange,
  sniffClipContainer,
} from '../../shared/domain/clips.ts'
import {
  clipQuerySchema,
  clipUploadQuerySchema,
  type ClipView,
} from '../../shared/schemas/clips.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { AppContext } from '../context.ts'
import type { DbOrTx } from '../db/client.ts'
import { users } from '../db/schema-accounts.ts'
import { athletes, squads } from '../db/schema-athletes.ts'
import { elements } from '../db/schema-catalogue.ts'
import { clipReviews, clips } from '../db/schema-visits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { queues, type JobQueue } from '../jobs/queue.ts'
import { clipObjectKey, type ClipStore } from '../storage/clip-store.ts'
import { takeHead, withHead } from './clip-streams.ts'
import { athleteInScope, assertCanReadSquad, readableSquadIds } from './scope.ts'

// Clips: a coach uploads a short video of an athlete's attempt at an element; whoever may read
// the athlete's squad (coaches of it, the director, a clinician inside a visit covering it)
// watches it, streamed through the server with the access checked on every request.

const fileIssue = (status: number, code: string, message: string) =>
  new AppError(status, code, message, [{ path: 'file', message }])

function storeOf(ctx: AppContext): ClipStore {
  if (!ctx.clips)
    throw new AppError(503, 'clips_unavailable', 'Clips are not available on this server.')
  return ctx.clips
}

async function clipViews(
  db: DbOrTx,
  access: ClubAccess,
  where: SQL,
  unreviewed = false,
): Promise<ClipView[]> {
  const uploader = users
  const rows = await db
    .select({
      clip: clips,
      givenName: athletes.givenName,
      familyName: athletes.familyName,
      squadId: athletes.squadId,
      squadName: squads.name,
      elementName: elements.name,
      uploadedByName: uploader.name,
      reviewedAt: clipReviews.reviewedAt,
    })
    .from(clips)
    .innerJoin(athletes, and(eq(athletes.clubId, clips.clubId), eq(athletes.id, clips.athleteId)))
    .innerJoin(squads, and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)))
    .innerJoin(elements, and(eq(elements.clubId, clips.clubId), eq(elements.id, clips.elementId)))
    .leftJoin(uploader, eq(uploader.id, clips.uploadedBy))
    .leftJoin(
      clipReviews,
      and(
        eq(clipReviews.clubId, clips.clubId),
        eq(clipReviews.clipId, clips.id),
        eq(clipReviews.userId, access.userId),
      ),
    )
    .where(and(where, unreviewed ? isNull(clipReviews.reviewedAt) : undefined))
    .orderBy(desc(clips.createdAt), desc(clips.id))
    .limit(500)
  return rows.map((r) => ({
    id: r.clip.id,
    athleteId: r.clip.athleteId,
    athleteName: `${r.givenName} ${r.familyName}`,
    squadId: r.squadId,
    squadName: r.squadName,
    elementId: r.clip.elementId,
    elementName: r.elementName,
    contentType: r.clip.contentType,
    sizeBytes: r.clip.sizeBytes,
    fileName: r.clip.fileName,
    note: r.clip.note,
    uploadedByName: r.uploadedByName,
    createdAt: r.clip.createdAt.toISOString(),
    reviewedByMe: r.reviewedAt !== null,
  }))
}

/** The clips the person may watch, filtered by the query, newest first (at most 500). */
export async function listClips(
  db: DbOrTx,
  access: ClubAccess,
  rawQuery: unknown,
): Promise<ClipView[]> {
  const query = clipQuerySchema.parse(rawQuery)
  if (query.athleteId) await athleteInScope(db, access, query.athleteId, 'read')
  if (query.squadId) await assertCanReadSquad(db, access, query.squadId)
  const readable = await readableSquadIds(db, access)
  if (readable !== 'all' && readable.length === 0) return []
  return clipViews(
    db,
    access,
    and(
      eq(clips.clubId, access.clubId),
      readable === 'all' ? undefined : inArray(athletes.squadId, readable),
      query.athleteId ? eq(clips.athleteId, query.athleteId) : undefined,
      query.elementId ? eq(clips.elementId, query.elementId) : undefined,
      query.squadId ? eq(athletes.squadId, query.squadId) : undefined,
    )!,
    query.unreviewed === true,
  )
}

/**
 * A coach of the athlete's squad (or the director) uploads a clip: the request body is the
 * file, streamed to the store once its first bytes show a video container we serve. Its size
 * comes from Content-Length, which Node holds the body to.
 */
export async function uploadClip(
  ctx: AppContext,
  access: ClubAccess,
  req: Request,
): Promise<ClipView> {
  const query = clipUploadQuerySchema.parse(req.query)
  const store = storeOf(ctx)
  await athleteInScope(ctx.db, access, query.athleteId, 'write')
  const [element] = await ctx.db
    .select({ id: elements.id })
    .from(elements)
    .where(and(eq(elements.clubId, access.clubId), eq(elements.id, query.elementId)))
  if (!element) throw notFound('No such element in this club.')
  const declared = req.headers['content-length']
  if (declared === undefined || !/^\d+$/.test(declared))
    throw fileIssue(411, 'length_required', 'Send the file with its length.')
  const size = Number(declared)
  const maxBytes = ctx.env.CLIP_MAX_MB * 1_000_000
  if (size > maxBytes)
    throw fileIssue(
      413,
      'too_large',
      `This clip is ${Math.ceil(size / 1_000_000)} MB: the limit is ${ctx.env.CLIP_MAX_MB} MB.`,
    )
  // A JSON or form body has been read by its parser already: it holds no file.
  if (req.readableEnded)
    throw fileIssue(
      400,
      'invalid_input',
      'Send the video file itself as the body of the request, not JSON or a form.',
    )
  const head = await takeHead(req, clipSniffBytes)
  const container = sniffClipContainer(head)
  if (!container)
    throw fileIssue(400, 'invalid_input', 'This file is not an MP4, MOV or WebM video.')
  const id = randomUUID()
  const key = clipObjectKey(access.clubId, id)
  const contentType = clipContentTypes[container]
  try {
    await store.put(key, withHead(head, req), size, contentType)
  } catch (err) {
    if (req.destroyed || !req.complete)
      throw fileIssue(400, 'upload_incomplete', 'The upload stopped before the end: try again.')
    throw err
  }
  try {
    await ctx.db.insert(clips).values({
      clubId: access.clubId,
      id,
      athleteId: query.athleteId,
      elementId: query.elementId,
      objectKey: key,
      contentType,
      sizeBytes: size,
      fileName: query.fileName,
      note: query.note,
      uploadedBy: access.userId,
    })
  } catch (err) {
    await store.remove([key]).catch(() => {})
    throw err
  }
  const [view] = await clipViews(
    ctx.db,
    access,
    and(eq(clips.clubId, access.clubId), eq(clips.id, id))!,
  )
  return view!
}

async function readableClip(db: DbOrTx, access: ClubAccess, clipId: string) {
  const [clip] = await db
    .select()
    .from(clips)
    .where(and(eq(clips.clubId, access.clubId), eq(clips.id, clipId)))
  if (!clip) throw notFound('No such clip in this club.')
  await athleteInScope(db, access, clip.athleteId, 'read')
  return clip
}

/**
 * The clip's video, whole or the byte range asked for (206), so that a player can seek; the
 * access is checked on every request, as a player asks for many ranges.
 */
export async function streamClip(
  ctx: AppContext,
  access: ClubAccess,
  clipId: string,
  req: Request,
  res: Response,
) {
  const store = storeOf(ctx)
  const clip = await readableClip(ctx.db, access, clipId)
  const size = clip.sizeBytes
  res.setHeader('Accept-Ranges', 'bytes')
  const range = parseByteRange(req.headers.range, size)
  if (range === 'unsatisfiable') {
    res.status(416).setHeader('Content-Range', `bytes */${size}`).end()
    return
  }
  const { start, end } = range ?? { start: 0, end: size - 1 }
  const body = await store.get(clip.objectKey, start, end)
  res.status(range ? 206 : 200)
  res.setHeader('Content-Type', clip.contentType)
  res.setHeader('Content-Length', String(end - start + 1))
  if (range) res.setHeader('Content-Range', `bytes ${start}-${end}/${size}`)
  try {
    await pipeline(body, res)
  } catch (err) {
    // A player that seeks drops the ranges it no longer wants: nothing to answer then.
    if (res.destroyed || req.destroyed) return
    throw err
  }
}

/** A clinician marks a clip reviewed (once; again is harmless). */
export async function markClipReviewed(db: DbOrTx, access: ClubAccess, clipId: string) {
  await readableClip(db, access, clipId)
  await db
    .insert(clipReviews)
    .values({ clubId: access.clubId, clipId, userId: access.userId })
    .onConflictDoNothing()
  const [view] = await clipViews(
    db,
    access,
    and(eq(clips.clubId, access.clubId), eq(clips.id, clipId))!,
  )
  return view!
}

/** A clip removal job: the stored objects of clips whose rows are gone. */
export interface ClipRemovalJob {
  keys: string[]
}

/**
 * Puts the removal of stored clip objects on the queue, in `tx`'s transaction: the rows that
 * name them go and their removal is on its way together, or neither. A worker removes them,
 * retrying while the store is unreachable; `removeClipObjects` tries at once as well.
 */
export async function queueClipRemoval(tx: DbOrTx, jobs: JobQueue, keys: string[]) {
  if (keys.length > 0) await jobs.send(tx, queues.clipRemoval, { keys } satisfies ClipRemovalJob)
}

/**
 * Deletes stored clip objects once the transaction that erased their rows (and queued their
 * removal) has committed, so that they are gone by the time the answer is sent. Should the
 * store fail now, the queued removal retries.
 */
export async function removeClipObjects(ctx: AppContext, keys: string[]) {
  if (keys.length === 0) return
  if (!ctx.clips) {
    ctx.logger.error(
      { keys },
      'clip objects left in storage for now: clips are turned off here; a worker with the S3 settings removes them',
    )
    return
  }
  try {
    await ctx.clips.remove(keys)
  } catch (err) {
    ctx.logger.warn(
      { err: (err as Error).message, count: keys.length },
      'clip objects not deleted yet: a worker retries',
    )
  }
}
