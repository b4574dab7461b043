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
import { getDesignBasis } from '@/lib/lines/basis-store';
import { currentFlags } from '@/lib/review/store';
import { catalogueOf } from '@/lib/lines/catalogue';
import { isIncompleteLine } from '@/lib/lines/fields';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { billWorkbook } from './workbook';
import { tracingSchedule } from './tracing';
import { getDocument, putDocument, safeFileName } from '@/lib/storage/documents';
import { randomUUID } from 'node:crypto';
import {
  computeQuantities,
  DEFAULT_ACCESSORY_FACTORS,
  DEFAULT_BOQ_FACTORS,
  quantityDelta,
  sameBill,
  type BillQuantities,
  type BoqFactors,
  type BoqLine,
} from './quantities';
import { condensationControlApplies, type Purpose } from '@/lib/thermal';
import { criteriaFor } from '@/lib/lines/solve-line';
import { getOwnBillFactors } from './factors';

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
  const { basis } = await getDesignBasis({ projectId });
  const cat = catalogueOf(basis);
  const boqLayers = (ls: { materialId: string; thicknessMm: number }[]) =>
    ls.map((x) => {
      const m = cat.materials.get(x.materialId);
      return {
        materialId: x.materialId,
        materialName: m?.name ?? x.materialId,
        productForm: m?.productForm ?? '',
        thicknessMm: x.thicknessMm,
      };
    });
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
      layers: boqLayers(design?.layers ?? []),
      parts:
        line.geometry === 'vessel' && design?.parts
          ? {
              shell: { layers: boqLayers(design.parts.shell.layers) },
              top: { layers: boqLayers(design.parts.top.layers), guarded: !!design.parts.top.guarded },
              bottom: {
                layers: boqLayers(design.parts.bottom.layers),
                guarded: !!design.parts.bottom.guarded,
              },
            }
          : null,
      jacketId: jacket?.id ?? '',
      jacketName: jacket?.name ?? '—',
      status,
      reviewStatus,
      heightM: line.heightM,
      // The same rule the review and the recommendation use: cold service gets a vapour retarder.
      coldService: condensationControlApplies(
        { purposes: line.purposes as Purpose[], coldestC: line.normalTempC },
        criteriaFor(basis, line.outdoor).conditions.condensation,
        basis.dewPointMarginK,
      ),
    };
  });
}

/** The project's bill factors: the defaults, valves left bare when the design basis says so, and the project's own values. */
export async function billFactors({ projectId }: { projectId: string }): Promise<BoqFactors> {
  const { basis } = await getDesignBasis({ projectId });
  const own = await getOwnBillFactors({ projectId });
  return {
    ...DEFAULT_BOQ_FACTORS,
    removableCovers: !basis.fittings.valvesBare,
    accessories: { ...DEFAULT_ACCESSORY_FACTORS, ...(own ?? {}) },
  };
}

export async function previewBill({ projectId }: { projectId: string }): Promise<BillQuantities> {
  const lines = await collectBillLines({ projectId });
  const q = computeQuantities(lines, await billFactors({ projectId }));
  const { basis } = await getDesignBasis({ projectId });
  const countedTags = lines.filter((l) => l.status.counted).map((l) => l.tag);
  const tracing = await tracingSchedule({ projectId, basis, countedTags });
  return tracing.length ? { ...q, tracing } : q;
}

/** The last issue when the bill now would be identical to it (the page warns before issuing it again). */
export async function unchangedSince({
  projectId,
  preview,
}: {
  projectId: string;
  preview?: BillQuantities;
}) {
  const [last] = await db
    .select({ number: boqIssues.number, quantities: boqIssues.quantities })
    .from(boqIssues)
    .where(eq(boqIssues.projectId, projectId))
    .orderBy(desc(boqIssues.number))
    .limit(1);
  if (!last) return null;
  const now = preview ?? (await previewBill({ projectId }));
  return sameBill(now, last.quantities as BillQuantities) ? last.number : null;
}

/**
 * Issues the next revision of the bill; refused when no line can be counted. `tx`: the issuing
 * job's transaction, so the issue and the job's "done" commit together.
 */
