import { z } from 'zod'
import type { AppContext } from '../context.ts'
import { listClips, markClipReviewed, streamClip, uploadClip } from '../services/clips.ts'
import type { ClubRoute } from './club-routes.ts'

const clipParams = z.object({ clipId: z.uuid('No such clip.') })

/**
 * Clips of attempts: coaches (and the director) upload them; whoever reads the athlete's squad
 * watches them; a visiting clinician marks them reviewed. The board never sees them.
 */
export function clipRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/clips',
      allow: ['director', 'coach', 'clinician'],
      handler: async (req, res) => res.json(await listClips(ctx.db, req.club, req.query)),
    },
    {
      method: 'post',
      path: '/clips',
      allow: ['director', 'coach'],
      handler: async (req, res) => res.status(201).json(await uploadClip(ctx, req.club, req)),
    },
    {
      method: 'get',
      path: '/clips/:clipId/video',
      allow: ['director', 'coach', 'clinician'],
      handler: async (req, res) =>
        streamClip(ctx, req.club, clipParams.parse(req.params).clipId, req, res),
    },
    {
      method: 'post',
      path: '/clips/:clipId/reviewed',
      allow: ['clinician'],
      handler: async (req, res) =>
        res.json(await markClipReviewed(ctx.db, req.club, clipParams.parse(req.params).clipId)),
    },
  ]
}
