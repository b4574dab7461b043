/** Issuing and reading the bill of quantities — free of Next.js. */
import { and, desc, eq, sql } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import {
  boqIssues,
  lineDesigns,
  lineListRevisions,
  lineResults,
  lines,
  organizations,
  projects,
  reviewItems,
  reviewRounds,
} from '@/db/schema';
import { AppError } from '@/lib/errors';
import { actorName, writeAudit } from '@/lib/audit';
import { getDesignBasis } from '@/lib/lines/store';
import { currentFlags } from '@/lib/review/store';
import { catalogueOf } from '@/lib/lines/catalogue';
import { isIncompleteLine } from '@/lib/lines/fields';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { billWorkbook } from './workbook';
import { computeQuantities, quantityDelta, type BillQuantities, type BoqLine } from './quantities';

const SAFETY: string[] = ['hot-surface', 'sweating', 'interface-limit', 'below-criterion'];

/** Every line with its chosen design and whether the bill may count it (decided, and signed off where flagged). */
export async function collectBillLines({ projectId }: { projectId: string }): Promise<BoqLine[]> {
  const rows = await db
    .select({ line: lines, design: lineDesigns, jacketId: lineResults.jacketId })
    .from(lines)
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .where(eq(lines.projectId, projectId));
  const flagged = new Map(
    (await currentFlags({ projectId })).map((f) => [
      f.lineId,
      f.flags.filter((x) => SAFETY.includes(x.type)),
    ]),
  );
  // The latest decision on each line in a signed-off round, with the versions it was taken on.
  const decided = await db.execute<{
    line_id: string;
    disposition: string;
    line_input_version: number;
    design_version: number;
    status: string;
  }>(sql`
    select distinct on (i.line_id) i.line_id, i.disposition, i.line_input_version, i.design_version, r.status
    from ${reviewItems} i join ${reviewRounds} r on r.id = i.round_id
    where i.project_id = ${projectId} and i.line_id is not null
    order by i.line_id, r.number desc`);
  const review = new Map(decided.rows.map((r) => [r.line_id, r]));
  const cat = catalogueOf((await getDesignBasis({ projectId })).basis);
  return rows.map(({ line, design, jacketId }) => {
    const flags = flagged.get(line.id) ?? [];
    const rv = review.get(line.id);
    const current =
      rv?.disposition &&
      rv.line_input_version === line.inputVersion &&
      rv.design_version === (design?.version ?? 0);
    let status: BoqLine['status'] = { counted: true };
    if (isIncompleteLine(line)) status = { counted: false, reason: 'no length yet (incomplete line)' };
    else if (!design) status = { counted: false, reason: 'no thickness chosen' };
    else if (design.needsRedecision)
      status = { counted: false, reason: 'needs re-decision after a line-list revision' };
    else if (flags.length && !(current && rv!.status === 'signed-off'))
      status = { counted: false, reason: 'awaiting safety sign-off' };
    const reviewStatus = !rv
      ? flags.length
        ? 'flagged, not reviewed'
        : 'not flagged'
      : `${rv.status === 'signed-off' ? 'signed off' : 'in review'}${rv.disposition ? `: ${rv.disposition}` : ''}${current ? '' : ' (re-opened)'}`;
    const jacket = cat.jackets.get(line.jacketId ?? '') ?? cat.jackets.get(jacketId ?? '');
    return {
      tag: line.tag,
      area: line.area,
      geometry: line.geometry,
      nps: line.nps,
      outsideDiameterMm: line.outsideDiameterMm,
      lengthM: line.lengthM,
      surfaceAreaM2: line.surfaceAreaM2,
      fittings: { elbows: line.elbows, tees: line.tees, valves: line.valves, flanges: line.flanges },
      layers: ((design?.layers ?? []) as { materialId: string; thicknessMm: number }[]).map((x) => {
        const m = cat.materials.get(x.materialId);
        return {
          materialId: x.materialId,
          materialName: m?.name ?? x.materialId,
          productForm: m?.productForm ?? '',
          thicknessMm: x.thicknessMm,
        };
      }),
      jacketId: jacket?.id ?? '',
      jacketName: jacket?.name ?? '—',
      status,
      reviewStatus,
    };
  });
}

export async function previewBill({ projectId }: { projectId: string }) {
  return computeQuantities(await collectBillLines({ projectId }));
}

