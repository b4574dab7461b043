import { afterAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { db, getPool } from '@/db/client';

afterAll(async () => {
  await getPool().end();
});

/** Runs a statement as the application's role and returns the PostgreSQL error code (or 'ok'). */
async function codeOf(statement: ReturnType<typeof sql>): Promise<string> {
  try {
    await db.execute(statement);
    return 'ok';
  } catch (e) {
    const err = e as { code?: string; cause?: { code?: string } };
    return String(err.cause?.code ?? err.code ?? 'unknown');
  }
}

async function fixture() {
  const userId = `priv-${randomUUID().slice(0, 8)}`;
  await db.execute(
    sql`insert into users (id, email, name) values (${userId}, ${`${userId}@example.com`}, 'Priv Tester')`,
  );
  const {
    rows: [org],
  } = await db.execute<{ id: string }>(
    sql`insert into organizations (name) values ('Priv Org') returning id`,
  );
  const {
    rows: [project],
  } = await db.execute<{ id: string }>(
    sql`insert into projects (organization_id, code, name) values (${org.id}, ${`P-${userId}`}, 'Priv project') returning id`,
  );
  return { userId, projectId: project.id };
}

describe('the application database role cannot rewrite signed or append-only records', () => {
  it('connects as a role that owns nothing and is not a superuser', async () => {
    const {
      rows: [r],
    } = await db.execute<{ me: string; su: boolean; owned: number }>(sql`
      select current_user as me, (select rolsuper from pg_roles where rolname = current_user) as su,
             (select count(*)::int from pg_tables where schemaname = 'public' and tableowner = current_user) as owned`);
    expect(r.su).toBe(false);
    expect(r.owned).toBe(0);
  });

  it('may append to the audit trail but not alter, disable triggers on, update, delete or truncate it', async () => {
    const projectId = randomUUID();
    expect(
      await codeOf(
        sql`insert into audit_log (project_id, actor_name, action) values (${projectId}, 'Priv Tester', 'privilege check')`,
      ),
    ).toBe('ok');
    expect(await codeOf(sql`alter table audit_log disable trigger all`)).toBe('42501'); // must be owner
    expect(await codeOf(sql`alter table audit_log owner to current_user`)).toBe('42501');
    expect(await codeOf(sql`update audit_log set action = 'rewritten' where project_id = ${projectId}`)).toBe(
      '42501',
    );
    expect(await codeOf(sql`delete from audit_log where project_id = ${projectId}`)).toBe('42501');
    expect(await codeOf(sql`truncate audit_log`)).toBe('42501');
    const { rows } = await db.execute<{ action: string }>(
      sql`select action from audit_log where project_id = ${projectId}`,
    );
    expect(rows.map((r) => r.action)).toEqual(['privilege check']);
  });

  it('keeps an issued bill as issued', async () => {
    const { userId, projectId } = await fixture();
    expect(
      await codeOf(sql`insert into boq_issues (project_id, number, issued_by, basis_revision, quantities, counted, pending)
      values (${projectId}, 1, ${userId}, 1, '[]'::jsonb, 0, 0)`),
    ).toBe('ok');
    expect(await codeOf(sql`update boq_issues set counted = 99 where project_id = ${projectId}`)).toBe(
      '42501',
    );
    expect(await codeOf(sql`delete from boq_issues where project_id = ${projectId}`)).toBe('42501');
  });

  it('keeps a signed-off review round and its items as signed; an open round may change', async () => {
    const { userId, projectId } = await fixture();
    const {
      rows: [round],
    } = await db.execute<{
      id: string;
    }>(sql`insert into review_rounds (project_id, number, requested_by, calc_version, basis_revision)
      values (${projectId}, 1, ${userId}, 'test', 1) returning id`);
    await db.execute(sql`insert into review_items (round_id, project_id, tag, area, flags, line_input_version, design_version, disposition)
      values (${round.id}, ${projectId}, 'PV-1', 'A', '[]'::jsonb, 1, 1, 'guard')`);
    expect(
      await codeOf(sql`update review_items set comment = 'while open' where round_id = ${round.id}`),
    ).toBe('ok');
    expect(
      await codeOf(
        sql`update review_rounds set status = 'signed-off', signed_off_by = ${userId}, signed_off_at = now() where id = ${round.id}`,
      ),
    ).toBe('ok');
    expect(
      await codeOf(sql`update review_rounds set note = 'edited after sign-off' where id = ${round.id}`),
    ).toBe('42501');
    expect(await codeOf(sql`update review_rounds set status = 'open' where id = ${round.id}`)).toBe('42501');
    expect(await codeOf(sql`delete from review_rounds where id = ${round.id}`)).toBe('42501');
    expect(
      await codeOf(sql`update review_items set disposition = 'insulate' where round_id = ${round.id}`),
    ).toBe('42501');
    expect(await codeOf(sql`delete from review_items where round_id = ${round.id}`)).toBe('42501');
    // A line leaving the list later only loses its link; the item keeps its tag and decision.
    expect(await codeOf(sql`update review_items set line_id = null where round_id = ${round.id}`)).toBe('ok');
    const {
      rows: [item],
    } = await db.execute<{ disposition: string; comment: string }>(
      sql`select disposition, comment from review_items where round_id = ${round.id}`,
    );
    expect(item).toEqual({ disposition: 'guard', comment: 'while open' });
  });
});
