/**
 * Worker threads for solving lines (piscina), used by the job worker: a solve sends chunks of lines
 * and writes the rows in order as they come back. Sized to the machine's cores unless
 * SOLVE_THREADS says otherwise; 0 or 1 means no pool (solve in the calling thread).
 */
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { Line } from '@/db/schema';
import type { DesignBasis } from './design-basis';
import type { ResultRow } from './result-row';

export interface SolvePool {
  threads: number;
  solve(task: {
    basis: DesignBasis;
    revision: number;
    projectId: string;
    lines: Line[];
  }): Promise<ResultRow[]>;
  close(): Promise<void>;
}

/**
 * SOLVE_THREADS, else one thread per core but one when the machine has three or more cores, else
 * none: on 2 cores the pool measured slower than solving in the worker's own thread (bench:engine,
 * 0.4–0.5× — the rows are copied back between threads and PostgreSQL needs the other core).
 */
export function solveThreads(): number {
  const env = process.env.SOLVE_THREADS;
  if (env !== undefined && env !== '') return Math.max(0, Math.floor(Number(env)) || 0);
  const cores = availableParallelism();
  return cores >= 3 ? cores - 1 : 1;
}

/** A pool of `threads` worker threads, or null when one thread (or none) is asked for. */
export function createSolvePool(threads = solveThreads()): SolvePool | null {
  if (threads < 2) return null;
  const piscina = new Piscina({
    filename: fileURLToPath(new URL('./solve-pool-thread.ts', import.meta.url)),
    minThreads: threads,
    maxThreads: threads,
    // The threads run our TypeScript through tsx's loader, as `npm run worker` does.
    execArgv: ['--import', 'tsx'],
    idleTimeout: 60_000,
  });
  return {
    threads,
    solve: (task) => piscina.run(task),
    close: () => piscina.destroy(),
  };
}
