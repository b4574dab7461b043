/**
 * Corrosion-under-insulation screening: does a line spend time in the temperature range where
 * water under the insulation corrodes carbon steel, or where chlorides leached from it crack
 * austenitic stainless steel (external stress-corrosion cracking)? A screen, not an assessment: it
 * says which window the line's operating, cyclic or idle temperature falls in and which document
 * gives it, so an engineer reviews coating, insulation and inspection for the line.
 *
 * Windows, as we recall the documents (not read from a copy here — verify against the edition the
 * project specifies before relying on them) [recalled]:
 *  - AMPP/NACE SP0198 (Control of Corrosion Under Thermal Insulation and Fireproofing Materials):
 *    carbon and low-alloy steels −4 °C to 175 °C (25 °F to 350 °F); austenitic and duplex
 *    stainless steels (ESCC) 50 °C to 175 °C (120 °F to 350 °F).
 *  - API RP 583 (Corrosion Under Insulation and Fireproofing): carbon steel −12 °C to 175 °C
 *    (10 °F to 350 °F); austenitic stainless steel (ESCC) 60 °C to 205 °C (140 °F to 400 °F).
 * A line is screened at its normal (operating) temperature, over the range it cycles through
 * between normal and maximum, and — when the project says its lines stand idle — at the idle
 * temperature (the annual heat-loss air), since a line that idles passes through the window.
 */

export type CuiMetal = 'carbon-steel' | 'austenitic-stainless';

export const CUI_METAL_LABEL: Record<CuiMetal, string> = {
  'carbon-steel': 'carbon and low-alloy steel',
  'austenitic-stainless': 'austenitic stainless steel',
};

export interface CuiWindow {
  metal: CuiMetal;
  fromC: number;
  toC: number;
  /** Document and the part of it that gives the window, with how sure we are of the numbers. */
  source: string;
}

export const CUI_WINDOWS: readonly CuiWindow[] = [
  {
    metal: 'carbon-steel',
    fromC: -4,
    toC: 175,
    source: 'AMPP/NACE SP0198, carbon and low-alloy steels, 25–350 °F [recalled]',
  },
  { metal: 'carbon-steel', fromC: -12, toC: 175, source: 'API RP 583, carbon steel, 10–350 °F [recalled]' },
  {
    metal: 'austenitic-stainless',
    fromC: 50,
    toC: 175,
    source:
      'AMPP/NACE SP0198, external stress-corrosion cracking of austenitic and duplex stainless steels, 120–350 °F [recalled]',
  },
  {
    metal: 'austenitic-stainless',
    fromC: 60,
    toC: 205,
    source:
      'API RP 583, external chloride stress-corrosion cracking of austenitic stainless steel, 140–400 °F [recalled]',
  },
];

export type CuiExposure = 'operating' | 'cyclic' | 'idle';

export interface CuiFinding {
  metal: CuiMetal;
  exposure: CuiExposure;
  /** The temperature (or the cycled range) that falls in the window, °C. */
  fromC: number;
  toC: number;
  window: { fromC: number; toC: number };
  source: string;
}

export interface CuiScreen {
  findings: CuiFinding[];
  /** The line falls in a window of a metal the project uses. */
  inWindow: boolean;
  /** What the specification then asks for, when the project requires it. */
  coatingNote: string | null;
  chlorideFreeInsulation: boolean;
}

export interface CuiSpec {
  /** Metals the project's lines are made of (the line list does not say per line). */
  metals: CuiMetal[];
  /** Lines stand idle at the ambient air (then screened at it too). */
  screenIdle: boolean;
  /** The specification asks for a coating under the insulation on screened lines. */
  requireCoatingNote: boolean;
  /** The specification asks for insulation to ASTM C795 (chloride-free, for austenitic stainless) on screened stainless lines. */
  requireChlorideFree: boolean;
}

/** Screens one line (see the module note). Every matching window is reported, with its source. */
export function screenCui(o: { normalC: number; maxC?: number; idleC?: number }, spec: CuiSpec): CuiScreen {
  const findings: CuiFinding[] = [];
  const lo = Math.min(o.normalC, o.maxC ?? o.normalC),
    hi = Math.max(o.normalC, o.maxC ?? o.normalC);
  for (const w of CUI_WINDOWS) {
    if (!spec.metals.includes(w.metal)) continue;
    const inside = (t: number) => t >= w.fromC && t <= w.toC;
    const window = { fromC: w.fromC, toC: w.toC };
    if (inside(o.normalC))
      findings.push({
        metal: w.metal,
        exposure: 'operating',
        fromC: o.normalC,
        toC: o.normalC,
        window,
        source: w.source,
      });
    else if (hi > lo && lo <= w.toC && hi >= w.fromC)
      findings.push({ metal: w.metal, exposure: 'cyclic', fromC: lo, toC: hi, window, source: w.source });
    else if (spec.screenIdle && o.idleC !== undefined && inside(o.idleC))
      findings.push({
        metal: w.metal,
        exposure: 'idle',
        fromC: o.idleC,
        toC: o.idleC,
        window,
        source: w.source,
      });
  }
  const inWindow = findings.length > 0;
  const stainless = findings.some((f) => f.metal === 'austenitic-stainless');
  return {
    findings,
    inWindow,
    coatingNote:
      inWindow && spec.requireCoatingNote
        ? 'Coat the metal surface under the insulation with a system suited to the service temperature before insulating (AMPP/NACE SP0198 coating guidance); keep the jacket sealed and inspect per API RP 583.'
        : null,
    chlorideFreeInsulation: stainless && spec.requireChlorideFree,
  };
}

/** One sentence for a finding: "carbon and low-alloy steel, operating 120 °C in the -4 °C to 175 °C window (AMPP/NACE SP0198 …)" (every temperature with its unit, so the display layer converts each). */
export function describeCuiFinding(f: CuiFinding): string {
  const at = f.exposure === 'cyclic' ? `cycling ${f.fromC} °C to ${f.toC} °C` : `${f.exposure} ${f.fromC} °C`;
  return `${CUI_METAL_LABEL[f.metal]}, ${at} in the ${f.window.fromC} °C to ${f.window.toC} °C window (${f.source})`;
}
