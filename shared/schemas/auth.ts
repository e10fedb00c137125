import { z } from 'zod'
import { roles } from '../domain/club.ts'

export const passwordMinLength = 8
export const passwordMaxLength = 128

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email('Enter an e-mail address such as name@example.org.'))

/** Length only: strength is judged on the server by an estimator, not by composition rules. */
export const newPasswordSchema = z
  .string()
  .min(passwordMinLength, `Use at least ${passwordMinLength} characters.`)
  .max(passwordMaxLength, `Use at most ${passwordMaxLength} characters.`)

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(passwordMaxLength),
})
export type SignInInput = z.infer<typeof signInSchema>

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.').max(passwordMaxLength),
  newPassword: newPasswordSchema,
})
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>

export const resetRequestSchema = z.object({ email: emailSchema })

export const tokenSchema = z
  .string()
  .regex(/^[A-Za-z0-9_-]{22,128}$/, 'This link is not valid. Ask for a new one.')

export const resetConfirmSchema = z.object({ token: tokenSchema, newPassword: newPasswordSchema })

export const isoDateSchema = z.iso.date('Enter a date as YYYY-MM-DD.')

/** A clinician's visit window: both dates, start not after end. */
const windowRefinement = <
  T extends { role: string; accessStartsOn?: string | null; accessEndsOn?: string | null },
>(
  value: T,
  ctx: z.RefinementCtx,
) => {
  if (value.role !== 'clinician') return
  if (!value.accessStartsOn)
    ctx.addIssue({
      code: 'custom',
      path: ['accessStartsOn'],
      message: 'A clinician needs the first day of the visit.',
    })
  if (!value.accessEndsOn)
    ctx.addIssue({
      code: 'custom',
      path: ['accessEndsOn'],
      message: 'A clinician needs the last day of the visit.',
    })
  if (value.accessStartsOn && value.accessEndsOn && value.accessEndsOn < value.accessStartsOn)
    ctx.addIssue({
      code: 'custom',
      path: ['accessEndsOn'],
      message: 'The last day cannot be before the first day.',
    })
}

export const invitationInputSchema = z
  .object({
    email: emailSchema,
    role: z.enum(roles, 'Choose a role.'),
    accessStartsOn: isoDateSchema.nullish(),
    accessEndsOn: isoDateSchema.nullish(),
  })
  .superRefine(windowRefinement)
export type InvitationInput = z.infer<typeof invitationInputSchema>

export const membershipUpdateSchema = z
  .object({
    role: z.enum(roles, 'Choose a role.'),
    accessStartsOn: isoDateSchema.nullish(),
    accessEndsOn: isoDateSchema.nullish(),
  })
  .superRefine(windowRefinement)
export type MembershipUpdate = z.infer<typeof membershipUpdateSchema>

export const acceptInvitationSchema = z.object({
  token: tokenSchema,
  /** Needed only when the invitee has no account yet. */
  name: z.string().trim().min(1, 'Enter your name.').max(120).optional(),
  password: z.string().min(1, 'Enter a password.').max(passwordMaxLength),
})
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>

export const switchClubSchema = z.object({ clubId: z.uuid('Choose a club.') })

// Answers

export const membershipViewSchema = z.object({
  clubId: z.uuid(),
  clubName: z.string(),
  role: z.enum(roles),
  accessStartsOn: z.string().nullable(),
  accessEndsOn: z.string().nullable(),
  /** False for a clinician outside the visit window. */
  accessOpen: z.boolean(),
})
export type MembershipView = z.infer<typeof membershipViewSchema>

export const meSchema = z.object({
  user: z.object({ id: z.string(), email: z.string(), name: z.string() }),
  memberships: z.array(membershipViewSchema),
  activeClubId: z.uuid().nullable(),
})
export type Me = z.infer<typeof meSchema>

export const sessionViewSchema = z.object({
  /** A public handle of the session (a hash), never the cookie's secret. */
  handle: z.string(),
  createdAt: z.string(),
  expiresAt: z.string(),
  userAgent: z.string().nullable(),
  current: z.boolean(),
})
export type SessionView = z.infer<typeof sessionViewSchema>

export const memberViewSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: z.enum(roles),
  accessStartsOn: z.string().nullable(),
  accessEndsOn: z.string().nullable(),
  squadIds: z.array(z.uuid()),
})
export type MemberView = z.infer<typeof memberViewSchema>

export const invitationViewSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  role: z.enum(roles),
  accessStartsOn: z.string().nullable(),
  accessEndsOn: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  status: z.enum(['pending', 'expired']),
})
export type InvitationView = z.infer<typeof invitationViewSchema>

export const invitationPreviewSchema = z.object({
  clubName: z.string(),
  email: z.string(),
  role: z.enum(roles),
  accessStartsOn: z.string().nullable(),
  accessEndsOn: z.string().nullable(),
  /** True when the invitee already has an account: they confirm with their password. */
  existingAccount: z.boolean(),
})
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>

/** A message caught by the local fake mail server (development and tests only). */
export const outboxMessageSchema = z.object({
  id: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  receivedAt: z.string(),
})
export type OutboxMessage = z.infer<typeof outboxMessageSchema>

/** Without a mail provider: where this computer's local mail viewer is; null with a provider. */
export const localMailSchema = z.object({ url: z.string().nullable() })
export type LocalMail = z.infer<typeof localMailSchema>
