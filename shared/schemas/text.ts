import { z } from 'zod'

/** Said of any text holding U+0000, which PostgreSQL cannot store in a text column. */
export const nulCharacterMessage =
  'This text holds a hidden NUL character (U+0000), which cannot be saved. Retype it.'

export const hasNulCharacter = (value: string) => value.includes('\u0000')

/**
 * Text a person types (a name, a note, a criterion): trimmed, and refusing the NUL character,
 * so the form shows the same error the server would answer. Chain `.min()`/`.max()` after it.
 */
export const text = (params?: Parameters<typeof z.string>[0]) =>
  z
    .string(params)
    .trim()
    .refine((value) => !hasNulCharacter(value), nulCharacterMessage)

/**
 * For a partial update: refuses one that changes nothing, instead of letting it reach the
 * database as an empty UPDATE.
 */
export function somethingToChange<T extends Record<string, unknown>>(
  message = 'Nothing to change: send at least one field.',
) {
  return (value: T, ctx: z.RefinementCtx) => {
    if (!Object.values(value).some((field) => field !== undefined))
      ctx.addIssue({ code: 'custom', path: [], message })
  }
}
