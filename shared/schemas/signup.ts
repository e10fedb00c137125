import { z } from 'zod'
import { emailSchema, passwordMaxLength, tokenSchema } from './auth.ts'
import { text } from './text.ts'

export const clubNameSchema = text()
  .min(2, 'Enter the club name (at least 2 characters).')
  .max(120, 'Use at most 120 characters.')

export const personNameSchema = text()
  .min(1, 'Enter your name.')
  .max(120, 'Use at most 120 characters.')

/** POST /api/signup/request: the Start a club form. */
export const clubSignupRequestSchema = z.object({
  clubName: clubNameSchema,
  name: personNameSchema,
  email: emailSchema,
})
export type ClubSignupRequest = z.infer<typeof clubSignupRequestSchema>

export const clubSignupPreviewInputSchema = z.object({ token: tokenSchema })

/** POST /api/signup/confirm: a new password, or the current one of an existing account. */
export const clubSignupConfirmSchema = z.object({
  token: tokenSchema,
  password: z.string().min(1, 'Enter a password.').max(passwordMaxLength),
})
export type ClubSignupConfirm = z.infer<typeof clubSignupConfirmSchema>

// Answers

export const clubSignupPreviewSchema = z.object({
  clubName: z.string(),
  name: z.string(),
  email: z.string(),
  /** True when the address already has an account: the person confirms with its password. */
  existingAccount: z.boolean(),
})
export type ClubSignupPreview = z.infer<typeof clubSignupPreviewSchema>

/** One row of the operator's list of clubs to set up (a CSV file or the command's options). */
export const clubSetupRowSchema = z.object({
  club: clubNameSchema,
  directorEmail: emailSchema,
  directorName: personNameSchema,
})
export type ClubSetupRow = z.infer<typeof clubSetupRowSchema>
