import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
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

/** What became of the worker's autogroup: see `lowerAutogroupPriority`. */
export type AutogroupOutcome = 'lowered' | 'shared' | 'refused' | 'none'

/**
 * Whether this process leads a session of its own (setsid(2)): its session id, field 6 of
 * /proc/self/stat (proc(5)), is its own pid. The fields after the command name (in parentheses,
 * which may hold spaces) start at field 3.
 */
function leadsSession(): boolean {
  const stat = readFileSync('/proc/self/stat', 'utf8')
  const session = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[3])
  return session === process.pid
}

/** How long a worker keeps asking the kernel, which takes one change a tenth of a second. */
const autogroupPatienceMs = 2000

/**
 * Lowers this process's autogroup to `niceness`, when the process leads a session of its own.
 *
 * On Linux with autogroups (sched(7), "The autogroup feature"; they apply to processes in no
 * CPU control group of their own, e.g. under cgroup v1's root, as on this project's machines),
 * the CPU is shared between autogroups first, one per session, and a niceness only ranks the
 * threads inside one autogroup. A worker in the session of its web process is then lowered
 * against that process alone, not against PostgreSQL, which runs in a session of its own and
 * answers the web process's queries: its busy core counts as a full share beside the
 * database's. A worker that leads its session (started `detached`, as `npm start` and the
 * benchmarks start it, or through setsid(1), or by a service manager that gives each service
 * a session) lowers its autogroup without privilege through /proc/self/autogroup; it is the
 * first process of that session, so nothing started before it is lowered with it. Any other
 * worker ('shared') leaves the autogroup alone: it would lower the shell or the supervisor that
 * started it, and everything they start afterwards. 'refused' when the kernel kept saying no;
 * 'none' where there are no autogroups.
 */
export function lowerAutogroupPriority(niceness: number): AutogroupOutcome {
  try {
    if (readFileSync('/proc/sys/kernel/sched_autogroup_enabled', 'utf8').trim() !== '1') {
      return 'none'
    }
    if (!leadsSession()) return 'shared'
  } catch {
    return 'none'
  }
  const until = Date.now() + autogroupPatienceMs
  for (;;) {
    try {
      writeFileSync('/proc/self/autogroup', String(niceness))
      return 'lowered'
    } catch (err) {
      // The kernel takes one such change a tenth of a second from unprivileged processes, across
      // the system (EAGAIN): workers starting together wait their turn, at staggered times.
      if ((err as NodeJS.ErrnoException).code !== 'EAGAIN' || Date.now() > until) return 'refused'
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 60 + Math.random() * 90)
    }
  }
}
