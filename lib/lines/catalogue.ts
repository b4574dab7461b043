import { JACKETS, MATERIALS, type InsulationMaterial, type Jacket } from '@/lib/thermal/materials';
import type { DesignBasis, OwnMaterial } from './design-basis';

/**
 * The materials and jackets a project can use: the typical library plus the project's own entries
 * (kept in its design basis, with the source of their data). One catalogue object per basis object,
 * so the engine's caches (keyed by material and system objects) keep working across lines.
 */
export interface Catalogue {
  materials: Map<string, InsulationMaterial>;
  jackets: Map<string, Jacket>;
  /** Ids of the project's own entries. */
  own: Set<string>;
}

const LIBRARY_MATERIALS = new Map(MATERIALS.map((m) => [m.id, m]));
const LIBRARY_JACKETS = new Map(JACKETS.map((j) => [j.id, j]));
const cache = new WeakMap<object, Catalogue>();

function ownMaterialToLibraryForm(m: OwnMaterial): InsulationMaterial {
  return {
    id: m.id,
    name: m.name,
    productForm: m.productForm,
    conductivity: { type: 'table', points: [...m.kPoints].sort((a, b) => a[0] - b[0]) },
    minServiceC: m.minServiceC,
    maxServiceC: m.maxServiceC,
    densityKgPerM3: m.densityKgPerM3,
    specificHeatJPerKgK: m.specificHeatJPerKgK,
    thicknessesMm: m.thicknessesMm,
    maxLayerMm: m.maxLayerMm,
    maxLayers: m.maxLayers,
    source: `Project data: ${m.source}`,
  };
}

export function catalogueOf(
  basis: Pick<DesignBasis, 'ownMaterials' | 'ownJackets'> & Partial<Pick<DesignBasis, 'designConductivity'>>,
): Catalogue {
  let c = cache.get(basis);
  if (c) return c;
  const materials = new Map(LIBRARY_MATERIALS),
    jackets = new Map(LIBRARY_JACKETS),
    own = new Set<string>();
  for (const m of basis.ownMaterials ?? []) {
    materials.set(m.id, ownMaterialToLibraryForm(m));
    own.add(m.id);
  }
  // EN ISO 23993 factors: a copy of the material carrying them (the declared curve stays as declared).
  for (const [id, f] of Object.entries(basis.designConductivity ?? {})) {
    const m = materials.get(id);
    if (m && f.ageing * f.moisture * f.installation !== 1)
      materials.set(id, {
        ...m,
        designFactors: {
          ageing: f.ageing,
          moisture: f.moisture,
          installation: f.installation,
          source: f.source,
        },
      });
  }
  for (const j of basis.ownJackets ?? []) {
    jackets.set(j.id, {
      id: j.id,
      name: j.name,
      emittance: j.emittance,
      metal: j.metal,
      ...(j.touchSurface ? { touchSurface: j.touchSurface } : {}),
      source: `Project data: ${j.source}`,
    });
    own.add(j.id);
  }
  c = { materials, jackets, own };
  cache.set(basis, c);
  return c;
}

/** A new id for a project entry: "own-" + the name's slug, unique within the catalogue. */
export function ownId(basis: Pick<DesignBasis, 'ownMaterials' | 'ownJackets'>, name: string): string {
  const slug =
    name
      .toLowerCase()
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 40) || 'entry';
  const c = catalogueOf(basis);
  let id = `own-${slug}`,
    n = 2;
  while (c.materials.has(id) || c.jackets.has(id)) id = `own-${slug}-${n++}`;
  return id;
}
