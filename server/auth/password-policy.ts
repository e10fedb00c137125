import { ZxcvbnFactory } from '@zxcvbn-ts/core'
import * as common from '@zxcvbn-ts/language-common'
import * as english from '@zxcvbn-ts/language-en'
import { passwordMaxLength, passwordMinLength } from '../../shared/schemas/auth.ts'

const zxcvbn = new ZxcvbnFactory({
  translations: english.translations,
  graphs: common.adjacencyGraphs,
  dictionary: { ...common.dictionary, ...english.dictionary },
})

/** zxcvbn's score 3: "safely unguessable: moderate protection from offline slow-hash attacks". */
const minimumScore = 3

/**
 * Why a new password is refused, or null when it is acceptable. Length limits as in NIST SP
 * 800-63B (at least 8, long ones allowed, no composition rules); strength by zxcvbn, which also
 * penalises the person's own name and e-mail.
 */
export async function passwordProblem(
  password: string,
  personal: string[] = [],
): Promise<string | null> {
  if (password.length < passwordMinLength) return `Use at least ${passwordMinLength} characters.`
  if (password.length > passwordMaxLength) return `Use at most ${passwordMaxLength} characters.`
  const result = await zxcvbn.checkAsync(
    password,
    personal.flatMap((p) => p.split(/[@.\s]+/)).filter(Boolean),
  )
  if (result.score >= minimumScore) return null
  const hints = [result.feedback.warning, ...result.feedback.suggestions].filter(Boolean)
  return `This password is too easy to guess.${hints.length ? ` ${hints.join(' ')}` : ''} A few unrelated words make a strong one.`
}
