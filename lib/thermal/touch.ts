/**
 * Touch limit by contact time and surface material: the burn threshold of ISO 13732-1:2006
 * (EN ISO 13732-1:2008, clause 4 — Figures 1–6 for contacts of 1 s to 10 s, Table 1 for 1 min and
 * longer) for the outside surface a hand would touch. ISO 13732-1 gives thresholds, not limit
 * values (its scope says so); the project chooses the contact time — 5 s is common practice for
 * industrial workers after ASTM C1055 (§ on contact times: "for design, the probable contact time
 * for industrial situations is 5 s"), which also takes a first-degree burn as the injury level.
 *
 * Values (°C), lower end of each published band, so the limit is on the safe side:
 *   contact ≥ 1 min (ISO 13732-1 Table 1, as reprinted in the Czech regulation 361/2007 Sb.
 *   and two German summaries — second-hand): uncoated metal 51 / 48 / 43 at 1 min / 10 min / 8 h;
 *   ceramics, glass, stone 56 / 48 / 43; plastics 60 / 48 / 43; wood 60 / 48 / 43.
 *   10 s: ceramics, glass, stone 66; plastics 71; wood 89 (same reprint); uncoated metal ≈55
 *   [recalled: read from the ISO figure band].
 *   1–5 s (ISO 13732-1 figure bands, second-hand from a German reprint): uncoated metal 62–65 (1 s),
 *   60–64 (2 s), 56–61 (5 s); wood 110–135, 104–126, 92–112.
 * Between the points the threshold is interpolated linearly in log(contact time) (the figures'
 * time axis is logarithmic). Where the short-contact bands of a material were not read
 * (ceramics, plastics under 10 s) the 10 s threshold is used: thresholds fall as contact
 * lengthens, so that is on the safe side. Coated metal takes the uncoated-metal thresholds:
 * a lacquer raises the short-contact threshold by an amount that depends on its thickness
 * (the predecessor EN 563 gave +13 K for 50 µm [recalled, low confidence]); not credited here.
 *
 * The limit is a burn threshold for healthy adult skin; children, the elderly, people who cannot
 * withdraw, and local codes may require less. A qualified person decides.
 */

export type TouchSurface = 'bare-metal' | 'coated-metal' | 'ceramic-glass-stone' | 'plastic' | 'wood';

export const TOUCH_SURFACE_LABEL: Record<TouchSurface, string> = {
  'bare-metal': 'bare (uncoated) metal',
  'coated-metal': 'coated or painted metal',
  'ceramic-glass-stone': 'ceramics, glass or stone',
  plastic: 'plastics and other non-metal finishes',
  wood: 'wood',
};

/** A threshold point: contact time (s), threshold (°C, lower end of the band), upper end where a band was read, and how sure we are. */
interface ThresholdPoint {
  s: number;
  c: number;
  upper?: number;
  note: 'C2' | 'R';
}
const METAL: ThresholdPoint[] = [
  { s: 1, c: 62, upper: 65, note: 'C2' },
  { s: 2, c: 60, upper: 64, note: 'C2' },
  { s: 5, c: 56, upper: 61, note: 'C2' },
  { s: 10, c: 55, note: 'R' },
  { s: 60, c: 51, note: 'C2' },
  { s: 600, c: 48, note: 'C2' },
  { s: 28800, c: 43, note: 'C2' },
];
export const BURN_THRESHOLDS: Record<TouchSurface, ThresholdPoint[]> = {
  'bare-metal': METAL,
  'coated-metal': METAL,
  'ceramic-glass-stone': [
    { s: 10, c: 66, note: 'C2' },
    { s: 60, c: 56, note: 'C2' },
    { s: 600, c: 48, note: 'C2' },
    { s: 28800, c: 43, note: 'C2' },
  ],
  plastic: [
    { s: 10, c: 71, note: 'C2' },
    { s: 60, c: 60, note: 'C2' },
    { s: 600, c: 48, note: 'C2' },
    { s: 28800, c: 43, note: 'C2' },
  ],
  wood: [
    { s: 1, c: 110, upper: 135, note: 'C2' },
    { s: 2, c: 104, upper: 126, note: 'C2' },
    { s: 5, c: 92, upper: 112, note: 'C2' },
    { s: 10, c: 89, note: 'C2' },
    { s: 60, c: 60, note: 'C2' },
    { s: 600, c: 48, note: 'C2' },
    { s: 28800, c: 43, note: 'C2' },
  ],
};

