/**
 * Demo seed. `npm run seed` always runs (idempotent: existing demo users and projects are kept);
 * `--if-empty` (used by npm start) does nothing when any user exists.
 */
import { drizzle } from 'drizzle-orm/node-postgres';
import { and, count, eq, sql } from 'drizzle-orm';
import { Pool } from 'pg';
import { generateIdFromEntropySize } from 'lucia';
import * as schema from '../db/schema';
import { env } from '../lib/env';
import { hashPassword } from '../lib/auth/password';
import { DEMO_ORG, DEMO_PROJECT, DEMO_USERS, OTHER_ORG } from './demo-data';
import { demoLineRows, lineListWorkbook } from './line-list';
import { acceptRecommendations } from '../lib/lines/bulk-accept';
import { commitDraft, createDraft } from '../lib/lines/import-store';
import { pickDesign } from '../lib/lines/picks-store';
import { listAreas, listLines, solveProject } from '../lib/lines/results-store';
import { getPickerOptions } from '../lib/lines/picker';
import * as reviewStore from '../lib/review/store';
import * as boqStore from '../lib/boq/store';
import * as budgetStore from '../lib/budget/store';
import { saveSsoConfig } from '../lib/auth/sso';
import { getPool } from '../db/client';

const { users, organizations, memberships, projects } = schema;

// The seed's own actions (review requests, sign-offs) would e-mail demo addresses: build, do not send.
process.env.MAIL_DISABLED = '1';

async function main() {
  const pool = new Pool({ connectionString: env.databaseUrl(), max: 2 });
  const db = drizzle(pool, { schema });
  try {
    if (process.argv.includes('--if-empty')) {
      const [{ n }] = await db.select({ n: count() }).from(users);
      if (n > 0) {
        console.error('[seed] database has users; demo seed skipped');
        return;
      }
    }
    await db.transaction(async (tx) => {
      async function ensureOrg(name: string) {
        const [o] = await tx.select().from(organizations).where(eq(organizations.name, name));
        return o ?? (await tx.insert(organizations).values({ name }).returning())[0];
      }
      async function ensureUser(u: { name: string; email: string; password: string }) {
        const [x] = await tx.select().from(users).where(sql`lower(${users.email}) = ${u.email}`);
        if (x) return x;
        return (
          await tx
            .insert(users)
            .values({
              id: generateIdFromEntropySize(10),
              email: u.email,
              name: u.name,
              passwordHash: await hashPassword(u.password),
            })
            .returning()
        )[0];
      }
      async function ensureMember(organizationId: string, userId: string, role: schema.Role) {
        await tx.insert(memberships).values({ organizationId, userId, role }).onConflictDoNothing();
      }
      async function ensureProject(organizationId: string, p: { code: string; name: string; site: string }) {
        const [x] = await tx
          .select()
          .from(projects)
          .where(and(eq(projects.organizationId, organizationId), eq(projects.code, p.code)));
        return (
          x ??
          (
            await tx
              .insert(projects)
              .values({ organizationId, ...p })
              .returning()
          )[0]
        );
      }
      const org = await ensureOrg(DEMO_ORG.name);
      for (const u of DEMO_USERS) await ensureMember(org.id, (await ensureUser(u)).id, u.role);
      await ensureProject(org.id, DEMO_PROJECT);
      const other = await ensureOrg(OTHER_ORG.name);
      await ensureMember(other.id, (await ensureUser(OTHER_ORG.user)).id, 'owner');
      await ensureProject(other.id, OTHER_ORG.project);
    });
    console.error('[seed] demo organization, project and users in place');
    await seedCompanySignIn(db);
    await seedLineList(db);
  } finally {
    await pool.end();
    await getPool().end();
  }
}

