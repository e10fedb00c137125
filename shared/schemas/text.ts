import { z } from 'zod'

/** Said of any text holding U+0000, which PostgreSQL cannot store in a text column. */
export const nulCharacterMessage =
  'This text holds a hidden NUL character (U+0000), which cannot be saved. Retype it.'

export const hasNulCharacter = (value: string) => value.includes('\u0000')

/**
 * Said of any text holding half of a UTF-16 surrogate pair on its own, which no character
 * encodes: saved as UTF-8 it would silently become U+FFFD, so the text kept would not be the
 * text sent.
 */
export const brokenCharacterMessage =
  'This text holds a broken character (half of a UTF-16 surrogate pair), which cannot be saved as sent. Retype it.'

const loneSurrogate = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/

export const hasBrokenCharacter = (value: string) => loneSurrogate.test(value)

/** `value` with each broken character shown as U+FFFD, to name it in a message. */
export const withBrokenCharactersShown = (value: string) =>
  value.replace(new RegExp(loneSurrogate.source, 'g'), '\uFFFD')

/** Why `value` cannot be stored as text, or null when it can. */
export const unstorableText = (value: string): string | null =>
  hasNulCharacter(value)
    ? nulCharacterMessage
    : hasBrokenCharacter(value)
      ? brokenCharacterMessage
      : null

/**
 * Text a person types (a name, a note, a criterion): trimmed, and refusing the NUL character and
 * broken characters, so the form shows the same error the server would answer. Chain
 * `.min()`/`.max()` after it.
 */
export const text = (params?: Parameters<typeof z.string>[0]) =>
  z
    .string(params)
    .trim()
    .superRefine((value, ctx) => {
      const problem = unstorableText(value)
      if (problem) ctx.addIssue({ code: 'custom', message: problem })
    })

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