/**
 * Issues the next revision of the bill; refused when no line can be counted. `tx`: the issuing
 * job's transaction, so the issue and the job's "done" commit together.
 */
export async function issueBill({
  projectId,
  userId,
  tx: outer,
}: {
  projectId: string;
  userId: string;
  tx?: Tx;
}) {
  const q = await previewBill({ projectId });
  if (q.counted === 0)
    throw new AppError(
      'invalid',
      'No line is decided and cleared yet, so there is nothing to issue. Choose thicknesses (and get flagged lines signed off) first.',
    );
  const { revision } = await getDesignBasis({ projectId });
  const [ll] = await db
    .select({ n: sql<number>`max(${lineListRevisions.number})` })
    .from(lineListRevisions)
    .where(eq(lineListRevisions.projectId, projectId));
  const name = await actorName(userId);
  return (outer ?? db).transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`boq${projectId}`}))`);
    const [{ n }] = await tx
      .select({ n: sql<number>`coalesce(max(${boqIssues.number}), 0)` })
      .from(boqIssues)
      .where(eq(boqIssues.projectId, projectId));
    const [issue] = await tx
      .insert(boqIssues)
      .values({
        projectId,
        number: Number(n) + 1,
        issuedBy: userId,
        basisRevision: revision,
        lineListRevision: ll?.n ?? null,
        quantities: q,
        counted: q.counted,
        pending: q.pending,
      })
      .returning();
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: name,
        action: `bill of quantities issue ${issue.number}`,
        after: { counted: q.counted, pending: q.pending },
      },
    ]);
    return issue;
  });
}

export async function listIssues({ projectId }: { projectId: string }) {
  return db
    .select({
      id: boqIssues.id,
      number: boqIssues.number,
      issuedAt: boqIssues.issuedAt,
      counted: boqIssues.counted,
      pending: boqIssues.pending,
      basisRevision: boqIssues.basisRevision,
    })
    .from(boqIssues)
    .where(eq(boqIssues.projectId, projectId))
    .orderBy(desc(boqIssues.number));
}

export async function getIssue({ projectId, number }: { projectId: string; number: number }) {
  const [issue] = await db
    .select()
    .from(boqIssues)
    .where(and(eq(boqIssues.projectId, projectId), eq(boqIssues.number, number)));
  if (!issue)
    throw new AppError(
      'not_found',
      `Bill issue ${number} does not exist; only issued revisions can be downloaded.`,
    );
  const [prev] =
    number > 1
      ? await db
          .select()
          .from(boqIssues)
          .where(and(eq(boqIssues.projectId, projectId), eq(boqIssues.number, number - 1)))
      : [];
  const q = issue.quantities as BillQuantities;
  return { issue, quantities: q, delta: quantityDelta(prev ? (prev.quantities as BillQuantities) : null, q) };
}

/** Material price per m³ by material name (the bill's rows carry names): the project's price, else the default. */
export function materialPricesByName(basis: DesignBasis): Record<string, number> {
  const out: Record<string, number> = {};
  for (const m of catalogueOf(basis).materials.values())
    out[m.name] = basis.prices.materialPerM3[m.id] ?? basis.prices.defaultMaterialPerM3;
  return out;
}

export async function issueWorkbook({ projectId, number }: { projectId: string; number: number }) {
  const { issue, quantities, delta } = await getIssue({ projectId, number });
  const [p] = await db
    .select({ project: projects, org: organizations.name })
    .from(projects)
    .innerJoin(organizations, eq(organizations.id, projects.organizationId))
    .where(eq(projects.id, projectId));
  const { basis } = await getDesignBasis({ projectId });
  const buf = await billWorkbook(
    quantities,
    {
      projectCode: p.project.code,
      projectName: p.project.name,
      site: p.project.site,
      organization: p.org,
      issueNumber: issue.number,
      issuedAt: issue.issuedAt,
      issuedBy: await actorName(issue.issuedBy),
      basisRevision: issue.basisRevision,
      lineListRevision: issue.lineListRevision,
      inches: basis.thicknessSeries === 'inch' || basis.unitSystem === 'US',
      unitSystem: basis.unitSystem,
      currency: basis.currency,
      materialPricePerM3: materialPricesByName(basis),
    },
    delta,
  );
  return { buf, fileName: `${p.project.code}-bill-of-quantities-issue-${issue.number}.xlsx` };
}