/** The demo line list goes in through the same import path a user takes, then is solved and partly decided. */
async function seedLineList(db: ReturnType<typeof drizzle<typeof schema>>) {
  const [project] = await db.select().from(projects).where(eq(projects.code, DEMO_PROJECT.code));
  const [{ n }] = await db
    .select({ n: count() })
    .from(schema.lines)
    .where(eq(schema.lines.projectId, project.id));
  if (n > 0) {
    console.error('[seed] demo line list already imported');
    return;
  }
  const [engineer] = await db.select().from(users).where(eq(users.email, DEMO_USERS[1].email));
  const bytes = await lineListWorkbook(demoLineRows(220), { withInstructions: true });
  const draft = await createDraft({
    projectId: project.id,
    userId: engineer.id,
    fileName: 'brack-point-line-list.xlsx',
    bytes,
  });
  const sheet = draft.sheets.find((s) => s.name === draft.defaultSheet)!;
  const r = await commitDraft({
    projectId: project.id,
    draftId: draft.draftId,
    sheetName: sheet.name,
    mapping: sheet.suggested,
    userId: engineer.id,
  });
  const solved = await solveProject({ projectId: project.id });
  // Most lines decided; the Tank farm area left open for the demo engineer.
  const areas = await listAreas({ projectId: project.id });
  for (const area of areas.filter((a) => !a.startsWith('U45')))
    await acceptRecommendations({ projectId: project.id, userId: engineer.id, area });
  // A few manual picks with their reasons, one of them below the personnel-protection requirement.
  const page = await listLines({
    projectId: project.id,
    page: 0,
    size: 500,
    sort: 'tag',
    dir: 'asc',
  });
  const picks = page.rows
    .filter((l) => l.recommendedMm && l.recommendedMm >= 50 && l.designVersion)
    .slice(0, 3);
  const reasons = [
    'Match the adjacent header, already lagged at this thickness',
    'Congested rack: outside diameter limited by clearance to the cable tray',
    'Spec minimum for this service class',
  ];
  for (const [i, l] of picks.entries()) {
    const cands = (await getPickerOptions({ projectId: project.id, lineId: l.id })).candidates.map(
      (c) => c.mm,
    );
    const idx = cands.indexOf(l.recommendedMm!);
    const mm = i === 1 ? cands[Math.max(1, idx - 2)] : cands[Math.min(cands.length - 1, idx + 1)];
    await pickDesign({
      projectId: project.id,
      lineId: l.id,
      userId: engineer.id,
      thicknessMm: mm,
      reason: reasons[i],
      expectedVersion: l.designVersion!,
    });
  }
  console.error(
    `[seed] demo line list: revision ${r.revision}, ${r.lineCount} lines, ${solved.solved} solved, ${picks.length} manual picks`,
  );
  await seedReview(db, project.id, engineer.id);
  await seedBudgetAndBill(db, project.id, engineer.id);
}

/** One review round signed off (tank farm) and one in progress (the rest), for the reviewer's first sign-in. */
async function seedReview(
  db: ReturnType<typeof drizzle<typeof schema>>,
  projectId: string,
  engineerId: string,
) {
  const [reviewer] = await db.select().from(users).where(eq(users.email, DEMO_USERS[2].email));
  const first = await reviewStore.requestReview({
    projectId,
    userId: engineerId,
    area: 'U45 Tank farm',
    note: 'Tank farm before the walkdown',
  });
  const r1 = await reviewStore.getRound({ projectId, roundId: first.round.id });
  const comments: Record<string, string> = {
    guard: 'Mesh guard on the platform side',
    'warning-sign': 'Hot-surface signs at both ladders',
    'not-accessible': 'Above the pipe rack, no platform',
  };
  for (const [i, item] of r1.items.entries()) {
    const d = (['not-accessible', 'guard', 'warning-sign'] as const)[i % 3];
    await reviewStore.dispose({
      projectId,
      roundId: first.round.id,
      itemIds: [item.id],
      disposition: item.flags.some((f) => f.type === 'hot-surface')
        ? d
        : item.flags.some((f) => f.type === 'sweating')
          ? 'drip-protection'
          : 'not-accessible',
      comment:
        item.flags.some((f) => f.type === 'sweating') && !item.flags.some((f) => f.type === 'hot-surface')
          ? 'Drip tray below, drains to the bund'
          : comments[d],
      userId: reviewer.id,
    });
  }
  await reviewStore.signOff({ projectId, roundId: first.round.id, userId: reviewer.id });
  const second = await reviewStore.requestReview({
    projectId,
    userId: engineerId,
    note: 'Whole site after the revision 1 picks',
  });
  const r2 = await reviewStore.getRound({ projectId, roundId: second.round.id });
  const some = r2.items.slice(0, Math.ceil(r2.items.length / 3));
  // Each hazard gets its own remedy: signs for the hot surfaces, drip trays for the sweating ones.
  const sweating = some.filter((i) => i.flags.some((f) => f.type === 'sweating'));
  const rest = some.filter((i) => !sweating.includes(i));
  if (rest.length)
    await reviewStore.dispose({
      projectId,
      roundId: second.round.id,
      itemIds: rest.map((i) => i.id),
      disposition: 'warning-sign',
      comment: 'Signs and barrier tape until the guards arrive',
      userId: reviewer.id,
    });
  if (sweating.length)
    await reviewStore.dispose({
      projectId,
      roundId: second.round.id,
      itemIds: sweating.map((i) => i.id),
      disposition: 'drip-protection',
      comment: 'Drip trays under the flanges until the lagging is redone',
      userId: reviewer.id,
    });
  console.error(
    `[seed] review: round ${first.round.number} signed off (${r1.items.length} lines), round ${second.round.number} open (${some.length} of ${r2.items.length} decided)`,
  );
}

