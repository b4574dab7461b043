/**
 * What the line table and a line's thickness picker show of the deciding numbers
 * (lib/lines/deciding.ts): the table carries only the candidate at the chosen (or recommended)
 * thickness and its worst margin; the picker reads every candidate when it opens.
 */
import type { DesignBasis } from './design-basis';
import type { LineInput } from './validate';
import {
  candidateNumbers,
  decidingLimits,
  worstMargin,
  type CandidateRow,
  type DecidingLimits,
  type Margin,
} from './deciding';
import { getDesignBasis, getLine, inputOf } from './store';

/** One thickness option as the client receives it (surfaceC: the heat-loss conditions' surface). */
export interface PickerCandidate {
  mm: number;
  heatFlow: number;
  surfaceC: number;
  personnelC: number | null;
  condensationC: number | null;
  ok: boolean;
}

type LineFacts = Pick<LineInput, 'outdoor' | 'accessible' | 'normalTempC' | 'maxTempC' | 'purposes'>;

/**
 * The limits that apply to a table row, its shown candidate's numbers and the worst margin.
 * `loadLine` is called only for results stored before every candidate was swept (the missing
 * temperature is solved from the full line).
 */
export async function tableRowDeciding(
  basis: DesignBasis,
  facts: LineFacts,
  jacketId: string | null,
  shown: CandidateRow | null,
  loadLine: () => Promise<LineInput>,
) {
  const limits = decidingLimits(basis, facts, jacketId);
  if (!shown) return { limits, shown: null, worstMargin: null };
  const gap =
    (limits.personnelLimitC !== null && shown[4] === null) ||
    (limits.condensationNeedC !== null && (shown[7] ?? null) === null);
  const line = gap ? await loadLine() : (facts as LineInput);
  const [c] = candidateNumbers(basis, line, jacketId, [shown], limits).map(toPicker);
  return { limits, shown: c, worstMargin: worstMargin(c, limits) as Margin | null };
}

/** Every thickness option of one line with its deciding numbers, and the limits beside them. */
export async function getPickerOptions({
  projectId,
  lineId,
}: {
  projectId: string;
  lineId: string;
}): Promise<{ limits: DecidingLimits; candidates: PickerCandidate[] }> {
  const { line, result } = await getLine({ projectId, lineId });
  const { basis } = await getDesignBasis({ projectId });
  const input = inputOf(line);
  const jacketId = result?.jacketId ?? null;
  const limits = decidingLimits(basis, input, jacketId);
  const stored = (result?.candidates ?? []) as CandidateRow[];
  return { limits, candidates: candidateNumbers(basis, input, jacketId, stored, limits).map(toPicker) };
}

function toPicker(c: ReturnType<typeof candidateNumbers>[number]): PickerCandidate {
  return {
    mm: c.mm,
    heatFlow: c.heatFlow,
    surfaceC: c.heatLossC,
    personnelC: c.personnelC,
    condensationC: c.condensationC,
    ok: c.ok,
  };
}
