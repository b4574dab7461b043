import { z } from 'zod';
import { num, ownJacketSchema, ownMaterialSchema } from './design-basis';

/**
 * The forms that add a project material or jacket: text as people type it (a conductivity table one
 * point per line, thicknesses as a list), turned into the design-basis entry with messages that say
 * which line or value is wrong.
 */
const numberIn = (s: string) => Number(s.trim().replace(',', '.'));

/** "mean °C, k W/(m·K)" per line; a comma, semicolon, tab or spaces between the two. */
export function parseConductivityTable(text: string, ctx: z.RefinementCtx): [number, number][] {
  const out: [number, number][] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.trim();
    if (!line) return;
    const parts = line.split(/\s*[;,\t]\s*|\s+/).filter(Boolean);
    const [t, k] = parts.map(numberIn);
    if (parts.length !== 2 || !Number.isFinite(t) || !Number.isFinite(k)) {
      ctx.addIssue({
        code: 'custom',
        message: `Conductivity table, line ${i + 1} ("${line}"): write the mean temperature in °C and k in W/(m·K), e.g. "100, 0.045"`,
      });
      return;
    }
    out.push([t, k]);
  });
  if (!out.length && !text.trim())
    ctx.addIssue({
      code: 'custom',
      message: 'Give the conductivity at one mean temperature at least, one point per line: "°C, W/(m·K)"',
    });
  return out;
}

const text = (what: string) => z.string({ error: `${what} is required` });

export const ownMaterialFormSchema = z
  .object({
    name: text('Name'),
    productForm: text('Product form'),
    kTable: text('Conductivity table').transform((v, ctx) => parseConductivityTable(v, ctx)),
    minServiceC: num('Lowest service temperature'),
    maxServiceC: num('Highest service temperature'),
    densityKgPerM3: num('Density'),
    specificHeatJPerKgK: num('Specific heat'),
    thicknesses: text('Thicknesses').transform((v, ctx) => {
      const parts = v.split(/[\s,;]+/).filter(Boolean);
      const out = parts.map(numberIn);
      const bad = parts.filter((_, i) => !(out[i] > 0));
      if (bad.length || !parts.length)
        ctx.addIssue({
          code: 'custom',
          message: bad.length
            ? `Thicknesses: "${bad.join('", "')}" is not a thickness in mm`
            : 'Give the nominal thicknesses sold, in mm, e.g. "25, 40, 50"',
        });
      return [...new Set(out)].sort((a, b) => a - b);
    }),
    maxLayerMm: num('Thickest single layer'),
    maxLayers: num('Most layers'),
    pricePerM3: z.preprocess(
      (v) => (v === '' || v === undefined ? undefined : v),
      num('Price per m³').min(0, { error: 'Price per m³ cannot be negative' }).optional(),
    ),
    source: text('Source of the data'),
  })
  .transform((f, ctx) => {
    const entry = {
      id: 'own-x',
      name: f.name,
      productForm: f.productForm,
      kPoints: f.kTable,
      minServiceC: f.minServiceC,
      maxServiceC: f.maxServiceC,
      densityKgPerM3: f.densityKgPerM3,
      specificHeatJPerKgK: f.specificHeatJPerKgK,
      thicknessesMm: f.thicknesses,
      maxLayerMm: f.maxLayerMm,
      maxLayers: f.maxLayers,
      source: f.source,
    };
    const r = ownMaterialSchema.safeParse(entry);
    if (!r.success) {
      // Report on the form's own field names.
      const field: Record<string, string> = { kPoints: 'kTable', thicknessesMm: 'thicknesses' };
      for (const i of r.error.issues)
        ctx.addIssue({
          code: 'custom',
          path: [field[String(i.path[0])] ?? String(i.path[0] ?? '')],
          message: i.message,
        });
      return z.NEVER;
    }
    const { id: _id, ...material } = r.data;
    return { ...material, pricePerM3: f.pricePerM3 };
  });

export const ownJacketFormSchema = z
  .object({
    name: text('Name'),
    emittance: num('Emittance'),
    metal: z.preprocess((v) => v === 'on' || v === 'true' || v === true, z.boolean()),
    /** ISO 13732-1 surface class for the touch limit; empty: from the metal box. */
    touchSurface: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.string().optional()),
    source: text('Source of the emittance'),
  })
  .transform((f, ctx) => {
    const r = ownJacketSchema.safeParse({ id: 'own-x', ...f });
    if (!r.success) {
      for (const i of r.error.issues)
        ctx.addIssue({ code: 'custom', path: [String(i.path[0] ?? '')], message: i.message });
      return z.NEVER;
    }
    const { id: _id, ...jacket } = r.data;
    return jacket;
  });