/** A budget with the polymerisation area over its allocation, and the first issue of the bill. */
async function seedBudgetAndBill(
  db: ReturnType<typeof drizzle<typeof schema>>,
  projectId: string,
  engineerId: string,
) {
  const [owner] = await db.select().from(users).where(eq(users.email, DEMO_USERS[0].email));
  const d = await budgetStore.dashboard({ projectId });
  const allocations = d.areas.map((a) => ({
    area: a.area,
    kW: Math.round(a.designedKW * (a.area.startsWith('U30') ? 0.8 : 1.25) * 10) / 10,
  }));
  const totalKW = Math.round(allocations.reduce((s, a) => s + a.kW, 0) * 1.05);
  await budgetStore.saveBudget({
    projectId,
    userId: owner.id,
    budget: { totalKW, totalMWhPerYear: Math.round((totalKW * 8000) / 1000), allocations },
  });
  const issue = await boqStore.issueBill({ projectId, userId: engineerId });
  console.error(
    `[seed] budget ${totalKW} kW over ${allocations.length} areas; bill issue ${issue.number} (${issue.counted} counted, ${issue.pending} pending)`,
  );
}

/** Company sign-in for the demo organization against the local identity provider the scripts start. */
async function seedCompanySignIn(db: ReturnType<typeof drizzle<typeof schema>>) {
  const issuer = process.env.OIDC_DEV_ISSUER;
  if (!issuer || !process.env.LAGWISE_SECRET_KEY) {
    console.error('[seed] no local identity provider: company sign-in not configured');
    return;
  }
  const [org] = await db.select().from(organizations).where(eq(organizations.name, DEMO_ORG.name));
  await saveSsoConfig({
    organizationId: org.id,
    issuer,
    clientId: process.env.OIDC_DEV_CLIENT_ID ?? 'lagwise-local',
    clientSecret: process.env.OIDC_DEV_CLIENT_SECRET ?? 'local-development-client-secret',
    domains: 'korvane.example',
    newMemberRole: '',
    passwordsAllowed: true,
  });
  // The demo's domain counts as proven (in a real organization the mailed proof link does this).
  await db
    .update(schema.ssoDomains)
    .set({ verifiedAt: new Date(), verifiedVia: 'demo seed (local)' })
    .where(
      and(eq(schema.ssoDomains.organizationId, org.id), eq(schema.ssoDomains.domain, 'korvane.example')),
    );
  console.error(`[seed] company sign-in for korvane.example via ${issuer} (domain proven for the demo)`);
}

main().catch((e) => {
  console.error('[seed] failed:', e);
  process.exit(1);
});
