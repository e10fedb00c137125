import { z } from 'zod'

/**
 * What every job a person waits for (an archive, a PDF report) reports to a poll: how far it has
 * got, and how long what it makes is kept. `expired` once that time is over.
 */
export const jobProgressSchema = z.object({
  id: z.uuid(),
  status: z.enum(['running', 'done', 'failed', 'expired']),
  phase: z.string(),
  done: z.number().int(),
  total: z.number().int(),
  error: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  /** Size of the file in bytes, once made. */
  bytes: z.number().int().nullable(),
})
