/**
 * Logging of unexpected errors without user data.
 *
 * Database errors carry the failed query's bound parameters (a whole uploaded workbook once went
 * to the log, 419 MB for one request) and their messages quote input values, so neither is
 * logged: we log where it happened, the error's class, PostgreSQL's code/constraint/table, and a
 * few stack frames. Programming errors (TypeError and the like) keep a short message, since it
 * names code rather than data.
 */
const CODE_ERRORS = new Set(['TypeError', 'ReferenceError', 'RangeError', 'SyntaxError']);
const MAX_MESSAGE = 160;

type ErrorLike = {
  name?: string;
  code?: unknown;
  constraint?: unknown;
  table?: unknown;
  column?: unknown;
  routine?: unknown;
  stack?: string;
  message?: string;
  cause?: unknown;
  digest?: unknown;
};

export function describeError(e: unknown): string {
  const parts: string[] = [];
  let cur: unknown = e;
  for (let depth = 0; cur && typeof cur === 'object' && depth < 4; depth++) {
    const x = cur as ErrorLike;
    const bits = [String(x.name ?? (cur as object).constructor?.name ?? 'Error')];
    for (const k of ['code', 'constraint', 'table', 'column', 'routine', 'digest'] as const) {
      const v = x[k];
      if (typeof v === 'string' || typeof v === 'number') bits.push(`${k}=${String(v).slice(0, 64)}`);
    }
    if (CODE_ERRORS.has(String(x.name)) && typeof x.message === 'string')
      bits.push(JSON.stringify(x.message.slice(0, MAX_MESSAGE)));
    if (depth === 0 && typeof x.stack === 'string') {
      const frames = x.stack
        .split('\n')
        .filter((l) => /^\s+at /.test(l))
        .slice(0, 3)
        .map((l) => l.trim().slice(0, 200));
      if (frames.length) bits.push(`[${frames.join(' | ')}]`);
    }
    parts.push(bits.join(' '));
    cur = x.cause;
  }
  if (parts.length === 0) parts.push(typeof e);
  return parts.join(' <- ');
}

/** One line per unexpected error: context, class, database code — never parameters or input. */
export function logUnexpected(context: string, e: unknown) {
  console.error(`[${context}] unexpected error: ${describeError(e)}`);
}
