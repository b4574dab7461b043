/**
 * The building blocks every Lagwise PDF shares: @react-pdf/renderer loaded once with the app's own
 * shipped fonts (IBM Plex Sans and Mono, Noto Sans Math for ≤ → √ and the like; SIL Open Font
 * License 1.1, texts in ./fonts), the page frame (title block, running footer with page numbers)
 * and small tables. Server-only: PDFs are rendered in the web process or the worker, never the browser.
 *
 * The renderer is an ES module whose parts resolve only through `import`, so it is loaded with a
 * dynamic import (the tsx loader behind the CLI, the benchmarks and the worker would otherwise
 * `require` it); components below reference it at render time, after `pdfRenderer()` resolved.
 */
import path from 'node:path';
import type { ReactNode } from 'react';
import type * as ReactPdf from '@react-pdf/renderer';

type RP = typeof ReactPdf;
let R: RP | null = null;
let loading: Promise<RP> | null = null;

const FONT_DIR = path.join(process.cwd(), 'lib/documents/fonts');

/** The renderer, with the fonts registered (once per process). */
export function pdfRenderer(): Promise<RP> {
  loading ??= import('@react-pdf/renderer').then((m) => {
    const mod = (
      (m as unknown as { default?: RP }).default && !(m as RP).Font
        ? (m as unknown as { default: RP }).default
        : m
    ) as RP;
    const f = (name: string) => path.join(FONT_DIR, name);
    mod.Font.register({
      family: 'Plex',
      fonts: [
        { src: f('ibm-plex-sans-latin-400-normal.ttf') },
        { src: f('ibm-plex-sans-latin-400-italic.ttf'), fontStyle: 'italic' },
        { src: f('ibm-plex-sans-latin-600-normal.ttf'), fontWeight: 600 },
      ],
    });
    mod.Font.register({ family: 'Math', src: f('noto-sans-math-latin-400-normal.ttf') });
    // Engineering text must never break inside a word or a number.
    mod.Font.registerHyphenationCallback((word) => [word]);
    R = mod;
    return mod;
  });
  return loading;
}

function r(): RP {
  if (!R) throw new Error('pdfRenderer() must be awaited before rendering');
  return R;
}

/** Characters the shipped fonts lack, written with ones they have. */
export function pdfSafe(s: string): string {
  return s
    .replace(/₂/g, '2')
    .replace(/\u00a0/g, ' ')
    .replace(/\u202f/g, ' ');
}

export const INK = '#1f2a33';
export const MUTED = '#5b6975';
export const RULE = '#b8c2ca';
export const ACCENT = '#1d5c63';
export const ALARM = '#a3261b';
export const SHADE = '#eef2f4';

const FONT = ['Plex', 'Math'];
const LH = {};

export type Style = Record<string, string | number | undefined>;

export function Txt({ children, style }: { children?: ReactNode; style?: Style | Style[] }) {
  const { Text } = r();
  return (
    <Text style={[LH, ...(Array.isArray(style) ? style : style ? [style] : [])] as never}>{children}</Text>
  );
}

export function Box({
  children,
  style,
  wrap,
  minPresenceAhead,
}: {
  children?: ReactNode;
  style?: Style | Style[];
  wrap?: boolean;
  minPresenceAhead?: number;
}) {
  const { View } = r();
  return (
    <View style={style as never} wrap={wrap} minPresenceAhead={minPresenceAhead}>
      {children}
    </View>
  );
}

export interface FrameInfo {
  /** Left of the title block: the organization and project. */
  organization: string;
  projectLine: string;
  /** Document kind, e.g. "Insulation calculation sheet". */
  title: string;
  /** Right of the title block, e.g. "Line 10-HS-1001" / "Revision 2". */
  reference: string;
  /** Small print under the reference (dates, revisions). */
  meta: string[];
  footer: string;
}

