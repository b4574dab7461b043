import { afterAll, describe, expect, it, vi } from 'vitest';
import { sql } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { auditLog } from '@/db/schema';
import { describeError, logUnexpected } from '@/lib/log';

afterAll(async () => {
  await getPool().end();
});

describe('unexpected errors are logged without request data', () => {
  it('a failing insert logs its PostgreSQL code and place, never the bound parameters or the values', async () => {
    const marker = `CONFIDENTIAL-${Date.now()}`;
    let caught: unknown;
    // NUL is refused in text by PostgreSQL (22021) — the kind of failure an uploaded file can cause.
    try {
      await db.insert(auditLog).values({
        projectId: '00000000-0000-0000-0000-000000000000',
        actorName: `${marker}\u0000`,
        action: marker.repeat(1000),
      });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeTruthy();
    // The error object itself carries the parameters (that is what once filled the log).
    expect(String((caught as Error).message)).toContain(marker);
    const spy = vi.spyOn(console, 'error').mockImplementation(() => {});
    logUnexpected('upload', caught);
    const line = spy.mock.calls.map((c) => c.join(' ')).join('\n');
    spy.mockRestore();
    expect(line).toMatch(/^\[upload\] unexpected error: /);
    expect(line).toMatch(/code=22021/);
    expect(line).not.toContain(marker);
    expect(line.length).toBeLessThan(1200);
  });

  it('keeps a short message for programming errors and the database constraint by name', async () => {
    expect(describeError(new TypeError("Cannot read properties of undefined (reading 'x')"))).toContain(
      'Cannot read properties of undefined',
    );
    let caught: unknown;
    try {
      await db.execute(
        sql`insert into users (id, email, name) values ('dup-log-1', 'dup-log@example.com', 'A'), ('dup-log-2', 'DUP-LOG@example.com', 'B')`,
      );
    } catch (e) {
      caught = e;
    }
    const d = describeError(caught);
    expect(d).toMatch(/code=23505/);
    expect(d).toMatch(/constraint=users_email_key/);
    expect(d).not.toContain('dup-log@example.com');
  });
});