/** Contact times the table covers: 1 s (the shortest band read) to 8 h (the threshold stays 43 °C beyond). */
export const CONTACT_SECONDS_RANGE = { min: 1, max: 28800 } as const;
/** Common practice after ASTM C1055: 5 s for industrial workers. */
export const DEFAULT_CONTACT_SECONDS = 5;

export interface TouchLimit {
  limitC: number;
  surface: TouchSurface;
  contactSeconds: number;
  /** The published band at this contact time when one was read (lower end used), else null. */
  bandC: [number, number] | null;
  /** Standard and clause, and how the number was reached, in a sentence. */
  basis: string;
}

/** Burn threshold (°C) for a surface and contact time, ISO 13732-1 (see the module note). */
export function burnThresholdC(surface: TouchSurface, contactSeconds: number): TouchLimit {
  if (!(contactSeconds >= CONTACT_SECONDS_RANGE.min))
    throw new RangeError(
      `Contact time must be at least ${CONTACT_SECONDS_RANGE.min} s (is ${contactSeconds})`,
    );
  const pts = BURN_THRESHOLDS[surface];
  const t = Math.min(contactSeconds, CONTACT_SECONDS_RANGE.max);
  let limitC: number,
    bandC: [number, number] | null = null,
    how: string;
  if (t <= pts[0].s) {
    limitC = pts[0].c;
    if (pts[0].upper !== undefined && t === pts[0].s) bandC = [pts[0].c, pts[0].upper];
    how =
      t < pts[0].s
        ? `the ${pts[0].s} s threshold (short-contact band not read; thresholds fall with contact time, so this is on the safe side)`
        : 'the lower end of the band';
  } else {
    let i = 1;
    while (i < pts.length - 1 && pts[i].s < t) i++;
    const a = pts[i - 1],
      b = pts[i];
    if (t >= b.s) {
      limitC = b.c;
      if (b.upper !== undefined) bandC = [b.c, b.upper];
      how =
        b.upper !== undefined
          ? 'the lower end of the band'
          : b.note === 'R'
            ? 'the threshold [recalled from the figure]'
            : 'the tabulated threshold';
    } else {
      const f = Math.log(t / a.s) / Math.log(b.s / a.s);
      limitC = a.c + (b.c - a.c) * f;
      how = `interpolated in log(time) between ${a.s} s and ${b.s} s`;
    }
  }
  const clause = t >= 60 ? 'Table 1' : 'clause 4 figures';
  return {
    limitC,
    surface,
    contactSeconds,
    bandC,
    basis: `ISO 13732-1 burn threshold (${clause}) for ${TOUCH_SURFACE_LABEL[surface]} at ${contactSeconds} s contact: ${how}${bandC ? ` (band ${bandC[0]}–${bandC[1]} °C)` : ''}.`,
  };
}

/** The touch surface of a jacket: its own class when it names one, else metal → bare metal and non-metal → plastics. */
export function touchSurfaceOf(jacket: { metal: boolean; touchSurface?: TouchSurface }): TouchSurface {
  return jacket.touchSurface ?? (jacket.metal ? 'bare-metal' : 'plastic');
}

/** What the project sets: a contact time (the limit follows the surface), or the two fixed numbers (an explicit override). */
export interface TouchCriterion {
  touchLimitMetalC: number;
  touchLimitNonMetalC: number;
  /** When set, the limit follows from the jacket's surface and this contact time (ISO 13732-1); the fixed numbers are then unused. */
  touchContactSeconds?: number;
}

/**
 * The touch limit a surface is held to — one rule for the recommendation, the review flags and the
 * line page. Fixed numbers: metal jackets (and bare steel) the metal limit, others the non-metal one.
 */
export function touchLimitFor(
  c: TouchCriterion,
  jacket: { metal: boolean; touchSurface?: TouchSurface },
): TouchLimit {
  const surface = touchSurfaceOf(jacket);
  if (c.touchContactSeconds !== undefined) return burnThresholdC(surface, c.touchContactSeconds);
  const limitC = jacket.metal ? c.touchLimitMetalC : c.touchLimitNonMetalC;
  return {
    limitC,
    surface,
    contactSeconds: NaN,
    bandC: null,
    basis: `Project's fixed touch limit for ${jacket.metal ? 'metal' : 'non-metal'} surfaces (${limitC} °C), set in place of the ISO 13732-1 contact-time threshold.`,
  };
}
