/**
 * The project's design basis and its own catalogue of materials and jackets (kept in the basis).
 * Every write locks the basis row, bumps the revision when a result could change (results computed
 * before turn stale, see `./stale`) and writes an audit entry in the same transaction.
 */
import { and, count, eq, sql } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import { designBases, lineDesigns, lines } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { AppError } from '@/lib/errors';
import { canonicalJson } from './canonical-json';
import { catalogueOf, ownId } from './catalogue';
import type { TableReads } from './table-read-cache';
import {
  DEFAULT_DESIGN_BASIS,
  type DesignBasis,
  designBasisSchema,
  type OwnJacket,
  type OwnMaterial,
} from './design-basis';

/**
 * The project's design basis and its revision. Reading never writes: a project that has never saved
 * one reads the defaults at revision 1 (the row is created by the first write, see `withLockedBasis`).
 */
export async function getDesignBasis({
  projectId,
}: {
  projectId: string;
}): Promise<{ basis: DesignBasis; revision: number }> {
  const [row] = await db.select().from(designBases).where(eq(designBases.projectId, projectId));
  if (row) return { basis: designBasisSchema.parse(row.basis), revision: row.revision };
  return { basis: DEFAULT_DESIGN_BASIS, revision: 1 };
}

/**
 * The same as `getDesignBasis` for read-only hot paths (the line table): the parsed basis is kept
 * per project while its revision and `updated_at` stay the same (every write goes through
 * `writeBasis`, which sets both), so a request reads one row and parses nothing; with the line
 * table's read cache, not even the row. The object is shared between requests and frozen: never
 * change it.
 */
export async function getDesignBasisShared({
  projectId,
  reads,
}: {
  projectId: string;
  /** The line table's read cache for this request (lib/lines/table-read-cache.ts), when trusted. */
  reads?: TableReads | null;
}): Promise<{ basis: DesignBasis; revision: number }> {
  return reads ? reads.get(projectId, 'basis', () => readBasisShared(projectId)) : readBasisShared(projectId);
}

async function readBasisShared(projectId: string): Promise<{ basis: DesignBasis; revision: number }> {
  const [row] = await db.select().from(designBases).where(eq(designBases.projectId, projectId));
  if (!row) return { basis: DEFAULT_DESIGN_BASIS, revision: 1 };
  const at = row.updatedAt.getTime();
  const hit = parsedBases.get(projectId);
  if (hit && hit.revision === row.revision && hit.at === at)
    return { basis: hit.basis, revision: row.revision };
  const basis = deepFreeze(designBasisSchema.parse(row.basis));
  parsedBases.delete(projectId);
  // Bounded: the oldest project read is dropped first (a Map iterates in insertion order).
  if (parsedBases.size >= PARSED_BASES_MAX) parsedBases.delete(parsedBases.keys().next().value!);
  parsedBases.set(projectId, { revision: row.revision, at, basis });
  return { basis, revision: row.revision };
}

const PARSED_BASES_MAX = 200;
const parsedBases = new Map<string, { revision: number; at: number; basis: DesignBasis }>();

function deepFreeze<T>(v: T): T {
  if (v && typeof v === 'object' && !Object.isFrozen(v)) {
    Object.freeze(v);
    for (const x of Object.values(v)) deepFreeze(x);
  }
  return v;
}

/**
 * Runs `fn` in a transaction holding the project's design-basis row locked, with the stored basis
 * (the default row is created first when the project has none). Every basis write goes through it.
 */
async function withLockedBasis<T>(
  projectId: string,
  fn: (tx: Tx, row: { revision: number }, current: DesignBasis) => Promise<T>,
): Promise<T> {
  return db.transaction(async (tx) => {
    // The default row (revision 1, as read before it exists) is created by the first write.
    await tx.insert(designBases).values({ projectId, basis: DEFAULT_DESIGN_BASIS }).onConflictDoNothing();
    const [row] = await tx
      .select()
      .from(designBases)
      .where(eq(designBases.projectId, projectId))
      .for('update');
    return fn(tx, row, designBasisSchema.parse(row.basis));
  });
}

