/**
 * The line table's worst-margin column: the smallest margin of a candidate's surface temperatures
 * to the applicable limits (negative: a limit is not met). Pure, so the browser derives the column
 * from the row's numbers and limits instead of receiving it (lib/lines/deciding.ts re-exports it).
 */
export interface Margin {
  criterion: 'personnel' | 'condensation';
  marginK: number;
}

export function worstMargin(
  c: { personnelC: number | null; condensationC: number | null },
  limits: { personnelLimitC: number | null; condensationNeedC: number | null },
): Margin | null {
  const m: Margin[] = [];
  if (limits.personnelLimitC !== null && c.personnelC !== null)
    m.push({ criterion: 'personnel', marginK: limits.personnelLimitC - c.personnelC });
  if (limits.condensationNeedC !== null && c.condensationC !== null)
    m.push({ criterion: 'condensation', marginK: c.condensationC - limits.condensationNeedC });
  return m.length ? m.reduce((a, b) => (b.marginK < a.marginK ? b : a)) : null;
}
