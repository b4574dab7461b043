/**
 * Finding the header row of a client's sheet (pure; the browser uses it when the user picks another
 * row). Real line lists carry a title, a revision block, notes and blank rows above the header, and
 * sometimes a second header row with the units ("°F", "in") under the names.
 */
import { matchHeader, normalizeHeader } from './mapping';

export type CellValue = string | number | boolean | null;
export interface GridRow {
  row: number;
  cells: CellValue[];
}

/** How many rows from the top are considered for the header. */
export const HEADER_SCAN_ROWS = 30;

const UNIT_TOKEN =
  /^[([]?\s*(°\s*[cf]|deg\s*[cf]|[cf]|°|mm|in|inch|inches|"|ft|feet|m|m2|m²|ft2|ft²|sq\s*ft|bar|barg|bar\s*\(?g\)?|psi|psig|kpa|kpa\s*\(?g\)?|kg\/h|kg\/s|t\/h|lb\/h|kj\/kg\s*k|kj\/\(kg·k\)|btu\/lb\s*°?f|dn|nps|-|–|%)\s*[)\]]?$/i;

const text = (c: CellValue) => (c === null ? '' : String(c).trim());

/**
 * A row's score as a header: distinct fields its cells name (an exact synonym counts 3, after
 * removing units 2, a synonym inside a longer text 1), less one per numeric cell (data rows hold
 * numbers, headers do not). A merged title repeats one text across cells and so counts once.
 */
export function scoreHeaderRow(cells: CellValue[]): number {
  const fields = new Map<string, number>();
  let numbers = 0;
  for (const c of cells) {
    if (typeof c === 'number') {
      numbers++;
      continue;
    }
    const m = matchHeader(text(c));
    if (m) fields.set(m.key, Math.max(fields.get(m.key) ?? 0, 3 - m.pass));
  }
  let score = 0;
  for (const v of fields.values()) score += v;
  return score - numbers;
}

/** True when every non-empty cell of the row is a unit ("°F", "(in)", "m") — a units row under the names. */
export function isUnitRow(cells: CellValue[]): boolean {
  const filled = cells.map(text).filter(Boolean);
  return (
    filled.length > 0 && cells.every((c) => typeof c !== 'number') && filled.every((t) => UNIT_TOKEN.test(t))
  );
}

/** The spreadsheet row (1-based) of the likeliest header among the first rows; the first row when none names a field. */
export function detectHeaderRow(grid: GridRow[]): number {
  let best = grid[0]?.row ?? 1,
    bestScore = 0;
  for (const r of grid.slice(0, HEADER_SCAN_ROWS)) {
    const s = scoreHeaderRow(r.cells);
    if (s > bestScore) {
      best = r.row;
      bestScore = s;
    }
  }
  return best;
}

/**
 * Headers and data rows for a chosen header row. A units row right under it is folded into the
 * names ("Temp" + "°F" → "Temp °F", so the unit is read from the header); so is a second name row
 * that makes the headers name more fields (a merged "Temperature" over "Normal" / "Max").
 * Rows above the header are not data.
 */
export function headerView(
  grid: GridRow[],
  headerRow: number,
): { headers: string[]; headerRows: number[]; dataStart: number } {
  const at = grid.findIndex((r) => r.row === headerRow);
  if (at < 0) return { headers: [], headerRows: [], dataStart: grid.length };
  const top = grid[at].cells.map(text);
  const next = grid[at + 1];
  if (next && next.row === headerRow + 1) {
    const below = next.cells.map(text);
    const width = Math.max(top.length, below.length);
    const joined = Array.from({ length: width }, (_, i) =>
      [top[i] ?? '', below[i] ?? ''].filter(Boolean).join(' '),
    );
    const noNumbers = next.cells.every((c) => typeof c !== 'number');
    if (
      isUnitRow(next.cells) ||
      (noNumbers &&
        scoreHeaderRow(joined) > scoreHeaderRow(top) &&
        scoreHeaderRow(below) > 0 &&
        !looksLikeData(below))
    ) {
      return { headers: joined, headerRows: [headerRow, next.row], dataStart: at + 2 };
    }
  }
  return { headers: top, headerRows: [headerRow], dataStart: at + 1 };
}

/** A text row that is more likely a line than a second header row: a tag-like code in it. */
function looksLikeData(cells: string[]): boolean {
  return cells.some(
    (t) =>
      /\d/.test(t) &&
      /^[A-Z0-9]+([-/"][A-Z0-9"]+)+$/i.test(t) &&
      normalizeHeader(t).length > 0 &&
      !matchHeader(t),
  );
}

/** A short text for choosing the header row in the wizard: the row's first non-empty cells. */
export function rowPreview(cells: CellValue[], max = 6): string {
  const parts = cells.map(text).filter(Boolean);
  const uniq = parts.filter((p, i) => parts.indexOf(p) === i);
  const s = uniq.slice(0, max).join(' · ');
  return s.length > 90 ? `${s.slice(0, 89)}…` : s;
}
