/**
 * The project design report: cover, design basis with sources, method statement, summaries by area
 * and by governing criterion, the heat-loss budget against its allocation with a chart, review
 * status and sign-offs, the lines below a hard criterion with their reasons, and the cautions.
 * Totals come from the budget's own dashboard (lib/budget/store.ts), so the report and the budget
 * page cannot disagree.
 */
import { asc, eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import {
  lineDesigns,
  lineListRevisions,
  lineResults,
  lines,
  reviewItems,
  reviewRounds,
  users,
} from '@/db/schema';
import { dashboard } from '@/lib/budget/store';
import { formatterFor, sig, type Formatter } from '@/lib/format';
import { catalogueOf } from '@/lib/lines/catalogue';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { CALCULATION_VERSION } from '@/lib/thermal';
import {
  ACCENT,
  ALARM,
  Box,
  CAUTIONS,
  Doc,
  FramedPage,
  Heading,
  INK,
  MUTED,
  Note,
  Pairs,
  RULE,
  Table,
  Txt,
  pdfSafe,
  renderPdf,
  svg,
  type FrameInfo,
} from './pdf-kit';
import { CRITERION_LABEL, CRITERION_METHOD, touchLimitText } from './sheet-model';
import { projectHeader } from './sheets';

export interface ReportIssueInfo {
  number: number | null;
  issuedAt: Date;
  issuedBy: string;
  note: string;
  history: { number: number; issuedAt: Date; issuedBy: string; note: string }[];
}

type Dash = Awaited<ReturnType<typeof dashboard>>;

export interface ReportData {
  organization: string;
  project: { code: string; name: string; site: string | null };
  basis: DesignBasis;
  basisRevision: number;
  lineListRevision: number | null;
  calcVersion: string;
  dash: Dash;
  counts: { lines: number; solved: number; stale: number; decided: number; flagged: number; unmet: number };
  byArea: { area: string; lines: number; decided: number; flagged: number }[];
  byGoverning: { governing: string; lines: number; lengthM: number; areaM2: number }[];
  rounds: {
    number: number;
    status: string;
    requestedAt: Date;
    requester: string;
    signedOffAt: Date | null;
    signer: string | null;
    items: number;
    decided: number;
  }[];
  below: { tag: string; area: string; chosenMm: number | null; criteria: string; reason: string }[];
}

/** Everything the report states, read from the database. */
export async function reportData(projectId: string): Promise<ReportData> {
  const p = await projectHeader(projectId);
  const { basis, revision } = await getDesignBasis({ projectId });
  const dash = await dashboard({ projectId });
  const [ll] = await db
    .select({ n: sql<number | null>`max(${lineListRevisions.number})` })
    .from(lineListRevisions)
    .where(eq(lineListRevisions.projectId, projectId));
  const rows = await db
    .select({
      tag: lines.tag,
      area: lines.area,
      lengthM: lines.lengthM,
      surfaceAreaM2: lines.surfaceAreaM2,
      geometry: lines.geometry,
      inputVersion: lines.inputVersion,
      resultInput: lineResults.inputVersion,
      basisRevision: lineResults.basisRevision,
      calcVersion: lineResults.calcVersion,
      governing: lineResults.governing,
      unmet: lineResults.unmet,
      solved: lineResults.lineId,
      chosenMm: lineDesigns.thicknessMm,
      below: lineDesigns.belowCriterion,
      reason: lineDesigns.reason,
    })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(eq(lines.projectId, projectId))
    .orderBy(asc(lines.tag));
  const counts = { lines: rows.length, solved: 0, stale: 0, decided: 0, flagged: 0, unmet: 0 };
  const areas = new Map<string, { area: string; lines: number; decided: number; flagged: number }>();
  const gov = new Map<string, { governing: string; lines: number; lengthM: number; areaM2: number }>();
  const below: ReportData['below'] = [];
  for (const r of rows) {
    const flagged = !!r.below || (r.unmet?.length ?? 0) > 0;
    if (r.solved) counts.solved++;
    if (
      !r.solved ||
      r.resultInput !== r.inputVersion ||
      r.basisRevision !== revision ||
      r.calcVersion !== CALCULATION_VERSION
    )
      counts.stale++;
    if (r.chosenMm !== null) counts.decided++;
    if (flagged) counts.flagged++;
    if ((r.unmet?.length ?? 0) > 0) counts.unmet++;
    const a = areas.get(r.area) ?? { area: r.area, lines: 0, decided: 0, flagged: 0 };
    a.lines++;
    if (r.chosenMm !== null) a.decided++;
    if (flagged) a.flagged++;
    areas.set(r.area, a);
    const g = r.solved ? (r.governing ?? 'none') : 'not solved';
    const x = gov.get(g) ?? { governing: g, lines: 0, lengthM: 0, areaM2: 0 };
    x.lines++;
    x.lengthM += r.lengthM ?? 0;
    x.areaM2 += r.geometry === 'vessel' || r.geometry === 'flat' ? (r.surfaceAreaM2 ?? 0) : 0;
    gov.set(g, x);
    if (r.below || (r.unmet?.length ?? 0) > 0) {
      const crit = [...new Set([...(r.below ? r.below.split(',') : []), ...(r.unmet ?? [])])]
        .map((c) => CRITERION_LABEL[c] ?? c)
        .join(', ');
      below.push({
        tag: r.tag,
        area: r.area,
        chosenMm: r.chosenMm,
        criteria: crit,
        reason: r.below ? (r.reason ?? '—') : 'no standard thickness meets it',
      });
    }
  }
  const signer = sql<
    string | null
  >`(select name from ${users} where ${users.id} = ${reviewRounds.signedOffBy})`;
  const rounds = await db
    .select({
      number: reviewRounds.number,
      status: reviewRounds.status,
      requestedAt: reviewRounds.requestedAt,
      requester: users.name,
      signedOffAt: reviewRounds.signedOffAt,
      signer,
      items: sql<number>`(select count(*)::int from ${reviewItems} i where i.round_id = ${reviewRounds.id})`,
      decided: sql<number>`(select count(*)::int from ${reviewItems} i where i.round_id = ${reviewRounds.id} and i.disposition is not null)`,
    })
    .from(reviewRounds)
    .innerJoin(users, eq(users.id, reviewRounds.requestedBy))
    .where(eq(reviewRounds.projectId, projectId))
    .orderBy(asc(reviewRounds.number));
  return {
    organization: p.organization,
    project: p.project,
    basis,
    basisRevision: revision,
    lineListRevision: ll?.n ?? null,
    calcVersion: CALCULATION_VERSION,
    dash,
    counts,
    byArea: [...areas.values()].sort((a, b) => a.area.localeCompare(b.area)),
    byGoverning: [...gov.values()].sort((a, b) => b.lines - a.lines),
    rounds,
    below,
  };
}

const kw = (u: Formatter, v: number | null | undefined) =>
  u.power(v === null || v === undefined ? v : v * 1000);

function BudgetChart({ d, u }: { d: ReportData; u: Formatter }) {
  const { Svg, Line, Rect, Text, G } = svg();
  const areas = d.dash.areas;
  if (!areas.length) return null;
  const W = 515,
    rowH = 16,
    L = 120,
    Rm = 60,
    H = areas.length * rowH + 24;
  const max = Math.max(...areas.map((a) => Math.max(a.designedKW, a.allocationKW ?? 0, 0))) * 1.05 || 1;
  const xAt = (v: number) => L + (v / max) * (W - L - Rm);
  return (
    <Box wrap={false} style={{ marginTop: 6 }}>
      <Svg width={W} height={H}>
        {areas.map((a, i) => {
          const y = 4 + i * rowH;
          return (
            <G key={a.area}>
              <Text x={L - 4} y={y + 9} style={{ fontSize: 6.5 }} textAnchor="end" fill={INK}>
                {pdfSafe(a.area.slice(0, 28))}
              </Text>
              <Rect
                x={L}
                y={y + 2}
                width={Math.max(0.5, xAt(a.designedKW) - L)}
                height={9}
                fill={a.over ? ALARM : ACCENT}
              />
              {a.allocationKW !== null ? (
                <Line
                  x1={xAt(a.allocationKW)}
                  x2={xAt(a.allocationKW)}
                  y1={y}
                  y2={y + 13}
                  stroke={INK}
                  strokeWidth={1.2}
                />
              ) : null}
              <Text
                x={xAt(Math.max(a.designedKW, a.allocationKW ?? 0)) + 4}
                y={y + 9}
                style={{ fontSize: 6 }}
                fill={MUTED}
              >
                {pdfSafe(kw(u, a.designedKW))}
              </Text>
            </G>
          );
        })}
        <Line x1={L} x2={L} y1={0} y2={H - 18} stroke={RULE} strokeWidth={0.6} />
        <Text x={L} y={H - 6} style={{ fontSize: 6 }} fill={MUTED}>
          {pdfSafe(
            `Bars: designed heat loss per area (red: over its allocation). Tick: the allocation. Scale 0 – ${kw(u, max)}.`,
          )}
        </Text>
      </Svg>
    </Box>
  );
}

export function ReportDocument({ d, issue }: { d: ReportData; issue: ReportIssueInfo }) {
  const u = formatterFor(d.basis);
  const b = d.basis;
  const cat = catalogueOf(b);
  const rev = issue.number === null ? 'DRAFT (not issued)' : `Revision ${issue.number}`;
  const info: FrameInfo = {
    organization: d.organization,
    projectLine: `${d.project.code} · ${d.project.name}${d.project.site ? ` · ${d.project.site}` : ''}`,
    title: 'Insulation design report',
    reference: rev,
    meta: [
      `${issue.number === null ? 'Printed' : 'Issued'} ${issue.issuedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC by ${issue.issuedBy}`,
      `Design basis revision ${d.basisRevision} · line-list revision ${d.lineListRevision ?? '—'} · calculation version ${d.calcVersion}`,
      `Units ${u.system}${u.series === 'inch' ? ', inch series' : ''}, currency ${u.currency}`,
    ],
    footer: `${d.project.code} insulation design report, ${rev}. Engineering estimate: verify material data with the manufacturer; safety decisions follow local codes and a qualified person.`,
  };
  const side = (k: 'heatLoss' | 'personnel' | 'condensation') =>
    (['outdoor', 'indoor'] as const)
      .map((s) => {
        const c = b.conditions[k][s] as { airC: number; windMs: number; relativeHumidityPct?: number };
        return `${s} ${u.temp(c.airC)}, ${sig(c.windMs, 3)} m/s${c.relativeHumidityPct !== undefined ? `, ${sig(c.relativeHumidityPct, 3)} % RH` : ''}`;
      })
      .join('; ');
  const dash = d.dash;
  const budget = dash.budget;
  const history = [
    ...issue.history,
    ...(issue.number !== null
      ? [{ number: issue.number, issuedAt: issue.issuedAt, issuedBy: issue.issuedBy, note: issue.note }]
      : []),
  ];
  return (
    <Doc title={`${d.project.code} insulation design report ${rev}`}>
      <FramedPage info={info}>
        <Heading first>Summary</Heading>
        <Pairs
          items={[
            ['Lines', `${d.counts.lines} (${d.counts.solved} solved, ${d.counts.stale} stale)`],
            ['Decided', `${d.counts.decided} of ${d.counts.lines}`],
            ['Flagged', `${d.counts.flagged} (${d.counts.unmet} with a criterion no thickness meets)`],
            [
              'Review rounds',
              `${d.rounds.length} (${d.rounds.filter((r) => r.status === 'signed-off').length} signed off)`,
            ],
            ['Designed heat loss', kw(u, dash.designed.kW)],
            ['Bare heat loss', kw(u, dash.bare.kW)],
            [
              'Saved against bare',
              `${kw(u, dash.savings.kW)} · ${u.energy(dash.savings.mwhPerYear)} a year · ${u.money(dash.savings.costPerYear)} a year`,
            ],
            [
              'Budget',
              budget
                ? `${kw(u, budget.totalKW)}; ${u.energy(budget.totalMWhPerYear)} a year`
                : 'no budget set',
            ],
            [
              'Designed, annual',
              `${u.energy(dash.designed.mwhPerYear)} · ${u.money(dash.designed.costPerYear)} · ${sig(dash.designed.co2TonnesPerYear, 3)} t CO2`,
            ],
            ['Lines without length', `${dash.incompleteCount} (not in the totals)`],
          ]}
        />
        {dash.warnings.length ? <Note title="Budget warnings" lines={dash.warnings} /> : null}
        <Heading>Revisions</Heading>
        {history.length ? (
          <Table
            columns={[
              { header: 'Rev.', width: 1 },
              { header: 'Issued (UTC)', width: 3 },
              { header: 'By', width: 3 },
              { header: 'Note', width: 8 },
            ]}
            rows={history.map((h) => ({
              cells: [
                String(h.number),
                h.issuedAt.toISOString().slice(0, 16).replace('T', ' '),
                h.issuedBy,
                h.note || '—',
              ],
              bold: h.number === issue.number,
            }))}
          />
        ) : (
          <Txt>Not issued yet: this is a draft print.</Txt>
        )}

        <Heading>1. Design basis</Heading>
        <Pairs
          columns={1}
          items={[
            ['Heat-loss conditions', side('heatLoss')],
            ['Personnel conditions', side('personnel')],
            ['Condensation conditions', side('condensation')],
            [
              'Freeze conditions',
              `${u.temp(b.conditions.freeze.airC)}, ${sig(b.conditions.freeze.windMs, 3)} m/s; water from ${u.temp(b.freeze.initialWaterTempC)}, ${sig(b.freeze.requiredHours, 3)} h, ${sig(b.freeze.iceFractionPct, 3)} % ice allowed (common practice: 25 %)`,
            ],
            ['Touch limit', touchLimitText(b, u)],
            ['Dew-point margin', u.tempDelta(b.dewPointMarginK).replace(/^\+/, '')],
            [
              'Heat-loss limit',
              b.heatLossLimitWPerM !== undefined ? u.linearLoss(b.heatLossLimitWPerM) : 'none',
            ],
            ['Process temperature change', `at most ${u.tempDelta(b.maxProcessDropK).replace(/^\+/, '')}`],
            [
              'Energy code',
              b.energyCode === 'ashrae-90.1'
                ? 'ASHRAE 90.1 Table 6.8.3-1 minimum is a hard criterion'
                : 'none',
            ],
            [
              'Economics',
              `energy ${u.currency} ${sig(b.economics.energyPricePerKWh, 3)}/kWh at ${sig(b.economics.efficiency * 100, 3)} % efficiency, ${sig(b.economics.hoursPerYear, 4)} h a year, ${sig(b.economics.discountRate * 100, 3)} % discount, ${b.economics.lifeYears} years, ${sig(b.economics.escalationRate * 100, 3)} % escalation, ${sig(b.economics.co2KgPerKWh, 3)} kg CO2/kWh; ${b.economics.economicChoice === 'thinnest-within-range' ? 'thinnest within' : 'optimum, flat range'} ${sig(b.economics.flatRangePct ?? 2, 2)} %`,
            ],
            [
              'Fittings (equivalent lengths)',
              `elbow ${sig(b.fittings.elbowM, 3)} m, tee ${sig(b.fittings.teeM, 3)} m, valve ${sig(b.fittings.valveM, 3)} m, flange pair ${sig(b.fittings.flangePairM, 3)} m, support ${sig(b.fittings.supportM, 3)} m at ${sig(b.fittings.supportsPerM, 3)} per m${b.fittings.valvesBare ? '; valves and flanges bare' : ''} (common-practice values; the project's specification replaces them)`,
            ],
          ]}
        />
        <Txt style={{ fontWeight: 600, marginTop: 5, marginBottom: 2 }}>
          Material systems by normal temperature
        </Txt>
        <Table
          columns={[
            { header: 'Band', width: 3 },
            { header: 'Pipe insulation (inner + outer)', width: 6 },
            { header: 'Vessels and flat', width: 4 },
            { header: 'Jacket', width: 4 },
          ]}
          rows={b.systems.map((s) => ({
            cells: [
              `${u.temp(s.fromC)} to ${u.temp(s.toC)}`,
              [s.innerId, s.outerId]
                .filter(Boolean)
                .map((id) => cat.materials.get(id!)?.name ?? id)
                .join(' + '),
              s.flatOuterId ? (cat.materials.get(s.flatOuterId)?.name ?? s.flatOuterId) : 'as pipe',
              `${cat.jackets.get(s.jacketId)?.name ?? s.jacketId} (ε ${sig(cat.jackets.get(s.jacketId)?.emittance, 2)})`,
            ],
          }))}
        />
        <Txt style={{ fontWeight: 600, marginTop: 5, marginBottom: 2 }}>
          Sources of material and jacket data
        </Txt>
        <Table
          fontSize={6.8}
          columns={[
            { header: 'Material or jacket', width: 3 },
            { header: 'Service range / emittance', width: 3 },
            { header: 'Source', width: 10 },
          ]}
          rows={[
            ...new Set(
              b.systems.flatMap((s) => [s.innerId, s.outerId, s.flatOuterId].filter(Boolean) as string[]),
            ),
          ]
            .map((id) => {
              const m = cat.materials.get(id);
              return {
                cells: [
                  m?.name ?? id,
                  m ? `${u.temp(m.minServiceC)} to ${u.temp(m.maxServiceC)}` : '—',
                  (m as { source?: string } | undefined)?.source ?? '—',
                ],
              };
            })
            .concat(
              [...new Set(b.systems.map((s) => s.jacketId))].map((id) => {
                const j = cat.jackets.get(id);
                return {
                  cells: [
                    j?.name ?? id,
                    j ? `ε ${sig(j.emittance, 2)}, ${j.metal ? 'metal' : 'non-metal'}` : '—',
                    j?.source ?? '—',
                  ],
                };
              }),
            )}
        />

        <Heading>2. Method statement</Heading>
        {[
          "Conduction through each layer by ASTM C680 / ISO 12241 with temperature-dependent conductivity (the integral of k over the layer's temperatures, closed form for linear and tabulated k).",
          'Outside films: natural convection by Churchill–Chu (horizontal cylinder, vertical plate), forced convection by Churchill–Bernstein (cylinder in cross-flow), combined by the surface law with grey-body radiation to the surroundings; air properties from the U.S. Standard Atmosphere formulas.',
          'Steam properties by IAPWS-IF97. Dew and frost points by the Magnus form (Alduchov & Eskridge 1996).',
          'Vessels: a vertical shell plus two flat heads of the same bare area; heat loss over all parts, touch and dew checks on the worst part.',
          'Fittings and supports as equivalent lengths of insulated pipe (bare where the project says so).',
          ...Object.entries(CRITERION_METHOD).map(([id, m]) => `${CRITERION_LABEL[id]}: ${m}`),
          'The recommendation is the largest thickness any applicable criterion requires, on a system whose layers stay within their service temperatures; the criterion that sets it is named as governing.',
        ].map((t, i) => (
          <Txt key={i} style={{ marginBottom: 1.5 }}>
            {pdfSafe(`• ${t}`)}
          </Txt>
        ))}

        <Heading>3. Summary by area</Heading>
        <Table
          columns={[
            { header: 'Area', width: 4 },
            { header: 'Lines', width: 1.3, align: 'right' },
            { header: 'Decided', width: 1.5, align: 'right' },
            { header: 'Flagged', width: 1.5, align: 'right' },
            { header: `Bare (${u.units.power})`, width: 2, align: 'right' },
            { header: `Designed (${u.units.power})`, width: 2, align: 'right' },
            { header: `Allocation (${u.units.power})`, width: 2, align: 'right' },
          ]}
          rows={[
            ...d.byArea.map((a) => {
              const x = dash.areas.find((y) => y.area === a.area);
              return {
                cells: [
                  a.area || '—',
                  String(a.lines),
                  String(a.decided),
                  String(a.flagged),
                  kw(u, x?.bareKW).replace(/ (kW|Btu\/h)$/, ''),
                  kw(u, x?.designedKW).replace(/ (kW|Btu\/h)$/, ''),
                  x?.allocationKW === null || x === undefined
                    ? '—'
                    : kw(u, x.allocationKW).replace(/ (kW|Btu\/h)$/, ''),
                ],
                alarm: x?.over,
              };
            }),
            {
              cells: [
                'Total',
                String(d.counts.lines),
                String(d.counts.decided),
                String(d.counts.flagged),
                kw(u, dash.bare.kW).replace(/ (kW|Btu\/h)$/, ''),
                kw(u, dash.designed.kW).replace(/ (kW|Btu\/h)$/, ''),
                budget ? kw(u, budget.totalKW).replace(/ (kW|Btu\/h)$/, '') : '—',
              ],
              bold: true,
            },
          ]}
        />
        <Txt style={{ fontWeight: 600, marginTop: 6, marginBottom: 2 }}>By governing criterion</Txt>
        <Table
          columns={[
            { header: 'Governing criterion', width: 4 },
            { header: 'Lines', width: 1.5, align: 'right' },
            { header: `Pipe length (${u.units.length})`, width: 2, align: 'right' },
            { header: `Vessel and flat area (${u.units.area})`, width: 2.5, align: 'right' },
          ]}
          rows={d.byGoverning.map((g) => ({
            cells: [
              CRITERION_LABEL[g.governing] ?? g.governing,
              String(g.lines),
              u.length(g.lengthM).replace(/ (m|ft)$/, ''),
              u.area(g.areaM2).replace(/ (m²|ft²)$/, ''),
            ],
          }))}
        />

        <Heading>4. Heat-loss budget</Heading>
        <Pairs
          items={[
            ['Designed total', kw(u, dash.designed.kW)],
            ['Budget', budget ? kw(u, budget.totalKW) : 'none'],
            ['Straight runs', kw(u, dash.straightKW)],
            ['Fittings and supports', kw(u, dash.fittingsKW)],
            ['Designed annual', u.energy(dash.designed.mwhPerYear)],
            ['Annual budget', budget ? u.energy(budget.totalMWhPerYear) : 'none'],
            ["Cold lines' heat gain", kw(u, dash.coldGainKW)],
            ['Margin to budget', budget ? kw(u, budget.totalKW - dash.designed.kW) : '—'],
          ]}
        />
        <BudgetChart d={d} u={u} />

        <Heading>5. Safety review</Heading>
        {d.rounds.length ? (
          <Table
            columns={[
              { header: 'Round', width: 1 },
              { header: 'Requested (UTC)', width: 3 },
              { header: 'By', width: 3 },
              { header: 'Items', width: 1.2, align: 'right' },
              { header: 'Decided', width: 1.4, align: 'right' },
              { header: 'Status', width: 2 },
              { header: 'Signed off', width: 5 },
            ]}
            rows={d.rounds.map((r) => ({
              cells: [
                String(r.number),
                r.requestedAt.toISOString().slice(0, 16).replace('T', ' '),
                r.requester,
                String(r.items),
                String(r.decided),
                r.status === 'signed-off' ? 'signed off' : 'open',
                r.signedOffAt
                  ? `${r.signer ?? '—'}, ${r.signedOffAt.toISOString().slice(0, 16).replace('T', ' ')}`
                  : '—',
              ],
            }))}
          />
        ) : (
          <Txt>No review has been requested.</Txt>
        )}

        <Heading>6. Lines below a hard criterion</Heading>
        {d.below.length ? (
          <Table
            fontSize={7}
            columns={[
              { header: 'Tag', width: 3 },
              { header: 'Area', width: 3 },
              { header: 'Chosen', width: 1.6, align: 'right' },
              { header: 'Criterion', width: 3.5 },
              { header: 'Reason', width: 7 },
            ]}
            rows={d.below.map((x) => ({
              cells: [x.tag, x.area, u.thickness(x.chosenMm), x.criteria, x.reason],
            }))}
          />
        ) : (
          <Txt>None: every decided line meets every hard criterion.</Txt>
        )}

        <Note title="Cautions" lines={CAUTIONS} />
      </FramedPage>
    </Doc>
  );
}

export async function reportPdf(d: ReportData, issue: ReportIssueInfo): Promise<Buffer> {
  return renderPdf(() => <ReportDocument d={d} issue={issue} />);
}
