import { computed, onBeforeUnmount, ref, watch, type ComputedRef } from 'vue'
import { progressEventInputSchema, type ProgressEventInput } from '@shared/schemas/progress'
import type { EventCheck } from '@/api/progress'
import { useProgressStore } from '@/stores/progress'

/**
 * The checks of the entry on the log form, asked of the server a moment after the coach stops
 * changing it (the same checks the save runs), with the answer kept only while it is current.
 */
export function useEntryChecks(options: {
  clubId: () => string
  athleteId: () => string
  input: ComputedRef<ProgressEventInput>
  /** False while there is no record to check against. */
  ready: () => boolean
  delayMs: () => number
  /** A field error from the server's answer; true when it was shown beside a field. */
  onFieldError: (err: unknown) => boolean
  onAnswer: (answer: EventCheck) => void
}) {
  const progress = useProgressStore()
  const preview = ref<EventCheck | null>(null)
  const previewKey = ref<string | null>(null)
  const checking = ref(false)
  const checkError = ref<string | null>(null)
  let serial = 0
  let timer: ReturnType<typeof setTimeout> | undefined

  // What the checks depend on; the note and the planned step do not change them.
  const checkKey = computed(() => {
    const { note: _note, plannedStepIndex: _planned, ...rest } = options.input.value
    return JSON.stringify(rest)
  })
  const checksCurrent = computed(() => previewKey.value === checkKey.value)

  function forget() {
    preview.value = null
    previewKey.value = null
    checkError.value = null
  }

  /** Asks the server for the checks of the entry as it stands; true when they are current. */
  async function runCheck(): Promise<boolean> {
    if (!options.ready()) return false
    const parsed = progressEventInputSchema.safeParse(options.input.value)
    if (!parsed.success) {
      preview.value = null
      previewKey.value = null
      return false
    }
    const key = checkKey.value
    const mine = ++serial
    checking.value = true
    checkError.value = null
    try {
      const answer = await progress.check(options.clubId(), options.athleteId(), parsed.data)
      if (mine !== serial) return false
      preview.value = answer
      previewKey.value = key
      options.onAnswer(answer)
      return true
    } catch (err) {
      if (mine !== serial) return false
      if (!options.onFieldError(err))
        checkError.value = err instanceof Error ? err.message : String(err)
      return false
    } finally {
      if (mine === serial) checking.value = false
    }
  }

  function scheduleCheck() {
    clearTimeout(timer)
    if (!options.ready()) return
    timer = setTimeout(() => void runCheck(), options.delayMs())
  }
  /** Checks now, not after the pause (before a save). */
  async function checkNow() {
    clearTimeout(timer)
    return runCheck()
  }
  watch(checkKey, scheduleCheck)
  onBeforeUnmount(() => clearTimeout(timer))

  return {
    preview,
    previewKey,
    checking,
    checkError,
    checksCurrent,
    forget,
    runCheck,
    checkNow,
    scheduleCheck,
  }
}
