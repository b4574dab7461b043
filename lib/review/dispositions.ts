/**
 * Review dispositions per hazard, in our own words as the trade says them. A burn flag (surface over
 * the touch limit) and a sweat flag (surface under the dew point + margin) have different remedies:
 * a warning sign does nothing for a sweating line, and drip protection nothing for a hot one.
 * Pure: the review queue (client) and the store share it.
 */
export const DISPOSITIONS = [
  'insulate',
  'guard',
  'warning-sign',
  'not-accessible',
  'vapour-retarder-repair',
  'drip-protection',
  'returned',
] as const;
export type Disposition = (typeof DISPOSITIONS)[number];

export const DISPOSITION_LABEL: Record<Disposition, string> = {
  insulate: 'Insulate for protection (back to the engineer with the thickness)',
  guard: 'Guard or cage (stand-off shield)',
  'warning-sign': 'Warning sign and restricted access',
  'not-accessible': 'Accepted as not accessible (out of reach in operation)',
  'vapour-retarder-repair': 'Repair or seal the vapour retarder',
  'drip-protection': 'Accepted with drip protection (drip tray or drain)',
  returned: 'Returned to the engineer',
};

/** Dispositions for a surface that can burn (hot-surface flag). */
export const BURN_DISPOSITIONS: Disposition[] = ['insulate', 'guard', 'warning-sign', 'not-accessible'];
/** Dispositions for a surface that sweats (sweating flag). */
export const SWEAT_DISPOSITIONS: Disposition[] = ['insulate', 'vapour-retarder-repair', 'drip-protection'];

/** Dispositions that accept or work around a surface, or return it: each needs a comment saying why or where. */
export const NEEDS_COMMENT: Disposition[] = [
  'guard',
  'warning-sign',
  'not-accessible',
  'vapour-retarder-repair',
  'drip-protection',
  'returned',
];

/**
 * The dispositions that fit an item with these flag types: the burn list for a hot surface, the sweat
 * list for a sweating one (only what fits both when it has both); returning to the engineer always
 * fits. An item with neither hazard (missing data, a pick below a criterion, a layer over its
 * service temperature) names no hazard to fit, so every disposition stays open to the reviewer.
 */
export function dispositionsFor(flagTypes: readonly string[]): Disposition[] {
  let allowed: Disposition[] | null = null;
  const meet = (list: Disposition[]) => {
    allowed = allowed ? allowed.filter((d) => list.includes(d)) : [...list];
  };
  if (flagTypes.includes('hot-surface')) meet(BURN_DISPOSITIONS);
  if (flagTypes.includes('sweating')) meet(SWEAT_DISPOSITIONS);
  return allowed ? [...(allowed as Disposition[]), 'returned'] : [...DISPOSITIONS];
}
