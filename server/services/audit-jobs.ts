import { randomUUID } from 'node:crypto'
import type { Logger } from 'pino'
import type { AuditJob, AuditRun } from '../../shared/schemas/audits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { notFound } from '../http/errors.ts'
import { checkRun, runAndStore, runDate } from './audits.ts'

interface Job extends AuditJob {
  clubId: string
  finishedAt?: number
}

/**
 * Audits run in the background of the server process; the client polls a job for its progress.
 * Finished jobs are forgotten after ten minutes: the audit itself is stored.
 */
export class AuditJobs {
  private jobs = new Map<string, Job>()

  constructor(
    private readonly db: DbOrTx,
    private readonly logger: Logger,
  ) {}

  /**
   * Checks the run (its date, its squad) before answering, then starts it: a run that would fail
   * on its inputs is refused at once and starts no job.
   */
  async submit(access: ClubAccess, run: AuditRun): Promise<AuditJob> {
    await checkRun(this.db, access, run)
    return this.start(access, run)
  }

  /** Starts a run at once; the background job checks its squad again before reading. */
  start(access: ClubAccess, run: AuditRun): AuditJob {
    runDate(run) // refuse a bad date now, not in the background
    this.prune()
    const job: Job = {
      id: randomUUID(),
      clubId: access.clubId,
      status: 'running',
      phase: 'queued',
      done: 0,
      total: 1,
      auditId: null,
      error: null,
    }
    this.jobs.set(job.id, job)
    void runAndStore(this.db, access, run, (p) => Object.assign(job, p))
      .then((auditId) => Object.assign(job, { status: 'done', auditId, finishedAt: Date.now() }))
      .catch((err: Error) => {
        this.logger.error({ err }, 'audit failed')
        Object.assign(job, { status: 'failed', error: err.message, finishedAt: Date.now() })
      })
    return this.view(job)
  }

  get(clubId: string, id: string): AuditJob {
    const job = this.jobs.get(id)
    if (!job || job.clubId !== clubId) throw notFound('No such audit run.')
    return this.view(job)
  }

  /** Resolves when the job has finished (for tests and for the server's shutdown). */
  async settled(id: string) {
    while (this.jobs.get(id)?.status === 'running') await new Promise((r) => setTimeout(r, 20))
    return this.jobs.get(id)
  }

  private view(job: Job): AuditJob {
    const { clubId: _club, finishedAt: _finished, ...rest } = job
    return { ...rest }
  }

  private prune() {
    const old = Date.now() - 10 * 60_000
    for (const [id, job] of this.jobs)
      if (job.finishedAt && job.finishedAt < old) this.jobs.delete(id)
  }
}
