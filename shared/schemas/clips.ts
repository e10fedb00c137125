import { z } from 'zod'
import { text } from './text.ts'

/** POST /clips: whose attempt, on which element; the body is the video file itself. */
export const clipUploadQuerySchema = z.object({
  athleteId: z.uuid('Choose an athlete.'),
  elementId: z.uuid('Choose an element.'),
  fileName: text().max(200).default(''),
  note: text().max(500).default(''),
})
export type ClipUploadQuery = z.input<typeof clipUploadQuerySchema>

/** GET /clips: an athlete's (optionally on one element), a squad's, or those awaiting my review. */
export const clipQuerySchema = z.object({
  athleteId: z.uuid('No such athlete.').optional(),
  elementId: z.uuid('No such element.').optional(),
  squadId: z.uuid('No such squad.').optional(),
  /** Only clips I have not marked reviewed (clinicians). */
  unreviewed: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .optional(),
})

export interface ClipView {
  id: string
  athleteId: string
  athleteName: string
  squadId: string
  squadName: string
  elementId: string
  elementName: string
  contentType: string
  sizeBytes: number
  fileName: string
  note: string
  uploadedByName: string | null
  createdAt: string
  /** Whether I (a clinician) marked it reviewed. */
  reviewedByMe: boolean
}
