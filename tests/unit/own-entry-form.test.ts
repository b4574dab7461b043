import { describe, expect, it } from 'vitest';
import { ownJacketFormSchema, ownMaterialFormSchema } from '@/lib/lines/own-entry-form';
import { catalogueOf, ownId } from '@/lib/lines/catalogue';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';

const form = {
  name: 'Mill board B',
  productForm: 'board',
  kTable: '50, 0.040\n150; 0.047\n\n300\t0.061',
  minServiceC: '0',
  maxServiceC: '700',
  densityKgPerM3: '300',
  specificHeatJPerKgK: '900',
  thicknesses: '25 40, 50;60',
  maxLayerMm: '60',
  maxLayers: '2',
  pricePerM3: '',
  source: 'Scenario sheet rev A',
};
const messages = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  (r.error?.issues ?? []).map((i) => `${i.path.join('.')}: ${i.message}`);

describe('adding a project material from the form', () => {
  it('reads a conductivity table typed with commas, semicolons or tabs, and a thickness list', () => {
    const r = ownMaterialFormSchema.safeParse(form);
    expect(r.success).toBe(true);
    expect(r.data).toMatchObject({
      kPoints: [
        [50, 0.04],
        [150, 0.047],
        [300, 0.061],
      ],
      thicknessesMm: [25, 40, 50, 60],
      productForm: 'board',
      pricePerM3: undefined,
    });
  });

  it('names the table line that cannot be read', () => {
    const r = ownMaterialFormSchema.safeParse({ ...form, kTable: '50, 0.040\n150 0,047 x\n300, 0.061' });
    expect(messages(r)).toEqual([
      'kTable: Conductivity table, line 2 ("150 0,047 x"): write the mean temperature in °C and k in W/(m·K), e.g. "100, 0.045"',
    ]);
  });

  it('refuses a k outside 0–5 W/(m·K), a repeated temperature, a service range upside down and thicknesses that are not numbers', () => {
    expect(messages(ownMaterialFormSchema.safeParse({ ...form, kTable: '50, 40' }))).toEqual([
      'kTable: Conductivity at 50 °C must be between 0 and 5 W/(m·K) (is 40)',
    ]);
    expect(messages(ownMaterialFormSchema.safeParse({ ...form, kTable: '50, 0.04\n50, 0.05' }))).toEqual([
      'kTable: Two conductivity points at 50 °C: give each mean temperature once',
    ]);
    expect(messages(ownMaterialFormSchema.safeParse({ ...form, minServiceC: '800' }))).toEqual([
      'maxServiceC: The highest service temperature must be above the lowest',
    ]);
    expect(messages(ownMaterialFormSchema.safeParse({ ...form, thicknesses: '25, forty' }))).toEqual([
      'thicknesses: Thicknesses: "forty" is not a thickness in mm',
    ]);
    expect(messages(ownMaterialFormSchema.safeParse({ ...form, source: 'x' }))).toEqual([
      'source: Say where the data come from (data sheet, test report…)',
    ]);
  });

  it('a jacket needs an emittance in (0, 1] and a source; the metal box is a boolean', () => {
    expect(
      ownJacketFormSchema.safeParse({
        name: 'Black paint',
        emittance: '0.95',
        metal: 'on',
        source: 'Scenario',
      }).data,
    ).toEqual({ name: 'Black paint', emittance: 0.95, metal: true, source: 'Scenario' });
    expect(
      ownJacketFormSchema.safeParse({ name: 'Black paint', emittance: '0.95', source: 'Scenario' }).data!
        .metal,
    ).toBe(false);
    expect(
      messages(
        ownJacketFormSchema.safeParse({ name: 'Mirror', emittance: '1.2', metal: 'on', source: 'Scenario' }),
      ),
    ).toEqual(['emittance: Emittance is at most 1']);
  });
});

describe('the project catalogue', () => {
  it('adds own entries beside the library, with ids that never collide', () => {
    const basis = {
      ...DEFAULT_DESIGN_BASIS,
      ownJackets: [{ id: 'own-pvc', name: 'PVC', emittance: 0.9, metal: false, source: 'Scenario' }],
    };
    const cat = catalogueOf(basis);
    expect(cat.jackets.get('own-pvc')!.source).toBe('Project data: Scenario');
    expect(cat.jackets.get('pvc')!.name).toBe('PVC sheet'); // the library entry is still there
    expect(ownId(basis, 'PVC')).toBe('own-pvc-2');
    expect(ownId(basis, '  Älu / Mantel ')).toBe('own-alu-mantel');
    expect(catalogueOf(basis)).toBe(cat); // one catalogue per basis object (engine caches key on it)
  });
});