export async function issueBill({
  projectId,
  userId,
  evenIfUnchanged = false,
  tx: outer,
}: {
  projectId: string;
  userId: string;
  /** Issue even when nothing changed since the last issue (the user confirmed the warning). */
  evenIfUnchanged?: boolean;
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
    const number = Number(n) + 1;
    const [prev] =
      number > 1
        ? await tx
            .select({ quantities: boqIssues.quantities })
            .from(boqIssues)
            .where(and(eq(boqIssues.projectId, projectId), eq(boqIssues.number, number - 1)))
        : [];
    if (prev && !evenIfUnchanged && sameBill(q, prev.quantities as BillQuantities))
      throw new AppError(
        'conflict',
        `Nothing changed since issue ${number - 1}: this revision would be identical. Confirm to issue it anyway.`,
      );
    // The workbook is made once, now, and kept byte for byte: every later download is this file.
    // It is stored before the issue row is written; if storing fails nothing is issued.
    const id = randomUUID();
    const issuedAt = new Date();
    const meta = {
      number,
      issuedAt,
      issuedBy: userId,
      basisRevision: revision,
      lineListRevision: ll?.n ?? null,
    };
    const { buf, fileName } = await renderWorkbook({
      projectId,
      issue: meta,
      quantities: q,
      previous: prev ? (prev.quantities as BillQuantities) : null,
    });
    const doc = await putDocument(`projects/${projectId}/bills/${id}/${fileName}`, buf, XLSX_TYPE);
    const [issue] = await tx
      .insert(boqIssues)
      .values({
        id,
        projectId,
        number,
        issuedBy: userId,
        issuedAt,
        basisRevision: revision,
        lineListRevision: ll?.n ?? null,
        quantities: q,
        counted: q.counted,
        pending: q.pending,
        documentKey: doc.key,
        documentSha256: doc.sha256,
        documentBytes: doc.bytes,
      })
      .returning();
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: name,
        action: `bill of quantities issue ${issue.number}`,
        after: { counted: q.counted, pending: q.pending, sha256: doc.sha256 },
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
      documentSha256: boqIssues.documentSha256,
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

export const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

/** Makes the workbook of an issue from its quantities, the project's present units and prices, and the change from the previous issue. */
async function renderWorkbook(o: {
  projectId: string;
  issue: {
    number: number;
    issuedAt: Date;
    issuedBy: string;
    basisRevision: number;
    lineListRevision: number | null;
  };
  quantities: BillQuantities;
  previous: BillQuantities | null;
}) {
  const [p] = await db
    .select({ project: projects, org: organizations.name })
    .from(projects)
    .innerJoin(organizations, eq(organizations.id, projects.organizationId))
    .where(eq(projects.id, o.projectId));
  const { basis } = await getDesignBasis({ projectId: o.projectId });
  const buf = await billWorkbook(
    o.quantities,
    {
      projectCode: p.project.code,
      projectName: p.project.name,
      site: p.project.site,
      organization: p.org,
      issueNumber: o.issue.number,
      issuedAt: o.issue.issuedAt,
      issuedBy: await actorName(o.issue.issuedBy),
      basisRevision: o.issue.basisRevision,
      lineListRevision: o.issue.lineListRevision,
      inches: basis.thicknessSeries === 'inch' || basis.unitSystem === 'US',
      unitSystem: basis.unitSystem,
      currency: basis.currency,
      materialPricePerM3: materialPricesByName(basis),
    },
    quantityDelta(o.previous, o.quantities),
  );
  return {
    buf: Buffer.from(buf),
    fileName: `${safeFileName(p.project.code)}-bill-of-quantities-issue-${o.issue.number}.xlsx`,
  };
}

/**
 * The workbook of an issued revision: the very bytes kept when it was issued (checked against their
 * SHA-256). Issues made before workbooks were kept are made again from their stored quantities.
 */
export async function issueWorkbook({ projectId, number }: { projectId: string; number: number }) {
  const { issue, quantities } = await getIssue({ projectId, number });
  if (issue.documentKey && issue.documentSha256 && issue.documentBytes !== null) {
    const buf = await getDocument({
      key: issue.documentKey,
      sha256: issue.documentSha256,
      bytes: issue.documentBytes,
    });
    return { buf, fileName: issue.documentKey.slice(issue.documentKey.lastIndexOf('/') + 1), kept: true };
  }
  const [prev] =
    number > 1
      ? await db
          .select()
          .from(boqIssues)
          .where(and(eq(boqIssues.projectId, projectId), eq(boqIssues.number, number - 1)))
      : [];
  const r = await renderWorkbook({
    projectId,
    issue,
    quantities,
    previous: prev ? (prev.quantities as BillQuantities) : null,
  });
  return { ...r, kept: false };
}
