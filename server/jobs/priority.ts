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
export type AutogroupOutcome = 'lowered' | 'shared' | 'none'

/** A process's parent and session, from /proc/<pid>/stat; undefined once it has ended. */
function processOf(pid: string): { parent: number; session: number } | undefined {
  let stat: string
  try {
    stat = readFileSync(`/proc/${pid}/stat`, 'utf8')
  } catch {
    return undefined
  }
  // proc(5): the fields after the command name (in parentheses, which may hold spaces) start
  // at field 3 (state); the parent is field 4, the session field 6.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ')
  return { parent: Number(fields[1]), session: Number(fields[3]) }
}

/**
 * Whether every other process of this process's session is one of its ancestors or its
 * descendants: the session is then this process's own, with at most the commands that started
 * it (`setsid npm run worker`: setsid, npm and a shell, each waiting on the next) and the
 * processes it started itself (the TypeScript loader's compiler, in development).
 */
function ownsSession(): boolean {
  const table = new Map<number, { parent: number; session: number }>()
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue
    const found = processOf(entry)
    if (found) table.set(Number(entry), found)
  }
  const lineage = (pid: number) => {
    const chain = new Set<number>()
    for (let at = table.get(pid)?.parent ?? 0; at > 0 && !chain.has(at);) {
      chain.add(at)
      at = table.get(at)?.parent ?? 0
    }
    return chain
  }
  const self = table.get(process.pid)
  if (!self) return false
  const ancestors = lineage(process.pid)
  for (const [pid, { session }] of table) {
    if (session !== self.session || pid === process.pid || ancestors.has(pid)) continue
    if (!lineage(pid).has(process.pid)) return false
  }
  return true
}

/**
 * Lowers this process's autogroup to `niceness`, when the process has one of its own.
 *
 * On Linux with autogroups (sched(7), "The autogroup feature"; on by default in many kernels,
 * for processes outside any CPU control group), the CPU is shared between autogroups first,
 * one per session, and a niceness only ranks the threads inside one autogroup. A worker in the
 * session of its web process is then lowered against that process alone, not against
 * PostgreSQL, which runs in a session of its own and answers the web process's queries: its
 * busy core counts as a full share beside the database's. A worker in a session of its own (as
 * `npm start` and the benchmarks start it, or under `setsid`) may lower its autogroup without
 * privilege through /proc/self/autogroup. A worker whose session holds other processes
 * ('shared') leaves it alone, or it would lower them too. 'none' where there are no autogroups
 * or the system refuses.
 */
export function lowerAutogroupPriority(niceness: number): AutogroupOutcome {
  try {
    if (readFileSync('/proc/sys/kernel/sched_autogroup_enabled', 'utf8').trim() !== '1') {
      return 'none'
    }
    if (!ownsSession()) return 'shared'
  } catch {
    return 'none'
  }
  for (let attempt = 0; ; attempt++) {
    try {
      writeFileSync('/proc/self/autogroup', String(niceness))
      return 'lowered'
    } catch (err) {
      // The kernel takes one such change a tenth of a second from unprivileged processes, across
      // the system (EAGAIN): two workers starting together wait their turn. Anything else, or a
      // third refusal, leaves the autogroup as it was.
      if ((err as NodeJS.ErrnoException).code !== 'EAGAIN' || attempt === 2) return 'none'
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 110)
    }
  }
}
