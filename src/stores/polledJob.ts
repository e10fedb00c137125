import { computed, ref } from 'vue'

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/** What a job made by a worker and polled by the page reports. */
interface PolledJob {
  id: string
  status: string
}

/**
 * The state of one job asked for on a page and polled until it is finished, for a setup store
 * to return. Each start takes a new ticket; a poll loop whose ticket is no longer current stops,
 * so leaving the page (or starting again) never leaves a loop polling in the background.
 */
export function polledJob<Job extends PolledJob>() {
  const job = ref<Job | null>(null)
  const running = computed(() => job.value?.status === 'running')
  let ticket = 0

  /**
   * Starts the job and polls it until it is no longer running, keeping `job` current for the
   * progress shown. Resolves with the finished job, or null when polling was stopped first. Lets
   * the ApiError through, of the start or of a poll.
   */
  async function run(
    ask: () => Promise<Job>,
    poll: (id: string) => Promise<Job>,
    intervalMs: number,
  ) {
    const mine = ++ticket
    job.value = null
    let current = await ask()
    if (mine !== ticket) return null
    job.value = current
    while (current.status === 'running') {
      await sleep(intervalMs)
      if (mine !== ticket) return null
      current = await poll(current.id)
      if (mine !== ticket) return null
      job.value = current
    }
    return current
  }

  /** Stops polling and forgets the job; the worker carries on with it all the same. */
  function stopPolling() {
    ticket++
    job.value = null
  }

  return { job, running, run, stopPolling }
}