/** Writes the basis in the locked transaction, bumping the revision when `bump`; returns the new revision. */
async function writeBasis(tx: Tx, projectId: string, userId: string, basis: DesignBasis, bump: boolean) {
  const [saved] = await tx
    .update(designBases)
    .set({
      basis,
      revision: bump ? sql`${designBases.revision} + 1` : sql`${designBases.revision}`,
      updatedBy: userId,
      updatedAt: new Date(),
    })
    .where(eq(designBases.projectId, projectId))
    .returning();
  return saved.revision;
}

export async function saveDesignBasis({
  projectId,
  userId,
  basis,
}: {
  projectId: string;
  userId: string;
  basis: DesignBasis;
}) {
  return withLockedBasis(projectId, async (tx, row, current) => {
    // What changed, by section; the display unit system and the currency label change no result, so
    // they alone keep the revision (nothing goes stale).
    const changed = [...new Set([...Object.keys(current), ...Object.keys(basis)])].filter(
      (k) =>
        // jsonb does not keep key order, so compare with sorted keys.
        canonicalJson((current as Record<string, unknown>)[k]) !==
        canonicalJson((basis as Record<string, unknown>)[k]),
    );
    if (!changed.length) return { revision: row.revision };
    const revision = await writeBasis(
      tx,
      projectId,
      userId,
      basis,
      changed.some((k) => k !== 'unitSystem' && k !== 'currency'),
    );
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: await actorName(userId),
        action: 'design basis saved',
        before: {
          revision: row.revision,
          ...Object.fromEntries(changed.map((k) => [k, (current as Record<string, unknown>)[k]])),
        },
        after: {
          revision,
          ...Object.fromEntries(changed.map((k) => [k, (basis as Record<string, unknown>)[k]])),
        },
      },
    ]);
    return { revision };
  });
}

// ---------- the project's own materials and jackets (kept in the design basis) ----------

/**
 * Changes the basis under the row lock and bumps its revision (results computed before are stale),
 * with an audit entry. `change` returns the new basis (reading in the same transaction) or throws an
 * AppError with the reason.
 */
async function changeBasis(
  o: { projectId: string; userId: string; action: string; after: unknown },
  change: (b: DesignBasis, tx: Tx) => DesignBasis | Promise<DesignBasis>,
) {
  return withLockedBasis(o.projectId, async (tx, _row, current) => {
    const next = designBasisSchema.safeParse(await change(current, tx));
    if (!next.success) throw new AppError('invalid', next.error.issues.map((i) => i.message).join('; '));
    const revision = await writeBasis(tx, o.projectId, o.userId, next.data, true);
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        actorId: o.userId,
        actorName: await actorName(o.userId),
        action: o.action,
        after: o.after,
      },
    ]);
    return { revision, basis: next.data };
  });
}

export async function addOwnMaterial(o: {
  projectId: string;
  userId: string;
  material: Omit<OwnMaterial, 'id'>;
  pricePerM3?: number;
}) {
  let id = '';
  const r = await changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material added',
      after: { name: o.material.name, source: o.material.source },
    },
    (b) => {
      if (b.ownMaterials.some((m) => m.name.toLowerCase() === o.material.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a material called "${o.material.name}".`);
      id = ownId(b, o.material.name);
      const prices =
        o.pricePerM3 === undefined
          ? b.prices
          : { ...b.prices, materialPerM3: { ...b.prices.materialPerM3, [id]: o.pricePerM3 } };
      return { ...b, ownMaterials: [...b.ownMaterials, { ...o.material, id }], prices };
    },
  );
  return { ...r, id };
}

export async function addOwnJacket(o: { projectId: string; userId: string; jacket: Omit<OwnJacket, 'id'> }) {
  let id = '';
  const r = await changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project jacket added',
      after: { name: o.jacket.name, emittance: o.jacket.emittance, source: o.jacket.source },
    },
    (b) => {
      if (b.ownJackets.some((j) => j.name.toLowerCase() === o.jacket.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a jacket called "${o.jacket.name}".`);
      id = ownId(b, o.jacket.name);
      return { ...b, ownJackets: [...b.ownJackets, { ...o.jacket, id }] };
    },
  );
  return { ...r, id };
}

