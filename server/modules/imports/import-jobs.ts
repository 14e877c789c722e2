/**
 * Imports in flight, by their client-generated id. Progress lives here while a job runs; once committed the
 * batch row in PostgreSQL is the record, so a restart loses only the progress of jobs that never committed
 * (and those wrote nothing: the write is one transaction).
 */
import type { ImportCounts, ImportDto, ImportProgress, ImportStatus, RowError } from '../../../shared/schemas/imports.js';

export interface ImportJob {
  id: string;
  companyId: string;
  userId: string;
  userName: string;
  fileName: string;
  status: ImportStatus;
  createdAt: Date;
  progress: ImportProgress;
  counts: ImportCounts | null;
  errors: RowError[];
  failure: ImportDto['failure'];
  created: { builders: string[]; communities: string[] };
  finishedAt: number | null;
}

/** Finished jobs stay this long for the client's last poll; the batch row answers after that. */
const KEEP_FINISHED_MS = 30 * 60 * 1000;

export class ImportJobs {
  private readonly jobs = new Map<string, ImportJob>();

  get(id: string): ImportJob | undefined {
    this.sweep();
    return this.jobs.get(id);
  }

  add(job: ImportJob) {
    this.jobs.set(job.id, job);
  }

  remove(id: string) {
    this.jobs.delete(id);
  }

  /** Jobs of a company that have not reached the database yet (still running, or failed). */
  pending(companyId: string): ImportJob[] {
    this.sweep();
    return [...this.jobs.values()].filter((j) => j.companyId === companyId && j.status !== 'committed' && j.status !== 'undone');
  }

  finish(job: ImportJob, status: 'committed' | 'failed') {
    job.status = status;
    job.finishedAt = Date.now();
  }

  private sweep() {
    const now = Date.now();
    for (const [id, job] of this.jobs) if (job.finishedAt !== null && now - job.finishedAt > KEEP_FINISHED_MS) this.jobs.delete(id);
  }
}
