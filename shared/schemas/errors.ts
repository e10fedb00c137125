import { z } from 'zod'

export const apiIssueSchema = z.object({
  /** Dotted path of the field, e.g. `twists.1`; empty for the whole request. */
  path: z.string(),
  message: z.string(),
})
export type ApiIssue = z.infer<typeof apiIssueSchema>

/** The one shape of every error the API answers with. */
export const apiErrorBodySchema = z.object({
  error: z
    .object({
      code: z.string(),
      message: z.string(),
      issues: z.array(apiIssueSchema).optional(),
    })
    .loose(),
})
export type ApiErrorBody = z.infer<typeof apiErrorBodySchema>
