import { z } from 'zod'
import type { AppContext } from '../context.ts'
import { AppError } from '../http/errors.ts'
import {
  clubArchiveDownload,
  getClubArchive,
  submitClubArchive,
} from '../services/club-archives.ts'
import type { ClubRoute } from './club-routes.ts'

// A malformed id names no archive: it gets the 404 of any unknown one, not a 400.
const archiveId = (raw: unknown) => {
  const id = z.uuid().safeParse(raw)
  if (!id.success) throw new AppError(404, 'not_found', 'No such archive.')
  return id.data
}

/** The club's data taken away: an archive built by a worker, polled, then downloaded. */
export function archiveRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'post',
      path: '/archives',
      allow: ['director'],
      handler: async (req, res) =>
        res.status(202).json(await submitClubArchive(ctx.db, ctx.jobs, req.club)),
    },
    {
      method: 'get',
      path: '/archives/:id',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(await getClubArchive(ctx.db, ctx.jobs, req.club.clubId, archiveId(req.params.id))),
    },
    {
      method: 'get',
      path: '/archives/:id/download',
      allow: ['director'],
      handler: async (req, res) => {
        const { filename, bytes } = await clubArchiveDownload(
          ctx.db,
          req.club.clubId,
          archiveId(req.params.id),
        )
        res.setHeader('Content-Type', 'application/zip')
        res.setHeader('Content-Disposition', `attachment; filename="${filename}"`)
        res.send(bytes)
      },
    },
  ]
}
