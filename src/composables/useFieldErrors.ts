import { reactive } from 'vue'
import type { ZodError } from 'zod'
import { ApiError } from '@/api/http'

/**
 * Field messages for a form: from the shared zod schema before submit, from the server's
 * `issues` after. Returns the message for a form-item's `feedback` and whether it is in error.
 */
export function useFieldErrors<F extends string>() {
  const errors = reactive<Partial<Record<F, string>>>({}) as Partial<Record<F, string>>

  function clear() {
    for (const key of Object.keys(errors)) delete errors[key as F]
  }

  function fromZod(error: ZodError) {
    clear()
    for (const issue of error.issues) {
      const key = String(issue.path[0] ?? '') as F
      errors[key] ??= issue.message
    }
  }

  /** Puts the server's field issues on the fields; true when any matched a field. */
  function fromApi(error: unknown): boolean {
    clear()
    if (!(error instanceof ApiError)) return false
    for (const issue of error.issues) {
      const key = issue.path.split('.')[0] as F
      errors[key] ??= issue.message
    }
    return error.issues.length > 0
  }

  const status = (field: F) => (errors[field] ? 'error' : undefined)

  return { errors, clear, fromZod, fromApi, status }
}