/** One A4 page with the title block on the first page and the footer with page numbers on every page. */
export function FramedPage({
  info,
  children,
  titleBlock = true,
}: {
  info: FrameInfo;
  children: ReactNode;
  titleBlock?: boolean;
}) {
  const { Page, Text, View } = r();
  return (
    <Page
      size="A4"
      style={{
        fontFamily: FONT as never,
        fontSize: 8.5,
        color: INK,
        paddingTop: 36,
        paddingBottom: 48,
        paddingHorizontal: 40,
      }}
    >
      {titleBlock ? (
        <View style={{ flexDirection: 'row', borderWidth: 1, borderColor: INK, marginBottom: 12 }}>
          <View style={{ flex: 3, padding: 6, borderRightWidth: 1, borderColor: INK }}>
            <Text style={{ fontSize: 7, color: MUTED }}>{pdfSafe(info.organization)}</Text>
            <Text style={{ fontSize: 9.5, fontWeight: 600 }}>{pdfSafe(info.projectLine)}</Text>
            <Text style={{ fontSize: 13, fontWeight: 600, color: ACCENT, marginTop: 2 }}>{info.title}</Text>
          </View>
          <View style={{ flex: 2, padding: 6 }}>
            <Text style={{ fontSize: 11, fontWeight: 600 }}>{pdfSafe(info.reference)}</Text>
            {info.meta.map((m, i) => (
              <Text key={i} style={{ fontSize: 7, color: MUTED }}>
                {pdfSafe(m)}
              </Text>
            ))}
          </View>
        </View>
      ) : null}
      {/* No lineHeight on the page: inherited by the dynamic page-number text, it hides it (texts set their own). */}
      {children}
      <Text
        fixed
        style={{
          position: 'absolute',
          bottom: 18,
          left: 40,
          right: 110,
          fontSize: 6.5,
          color: MUTED,
          borderTopWidth: 0.5,
          borderColor: RULE,
          paddingTop: 3,
        }}
      >
        {pdfSafe(info.footer)}
      </Text>
      <Text
        fixed
        style={{ position: 'absolute', bottom: 18, right: 40, fontSize: 6.5 }}
        render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`}
      />
    </Page>
  );
}

export function Heading({ children, first = false }: { children: ReactNode; first?: boolean }) {
  const { Text } = r();
  return (
    <Text
      minPresenceAhead={60}
      style={{
        fontSize: 10,
        fontWeight: 600,
        color: ACCENT,
        marginTop: first ? 0 : 10,
        marginBottom: 4,
        paddingBottom: 2,
        borderBottomWidth: 0.75,
        borderColor: ACCENT,
      }}
    >
      {children}
    </Text>
  );
}

/** Label/value pairs in two columns of pairs. */
export function Pairs({ items, columns = 2 }: { items: [string, string][]; columns?: 1 | 2 }) {
  const { View, Text } = r();
  const rows: [string, string][][] = [];
  for (let i = 0; i < items.length; i += columns) rows.push(items.slice(i, i + columns));
  return (
    <View>
      {rows.map((row, i) => (
        <View
          key={i}
          wrap={false}
          style={{ flexDirection: 'row', borderBottomWidth: 0.25, borderColor: RULE, paddingVertical: 1.5 }}
        >
          {row.map(([k, v], j) => (
            <View key={j} style={{ flex: 1, flexDirection: 'row', paddingRight: 6 }}>
              <Text style={{ width: columns === 1 ? 150 : 95, color: MUTED }}>{pdfSafe(k)}</Text>
              <Text style={{ flex: 1 }}>{pdfSafe(v)}</Text>
            </View>
          ))}
          {row.length < columns ? <View style={{ flex: 1 }} /> : null}
        </View>
      ))}
    </View>
  );
}

export interface Column {
  header: string;
  width: number;
  align?: 'left' | 'right';
}

/** A ruled table; `widths` are flex weights. Rows may mark themselves shaded or alarmed. */
export function Table({
  columns,
  rows,
  fontSize = 7.5,
}: {
  columns: Column[];
  rows: { cells: string[]; shade?: boolean; alarm?: boolean; bold?: boolean }[];
  fontSize?: number;
}) {
  const { View, Text } = r();
  const cell = (c: Column, text: string, key: number, extra: Style = {}) => (
    <Text
      key={key}
      style={{ flex: c.width, textAlign: c.align ?? 'left', paddingHorizontal: 2, ...extra } as never}
    >
      {pdfSafe(text)}
    </Text>
  );
  return (
    <View style={{ borderTopWidth: 0.75, borderBottomWidth: 0.75, borderColor: INK, fontSize }}>
      <View
        fixed
        style={{
          flexDirection: 'row',
          backgroundColor: SHADE,
          borderBottomWidth: 0.5,
          borderColor: INK,
          paddingVertical: 2,
        }}
      >
        {columns.map((c, i) => cell(c, c.header, i, { fontWeight: 600 }))}
      </View>
      {rows.map((row, i) => (
        <View
          key={i}
          wrap={false}
          style={{
            flexDirection: 'row',
            paddingVertical: 1.5,
            borderBottomWidth: i === rows.length - 1 ? 0 : 0.25,
            borderColor: RULE,
            backgroundColor: row.shade ? '#f6f8f9' : undefined,
          }}
        >
          {columns.map((c, j) =>
            cell(c, row.cells[j] ?? '', j, {
              color: row.alarm ? ALARM : INK,
              fontWeight: row.bold ? 600 : 400,
            }),
          )}
        </View>
      ))}
    </View>
  );
}

/** A boxed note (cautions, warnings). */
export function Note({
  title,
  lines,
  tone = 'caution',
}: {
  title: string;
  lines: string[];
  tone?: 'caution' | 'plain';
}) {
  const { View, Text } = r();
  return (
    <View
      wrap={false}
      style={{
        borderWidth: 0.75,
        borderColor: tone === 'caution' ? '#b7791f' : RULE,
        backgroundColor: tone === 'caution' ? '#fdf6e7' : '#ffffff',
        padding: 5,
        marginTop: 6,
      }}
    >
      <Text style={{ fontWeight: 600, marginBottom: 2 }}>{title}</Text>
      {lines.map((l, i) => (
        <Text key={i} style={{ fontSize: 7.5 }}>
          {pdfSafe(l)}
        </Text>
      ))}
    </View>
  );
}

/** Renders a document element to bytes. */
export async function renderPdf(doc: () => ReactNode): Promise<Buffer> {
  const mod = await pdfRenderer();
  return mod.renderToBuffer(doc() as never);
}

export function Doc({ title, children }: { title: string; children: ReactNode }) {
  const { Document } = r();
  return (
    <Document title={pdfSafe(title)} author="Lagwise" creator="Lagwise" producer="Lagwise">
      {children}
    </Document>
  );
}

/** Line chart primitives for the cost curve and the budget bars. */
export function svg() {
  const { Svg, Line, Polyline, Rect, Circle, Text, G } = r();
  return { Svg, Line, Polyline, Rect, Circle, Text, G };
}

/** The cautions every deliverable carries (burns, condensation, freezing; local codes decide). */
export const CAUTIONS = [
  'Results are engineering estimates by published methods (ASTM C680 / ISO 12241 conduction with temperature-dependent conductivity, Churchill–Chu and Churchill–Bernstein outside films with radiation, IAPWS-IF97 steam). Material data are typical values: verify them with the manufacturer before issue.',
  'Burns: a surface that stays above the touch limit can burn on contact. Guards, signs and access decisions follow local codes and a qualified person, not this calculation alone.',
  'Condensation: a cold surface below the dew point wets, corrodes under insulation and can freeze; the vapour retarder must be continuous and maintained. Design conditions that are exceeded on site void the check.',
  'Freezing: stagnant water lines freeze after the stated time whatever the thickness; insulation delays freezing, it does not prevent it. Heat tracing or draining decisions follow local practice.',
];
