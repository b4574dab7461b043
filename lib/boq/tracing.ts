/**
 * The bill's heat-tracing schedule: per counted traced line, the tracer duty and length at its chosen
 * thickness (lib/lines/tracing.ts — IEEE 515 / IEC/IEEE 60079-30-2 sizing basis), made into its own sheet of the
 * contractor's workbook by lib/boq/tracing-sheet.ts. Kept apart from the insulation quantities (lib/boq/quantities.ts).
 */
import { and, eq, isNotNull } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineDesigns, lineResults, lines } from '@/db/schema';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { lineTracing, TRACING_REASON_LABEL } from '@/lib/lines/tracing';
import { compareTags } from '@/lib/lines/natural-sort';

import type { TracingRow } from './tracing-sheet';

export type { TracingRow };

const r = (v: number, d = 3) => Math.round(v * 10 ** d) / 10 ** d;

/** The traced lines among the tags the bill counts, at their chosen thicknesses, in tag order. */
export async function tracingSchedule({
  projectId,
  basis,
  countedTags,
}: {
  projectId: string;
  basis: DesignBasis;
  countedTags: string[];
}): Promise<TracingRow[]> {
  if (!countedTags.length) return [];
  const rows = await db
    .select({ line: lines, tracing: lineResults.tracing, mm: lineDesigns.thicknessMm })
    .from(lines)
    .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
    .innerJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(and(eq(lines.projectId, projectId), isNotNull(lineResults.tracing)));
  const counted = new Set(countedTags);
  const out: TracingRow[] = [];
  for (const { line, tracing, mm } of rows) {
    if (!counted.has(line.tag)) continue;
    const t = lineTracing(basis, line, tracing, mm);
    if (!t || t.tracerM === null || t.lengthM === null) continue;
    out.push({
      tag: line.tag,
      area: line.area,
      size: line.nps ? `NPS ${line.nps}` : line.outsideDiameterMm ? `OD ${line.outsideDiameterMm} mm` : '—',
      reason: TRACING_REASON_LABEL[t.reason],
      thicknessMm: t.thicknessMm,
      maintainC: t.maintainC,
      ambientC: t.airC,
      windMs: t.windMs,
      heatLossWPerM: r(t.heatLossWPerM),
      safetyFactor: t.safetyFactor,
      requiredWPerM: r(t.requiredWPerM),
      runM: t.lengthM,
      tracerM: r(t.tracerM),
      requiredW: r(t.requiredW),
    });
  }
  return out.sort((a, b) => compareTags(a.tag, b.tag));
}
