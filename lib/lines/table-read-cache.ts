/**
 * What the line table reads of a project — the filtered lines' ids in order, and the parsed design
 * basis — kept in this process, so paging and re-sorting a big project does not join and sort
 * every line on each request. Server only.
 *
 * Correctness rests on PostgreSQL telling us what changed, not on writers remembering to:
 * - statement-level triggers on `lines`, `line_results`, `line_designs` and `design_bases`
 *   (migration line_table_read_notify) send `NOTIFY line_table_changed` with the project ids a
 *   statement touched ("*" for a truncate or a very long list). A notification is sent at commit.
 * - One LISTEN connection per process. While it is not connected, nothing is read from or stored in
 *   the cache (every request reads PostgreSQL, as without it), and everything kept is dropped when
 *   it goes down, since notifications may have been missed.
 * - Before a request uses the cache, one round trip on that connection (`select 1`, shared by the
 *   requests waiting at the same time): PostgreSQL sends a listener the notifications of every
 *   commit that came before a command it reads, so a write committed before this request started
 *   has dropped its project's entries by then — a pick, solve or import shows on the next request.
 * - A generation number per project, taken before a read: a value read while a notification for
 *   its project arrived is returned but not kept (it may predate the commit).
 * - Bounded: entries live at most TTL_MS, and their weights (ids for an order) add up to at most
 *   MAX_WEIGHT (the oldest read is dropped first).
 */
import { Client } from 'pg';
import { env } from '@/lib/env';

export const TABLE_READ_CHANNEL = 'line_table_changed';
/** The listener's `application_name` (pg_stat_activity: one per web process). */
export const TABLE_READ_LISTENER = 'lagwise line-table listener';
const TTL_MS = 10 * 60_000;
/** Measured ~72 bytes of heap per id kept (a 10,000-line project's order weighs 10,000): ~36 MB at most. */
const MAX_WEIGHT = 500_000;
const MAX_ENTRIES = 1_000;
const MAX_PROJECTS = 10_000;
const RETRY_MS = 2_000;
const SYNC_TIMEOUT_MS = 2_000;
const CONNECT_WAIT_MS = 1_000;

interface Entry {
  projectId: string;
  value: unknown;
  weight: number;
  at: number;
}

interface State {
  entries: Map<string, Entry>;
  /** Values being read now, by key, with the generation and epoch they began at. */
  reading: Map<string, { value: Promise<unknown>; generation: number; epoch: number }>;
  weight: number;
  generations: Map<string, number>;
  /** Bumped whenever every entry is dropped (connection up or down, "*"): a read begun before is not kept. */
  epoch: number;
  client: Client | null;
  /** The connection being opened, not yet listening. */
  connecting: Client | null;
  opened: Promise<void>;
  retryAt: number;
  queuedSync: Promise<void> | null;
  runningSync: Promise<void> | null;
}

// On globalThis, like the database pool: Next's dev reloads must not open a second listener.
const g = globalThis as unknown as { __lagwiseTableReads?: State };
function state(): State {
  g.__lagwiseTableReads ??= {
    entries: new Map(),
    reading: new Map(),
    weight: 0,
    generations: new Map(),
    epoch: 0,
    client: null,
    connecting: null,
    opened: Promise.resolve(),
    retryAt: 0,
    queuedSync: null,
    runningSync: null,
  };
  return g.__lagwiseTableReads;
}

const enabled = () => process.env.LAGWISE_TABLE_READ_CACHE !== 'off';

/** A request's view of the cache, after its sync: every commit before the request is accounted for. */
export interface TableReads {
  /**
   * The value for (project, key) from the cache, or read by `read` and kept (`weight`: its share of
   * the bound, 1 unless given). Shared between requests: never change what it returns.
   */
  get<T>(projectId: string, key: string, read: () => Promise<T>, weight?: (v: T) => number): Promise<T>;
  /**
   * Values by id within (project, key): those not kept are read in one call of `read` (which answers
   * what it found, by id) and kept, each weighing `weight`. The answer holds what was found.
   */
  many<V>(
    projectId: string,
    key: string,
    ids: readonly string[],
    read: (missing: readonly string[]) => Promise<Map<string, V>>,
    weight: number,
  ): Promise<ReadonlyMap<string, V>>;
}

