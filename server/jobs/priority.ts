import { readdirSync } from 'node:fs'
import { setPriority } from 'node:os'

/**
 * Lowers the scheduling priority of this whole process to `niceness` (0 to 19, higher is
 * lower), so that web processes sharing its cores go first. Returns how many threads were
 * lowered; 0 when the system refuses (the process then runs as before).
 *
 * On Linux a niceness belongs to a thread, not to the process (setpriority(2), "BUGS": the
 * threads of a process do not share one), so `os.setPriority` lowers the main thread alone. The
 * threads Node started before it (V8's garbage collection and compiler helpers, libuv's pool,
 * which computes the audit's SHA-256) would keep running at full priority; each is lowered by
 * its thread id, read from /proc/self/task. Threads started later inherit the niceness of the
 * thread that starts them. Elsewhere the call applies to the process as a whole.
 */
export function lowerProcessPriority(niceness: number): number {
  try {
    setPriority(niceness)
  } catch {
    return 0
  }
  let threads: string[]
  try {
    threads = readdirSync('/proc/self/task')
  } catch {
    return 1
  }
  let lowered = 0
  for (const thread of threads) {
    try {
      setPriority(Number(thread), niceness)
      lowered++
    } catch {
      // A thread that ended meanwhile.
    }
  }
  return lowered
}