/** Changes a project material's data in place (same id, so the bands and designs that use it follow). */
export async function updateOwnMaterial(o: {
  projectId: string;
  userId: string;
  id: string;
  material: Omit<OwnMaterial, 'id'>;
  pricePerM3?: number;
}) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material changed',
      after: { id: o.id, name: o.material.name, source: o.material.source },
    },
    (b) => {
      const i = b.ownMaterials.findIndex((m) => m.id === o.id);
      if (i < 0)
        throw new AppError('not_found', 'That project material does not exist (it may have been removed).');
      if (b.ownMaterials.some((m) => m.id !== o.id && m.name.toLowerCase() === o.material.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a material called "${o.material.name}".`);
      const materialPerM3 = { ...b.prices.materialPerM3 };
      if (o.pricePerM3 === undefined) delete materialPerM3[o.id];
      else materialPerM3[o.id] = o.pricePerM3;
      const ownMaterials = b.ownMaterials.map((m, j) => (j === i ? { ...o.material, id: o.id } : m));
      return { ...b, ownMaterials, prices: { ...b.prices, materialPerM3 } };
    },
  );
}

/** Changes a project jacket in place. */
export async function updateOwnJacket(o: {
  projectId: string;
  userId: string;
  id: string;
  jacket: Omit<OwnJacket, 'id'>;
}) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project jacket changed',
      after: { id: o.id, name: o.jacket.name, emittance: o.jacket.emittance, source: o.jacket.source },
    },
    (b) => {
      const i = b.ownJackets.findIndex((j) => j.id === o.id);
      if (i < 0)
        throw new AppError('not_found', 'That project jacket does not exist (it may have been removed).');
      if (b.ownJackets.some((j) => j.id !== o.id && j.name.toLowerCase() === o.jacket.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a jacket called "${o.jacket.name}".`);
      return { ...b, ownJackets: b.ownJackets.map((j, k) => (k === i ? { ...o.jacket, id: o.id } : j)) };
    },
  );
}

/** Removes a project entry; refused while a material band, a line's jacket or a chosen design uses it. */
export async function removeOwnEntry(o: { projectId: string; userId: string; id: string }) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material or jacket removed',
      after: { id: o.id },
    },
    async (b, tx) => {
      const cat = catalogueOf(b);
      const name = cat.own.has(o.id) ? (cat.materials.get(o.id) ?? cat.jackets.get(o.id))!.name : null;
      if (!name)
        throw new AppError(
          'not_found',
          'That project material or jacket does not exist (it may have been removed already).',
        );
      const bands = b.systems
        .map((s, i) =>
          s.outerId === o.id || s.innerId === o.id || s.flatOuterId === o.id || s.jacketId === o.id
            ? i + 1
            : 0,
        )
        .filter(Boolean);
      if (bands.length)
        throw new AppError(
          'conflict',
          `"${name}" is used by material band ${bands.join(', ')} of the specification; choose another there first.`,
        );
      const [{ n: designs }] = await tx
        .select({ n: count() })
        .from(lineDesigns)
        .where(
          and(
            eq(lineDesigns.projectId, o.projectId),
            sql`${lineDesigns.layers} @> ${JSON.stringify([{ materialId: o.id }])}::jsonb`,
          ),
        );
      if (designs > 0)
        throw new AppError(
          'conflict',
          `"${name}" is in ${designs} chosen line design${designs === 1 ? '' : 's'}; choose those thicknesses again before removing it.`,
        );
      const [{ n: overrides }] = await tx
        .select({ n: count() })
        .from(lines)
        .where(and(eq(lines.projectId, o.projectId), eq(lines.jacketId, o.id)));
      if (overrides > 0)
        throw new AppError(
          'conflict',
          `"${name}" is the jacket override of ${overrides} line${overrides === 1 ? '' : 's'} in the line list.`,
        );
      const materialPerM3 = { ...b.prices.materialPerM3 };
      delete materialPerM3[o.id];
      return {
        ...b,
        ownMaterials: b.ownMaterials.filter((m) => m.id !== o.id),
        ownJackets: b.ownJackets.filter((j) => j.id !== o.id),
        prices: { ...b.prices, materialPerM3 },
      };
    },
  );
}