/**
 * The cache for one request, or null when it cannot be trusted now (switched off with
 * LAGWISE_TABLE_READ_CACHE=off, or the LISTEN connection is not up): the caller then reads
 * PostgreSQL directly. Call it once per request, when the request starts.
 */
export async function tableReads(): Promise<TableReads | null> {
  if (!enabled()) return null;
  const s = state();
  if (!s.client) {
    // The first request of a process waits for the connection a moment rather than sort alone.
    await connect(s);
    if (!s.client) return null;
  }
  try {
    await sync(s);
  } catch {
    return null;
  }
  if (!s.client) return null;
  return {
    get: (projectId, key, read, weight) => cached(s, projectId, key, read, weight),
    many: (projectId, key, ids, read, weight) => cachedMany(s, projectId, key, ids, read, weight),
  };
}

async function cachedMany<V>(
  s: State,
  projectId: string,
  key: string,
  ids: readonly string[],
  read: (missing: readonly string[]) => Promise<Map<string, V>>,
  weight: number,
): Promise<ReadonlyMap<string, V>> {
  const k = `${projectId}\u0000${key}`;
  let e = s.entries.get(k);
  if (e && Date.now() - e.at >= TTL_MS) {
    drop(s, k);
    e = undefined;
  }
  if (e) {
    s.entries.delete(k);
    s.entries.set(k, e);
  } else {
    e = { projectId, value: new Map<string, V>(), weight: 0, at: Date.now() };
    s.entries.set(k, e);
  }
  const kept = e.value as Map<string, V>;
  const missing = ids.filter((id) => !kept.has(id));
  if (!missing.length) return kept;
  const generation = s.generations.get(projectId) ?? 0;
  const epoch = s.epoch;
  const got = await read(missing);
  // Kept only when nothing of the project changed while reading and the entry is still the one held.
  if (
    s.client &&
    s.epoch === epoch &&
    (s.generations.get(projectId) ?? 0) === generation &&
    s.entries.get(k) === e
  ) {
    for (const [id, v] of got) kept.set(id, v);
    e.weight += got.size * weight;
    s.weight += got.size * weight;
    if (e.weight > MAX_WEIGHT) drop(s, k);
    else
      while (s.weight > MAX_WEIGHT) {
        const oldest = s.entries.keys().next().value!;
        if (oldest === k) break;
        drop(s, oldest);
      }
    return kept;
  }
  const answer = new Map(got);
  for (const id of ids) if (!answer.has(id) && kept.has(id)) answer.set(id, kept.get(id)!);
  return answer;
}

async function cached<T>(
  s: State,
  projectId: string,
  key: string,
  read: () => Promise<T>,
  weight: (v: T) => number = () => 1,
): Promise<T> {
  const k = `${projectId}\u0000${key}`;
  const hit = s.entries.get(k);
  if (hit && Date.now() - hit.at < TTL_MS) {
    // Most recently read last, so the bound drops the oldest read first.
    s.entries.delete(k);
    s.entries.set(k, hit);
    return hit.value as T;
  }
  if (hit) drop(s, k);
  const generation = s.generations.get(projectId) ?? 0;
  const epoch = s.epoch;
  // Requests that miss the same key together share one read, if nothing changed since it began.
  const shared = s.reading.get(k);
  if (shared && shared.generation === generation && shared.epoch === epoch) return shared.value as Promise<T>;
  const value = read();
  s.reading.set(k, { value, generation, epoch });
  try {
    const v = await value;
    if (s.client && s.epoch === epoch && (s.generations.get(projectId) ?? 0) === generation)
      keep(s, k, projectId, v, weight(v));
    return v;
  } finally {
    if (s.reading.get(k)?.value === value) s.reading.delete(k);
  }
}

/** What the cache holds now (tests and diagnostics). */
export function tableReadCacheStats() {
  const s = state();
  return { listening: s.client !== null, entries: s.entries.size, weight: s.weight };
}

/** Closes the LISTEN connection and drops everything (tests; a process that exits needs nothing). */
export async function stopTableReadCache() {
  const s = state();
  const c = s.client;
  const opening = s.connecting;
  s.client = null;
  s.connecting = null;
  dropAll(s);
  await Promise.all([c, opening].map((x) => x?.end().catch(() => {})));
  s.retryAt = 0;
}

