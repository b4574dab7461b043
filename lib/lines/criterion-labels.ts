/**
 * What the pages call each criterion of the recommendation — the one copy for server pages and
 * client components (pure, no imports but the engine's type).
 */
import type { CriterionId } from '@/lib/thermal';

/** Full names (line page, reports). */
export const CRITERION_LABEL: Record<CriterionId, string> = {
  personnel: 'Personnel protection',
  condensation: 'Condensation control',
  heatLossLimit: 'Heat-loss limit',
  processDrop: 'Process temperature drop',
  freeze: 'Freeze protection',
  energyCode: 'Energy code minimum',
  economic: 'Economic thickness',
};

/** Short names for table columns. */
export const CRITERION_SHORT_LABEL: Record<CriterionId, string> = {
  personnel: 'Personnel',
  condensation: 'Condensation',
  heatLossLimit: 'Heat-loss limit',
  processDrop: 'Process drop',
  freeze: 'Freeze',
  energyCode: 'Energy code',
  economic: 'Economic',
};

/** The label of a stored criterion id; an id this version does not know is shown as stored. */
export const criterionLabel = (id: string, short = false): string =>
  (short ? CRITERION_SHORT_LABEL : CRITERION_LABEL)[id as CriterionId] ?? id;
