/**
 * JSON with object keys sorted at every depth: jsonb does not keep key order, so two values read
 * back from PostgreSQL are compared through this, not through JSON.stringify alone.
 */
function canon(v: unknown): unknown {
  return Array.isArray(v)
    ? v.map(canon)
    : v && typeof v === 'object'
      ? Object.fromEntries(
          Object.keys(v)
            .sort()
            .map((k) => [k, canon((v as Record<string, unknown>)[k])]),
        )
      : v;
}

export const canonicalJson = (v: unknown): string => JSON.stringify(canon(v));