function keep(s: State, k: string, projectId: string, value: unknown, weight: number) {
  if (weight > MAX_WEIGHT) return;
  if (s.entries.has(k)) drop(s, k);
  while (s.entries.size && (s.weight + weight > MAX_WEIGHT || s.entries.size >= MAX_ENTRIES))
    drop(s, s.entries.keys().next().value!);
  s.entries.set(k, { projectId, value, weight, at: Date.now() });
  s.weight += weight;
}

function drop(s: State, k: string) {
  const e = s.entries.get(k);
  if (!e) return;
  s.entries.delete(k);
  s.weight -= e.weight;
}

function dropAll(s: State) {
  s.entries.clear();
  s.weight = 0;
  s.generations.clear();
  s.epoch++;
}

function changed(s: State, payload: string | undefined) {
  if (!payload || payload === '*') return dropAll(s);
  if (s.generations.size > MAX_PROJECTS) return dropAll(s);
  const projects = new Set(payload.split(','));
  for (const p of projects) s.generations.set(p, (s.generations.get(p) ?? 0) + 1);
  for (const [k, e] of s.entries) if (projects.has(e.projectId)) drop(s, k);
}

/**
 * Opens the LISTEN connection; the promise settles when it listens, fails, or after CONNECT_WAIT_MS
 * (requests meanwhile read PostgreSQL directly).
 */
function connect(s: State): Promise<void> {
  if (Date.now() < s.retryAt) return Promise.resolve();
  if (s.connecting) return s.opened;
  const c = new Client({ connectionString: env.databaseUrl(), application_name: TABLE_READ_LISTENER });
  s.connecting = c;
  const down = () => {
    if (s.client === c) {
      s.client = null;
      dropAll(s);
    }
    if (s.connecting === c) s.connecting = null;
    if (!s.client && !s.connecting) s.retryAt = Date.now() + RETRY_MS;
    c.end().catch(() => {});
  };
  c.on('error', down);
  c.on('end', down);
  c.on('notification', (m) => {
    if (m.channel === TABLE_READ_CHANNEL) changed(s, m.payload);
  });
  const listening = c
    .connect()
    .then(() => c.query(`LISTEN ${TABLE_READ_CHANNEL}`))
    .then(() => {
      // The listener alone must not keep a script (a benchmark, a CLI) from exiting (see `sync`).
      socketOf(c)?.unref?.();
      if (s.connecting !== c) return void c.end().catch(() => {});
      dropAll(s);
      s.client = c;
      s.connecting = null;
    })
    .catch(down);
  s.opened = Promise.race([listening, new Promise<void>((r) => setTimeout(r, CONNECT_WAIT_MS).unref())]);
  return s.opened;
}

/**
 * One round trip on the LISTEN connection that starts after the caller arrived; callers that arrive
 * before it starts share it. Fails (and takes the connection down) when the answer is late.
 */
function sync(s: State): Promise<void> {
  if (s.queuedSync) return s.queuedSync;
  const before = s.runningSync ?? Promise.resolve();
  const queued: Promise<void> = before
    .catch(() => {})
    .then(() => {
      if (s.queuedSync === queued) s.queuedSync = null;
      const c = s.client;
      if (!c) throw new Error('not listening');
      let timer: NodeJS.Timeout | undefined;
      // While a request waits on it, the connection keeps the process alive like any query.
      socketOf(c)?.ref?.();
      const running = Promise.race([
        c.query('select 1').then(() => undefined),
        new Promise<never>((_, reject) => {
          timer = setTimeout(() => {
            c.emit('error', new Error('the listener did not answer'));
            reject(new Error('the listener did not answer'));
          }, SYNC_TIMEOUT_MS);
          timer.unref();
        }),
      ]).finally(() => {
        clearTimeout(timer);
        socketOf(c)?.unref?.();
        if (s.runningSync === running) s.runningSync = null;
      });
      s.runningSync = running;
      return running;
    });
  s.queuedSync = queued;
  return queued;
}

/** The listener's socket (pg keeps it on the connection; not part of its typed API). */
function socketOf(c: Client) {
  return (c as unknown as { connection?: { stream?: { ref?: () => void; unref?: () => void } } }).connection
    ?.stream;
}
