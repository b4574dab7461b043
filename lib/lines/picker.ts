/**
 * What the line table and a line's thickness picker show of the deciding numbers
 * (lib/lines/deciding.ts): the table carries only the candidate at the chosen (or recommended)
 * thickness and its worst margin; the picker reads every candidate when it opens.
 */
import type { DesignBasis } from './design-basis';
import type { LineInput } from './validate';
import { candidateNumbers, decidingLimits, worstMargin, type DecidingLimits } from './deciding';
import { decodeCandidate, type CandidateRow } from './candidate-row';
import { getDesignBasis, getDesignBasisShared } from './basis-store';
import { inputOf } from './result-row';
import { getLine, type LineQuery, lineTableOrder, lineTableRows } from './results-store';
import { tableReads } from './table-read-cache';
import { and, inArray, isNotNull } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineDesigns } from '@/db/schema';
import { describeDesign } from './vessel-parts';
import { formatterFor } from '@/lib/format';

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
  const stored = decodeCandidate(shown);
  const gap =
    (limits.personnelLimitC !== null && stored.personnelC === null) ||
    (limits.condensationNeedC !== null && stored.condensationC === null);
  const line = gap ? await loadLine() : (facts as LineInput);
  const [c] = candidateNumbers(basis, line, jacketId, [shown], limits).map(toPicker);
  return { limits, shown: c, worstMargin: worstMargin(c, limits) };
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
  const stored = result?.candidates ?? [];
  return { limits, candidates: candidateNumbers(basis, input, jacketId, stored, limits).map(toPicker) };
}

function toPicker(c: ReturnType<typeof candidateNumbers>[number]): PickerCandidate {
  // Five significant figures, as a picker shows them (the line page reads the stored values).
  return {
    mm: c.mm,
    heatFlow: sig(c.heatFlow, 5),
    surfaceC: c.heatLossC,
    personnelC: c.personnelC,
    condensationC: c.condensationC,
    ok: c.ok,
  };
}

/**
 * One page of the line table as `GET /api/v1/projects/:id/lines` sends it: the table's columns and
 * each row's deciding numbers at the chosen thickness (or the recommendation while nothing is
 * chosen) with the worst margin. The picker's thickness options come from `getPickerOptions`.
 */
export async function lineTablePage(q: LineQuery) {
  const reads = await tableReads();
  const { basis, revision } = await getDesignBasisShared({ projectId: q.projectId, reads });
  const { ids, total } = await lineTableOrder(q, revision, reads);
  // Rows are kept per line while nothing of the project changes (see lib/lines/table-read-cache.ts),
  // so paging through a big project reads and shapes each row once.
  const read = (some: readonly string[]) => shownRows(q.projectId, basis, revision, some);
  const byId = reads ? await reads.many(q.projectId, 'rows', ids, read, ROW_WEIGHT) : await read(ids);
  return { rows: ids.flatMap((id) => byId.get(id) ?? []), total, page: q.page, size: q.size };
}

/** A row kept weighs as much as 10 ids in the cache's bound (measured ~650 bytes of heap against ~72). */
const ROW_WEIGHT = 10;

/** The rows of these lines as the table shows them, by id. */
async function shownRows(projectId: string, basis: DesignBasis, revision: number, ids: readonly string[]) {
  const found = await lineTableRows(ids, revision);
  // Vessels picked part by part: the table says so in words ("shell 100 mm · bottom head 180 mm").
  const vesselIds = found.filter((x) => x.geometry === 'vessel' && x.chosenMm !== null).map((x) => x.id);
  const partRows = vesselIds.length
    ? await db
        .select({
          lineId: lineDesigns.lineId,
          thicknessMm: lineDesigns.thicknessMm,
          parts: lineDesigns.parts,
        })
        .from(lineDesigns)
        .where(and(inArray(lineDesigns.lineId, vesselIds), isNotNull(lineDesigns.parts)))
    : [];
  const fmt = formatterFor(basis);
  const partsText = new Map(
    partRows.map((x) => [x.lineId, describeDesign(x.thicknessMm, x.parts, (mm) => fmt.thickness(mm))]),
  );
  const rows = new Map<string, ShownRow>();
  for (const row of found) {
    const facts = row as LineFacts;
    const loadLine = async () => inputOf((await getLine({ projectId, lineId: row.id })).line);
    const d = await tableRowDeciding(basis, facts, row.jacketId, row.shownCandidate, loadLine);
    rows.set(row.id, shownRow(row, d, partsText.get(row.id) ?? null));
  }
  return rows;
}

type ShownRow = ReturnType<typeof shownRow>;

/**
 * A row as the table shows it, at the precision it shows (the sort ran on the stored values); written
 * out field by field (an object spread or rest of every row cost more than the rest of the work).
 */
function shownRow(
  row: Awaited<ReturnType<typeof lineTableRows>>[number],
  d: Awaited<ReturnType<typeof tableRowDeciding>>,
  chosenParts: string | null,
) {
  return {
    id: row.id,
    tag: row.tag,
    service: row.service,
    area: row.area,
    geometry: row.geometry,
    nps: row.nps,
    outsideDiameterMm: row.outsideDiameterMm,
    normalTempC: row.normalTempC,
    recommendedMm: row.recommendedMm,
    governing: row.governing,
    heatFlowPerUnit: row.heatFlowPerUnit === null ? null : sig(row.heatFlowPerUnit, 5),
    surfaceTempC: row.surfaceTempC === null ? null : Math.round(row.surfaceTempC * 100) / 100,
    unmet: row.unmet,
    solved: row.solved,
    chosenMm: row.chosenMm,
    chosenParts,
    source: row.source,
    belowCriterion: row.belowCriterion,
    needsRedecision: row.needsRedecision,
    designVersion: row.designVersion,
    stale: row.stale,
    personnelLimitC: d.limits.personnelLimitC,
    condensationNeedC: d.limits.condensationNeedC,
    // At chosenMm, else recommendedMm (the client knows which): the thickness is not repeated. The
    // worst margin is not sent either: the browser derives it from these and the limits
    // (`worstMargin` in lib/lines/margin.ts), which keeps a page of 100 rows under 60 KB.
    shown: d.shown && {
      heatFlow: d.shown.heatFlow,
      surfaceC: d.shown.surfaceC,
      personnelC: d.shown.personnelC,
      condensationC: d.shown.condensationC,
      ok: d.shown.ok,
    },
  };
}

const sig = (v: number, n: number) => (v === 0 ? 0 : Number(v.toPrecision(n)));
