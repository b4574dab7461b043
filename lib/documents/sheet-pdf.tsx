/** The calculation sheet laid out as A4 pages (one line per sheet; a batch is several sheets in one PDF). */
import {
  Box,
  CAUTIONS,
  Doc,
  FramedPage,
  Heading,
  Note,
  Pairs,
  Table,
  Txt,
  ALARM,
  ACCENT,
  INK,
  MUTED,
  RULE,
  pdfSafe,
  svg,
  type FrameInfo,
} from './pdf-kit';
import type { SheetModel } from './sheet-model';

function CostCurve({ cost }: { cost: NonNullable<SheetModel['cost']> }) {
  const { Svg, Line, Polyline, Circle, Text, G } = svg();
  const W = 250,
    H = 130,
    L = 38,
    B = 22,
    T = 8,
    Rm = 8;
  const xs = cost.points.map((p) => p.mm),
    ys = cost.points.map((p) => p.cost);
  const x0 = Math.min(...xs),
    x1 = Math.max(...xs);
  const y0 = 0,
    y1 = Math.max(...ys) * 1.08 || 1;
  const xAt = (v: number) => L + ((v - x0) / (x1 - x0 || 1)) * (W - L - Rm);
  const yAt = (v: number) => H - B - ((v - y0) / (y1 - y0)) * (H - B - T);
  const ticksY = [0, 0.25, 0.5, 0.75, 1].map((f) => y0 + f * (y1 - y0));
  const tickX = [...new Set([x0, ...xs.filter((_, i) => i % Math.ceil(xs.length / 6) === 0), x1])];
  const opt = cost.points.find((p) => p.mm === cost.optimumMm);
  const chosen = cost.points.find((p) => p.mm === cost.chosenMm);
  return (
    <Box>
      <Svg width={W} height={H}>
        {ticksY.map((v, i) => (
          <G key={`y${i}`}>
            <Line x1={L} x2={W - Rm} y1={yAt(v)} y2={yAt(v)} stroke={RULE} strokeWidth={0.4} />
            <Text x={L - 3} y={yAt(v) + 2} style={{ fontSize: 5.5 }} textAnchor="end" fill={MUTED}>
              {cost.fmtY(v)}
            </Text>
          </G>
        ))}
        {tickX.map((v, i) => (
          <Text
            key={`x${i}`}
            x={xAt(v)}
            y={H - B + 8}
            style={{ fontSize: 5.5 }}
            textAnchor="middle"
            fill={MUTED}
          >
            {cost.fmtX(v)}
          </Text>
        ))}
        <Line x1={L} x2={L} y1={T} y2={H - B} stroke={INK} strokeWidth={0.6} />
        <Line x1={L} x2={W - Rm} y1={H - B} y2={H - B} stroke={INK} strokeWidth={0.6} />
        <Polyline
          points={cost.points.map((p) => `${xAt(p.mm)},${yAt(p.cost)}`).join(' ')}
          stroke={ACCENT}
          strokeWidth={1.2}
          fill="none"
        />
        {opt ? <Circle cx={xAt(opt.mm)} cy={yAt(opt.cost)} r={2.6} fill={ACCENT} /> : null}
        {chosen ? (
          <Circle
            cx={xAt(chosen.mm)}
            cy={yAt(chosen.cost)}
            r={3.4}
            stroke={ALARM}
            strokeWidth={0.9}
            fill="none"
          />
        ) : null}
        <Text x={(L + W) / 2} y={H - 3} style={{ fontSize: 6 }} textAnchor="middle" fill={MUTED}>
          {cost.xLabel}
        </Text>
      </Svg>
      <Txt style={{ fontSize: 6.5, color: MUTED }}>
        {pdfSafe(
          `${cost.yLabel}. Filled dot: economic optimum${cost.optimumMm !== null ? ` (${cost.fmtX(cost.optimumMm)})` : ''}; ring: chosen thickness.`,
        )}
      </Txt>
    </Box>
  );
}

function SheetPages({ m }: { m: SheetModel }) {
  const info: FrameInfo = {
    organization: m.organization,
    projectLine: m.projectLine,
    title: m.title,
    reference: `Line ${m.tag}`,
    meta: m.meta,
    footer: `${m.projectLine} · calculation sheet ${m.tag} · engineering estimate: verify material data with the manufacturer; safety decisions follow local codes and a qualified person.`,
  };
  return (
    <FramedPage info={info}>
      {m.stale ? (
        <Note
          title="These results are stale"
          lines={[
            'The line or the design basis changed after they were computed; solve the line again before relying on this sheet.',
          ]}
        />
      ) : null}
      <Heading first>1. Line data</Heading>
      <Pairs items={m.lineData} />
      <Heading>2. Design conditions (design basis)</Heading>
      <Pairs items={m.conditions} columns={1} />
      <Heading>3. Criteria</Heading>
      {m.criteria.length ? (
        <Table
          columns={[
            { header: 'Criterion', width: 13 },
            { header: 'Conditions', width: 22 },
            { header: 'Limit', width: 22 },
            { header: 'Requires', width: 10, align: 'right' },
            { header: 'At design', width: 10, align: 'right' },
            { header: 'Met', width: 5 },
          ]}
          rows={m.criteria.map((c) => ({
            cells: [
              `${c.governing ? '▶ ' : ''}${c.name}`,
              c.conditions,
              c.limit,
              c.required,
              c.atDesign,
              c.met === null ? '—' : c.met ? 'yes' : 'NO',
            ],
            alarm: c.met === false,
            bold: c.governing,
          }))}
        />
      ) : (
        <Txt>Not solved yet.</Txt>
      )}
      {m.criteria.length ? (
        <Box style={{ marginTop: 3 }}>
          {m.criteria.map((c) => (
            <Txt key={c.id} style={{ fontSize: 6.8, color: MUTED }}>
              {pdfSafe(`${c.name}: ${c.method} ${c.message}`)}
            </Txt>
          ))}
        </Box>
      ) : null}
      <Heading>4. Design</Heading>
      <Pairs items={m.design} columns={1} />
      {m.surfaces.length ? (
        <>
          <Txt style={{ fontWeight: 600, marginTop: 4 }}>Surface temperature at the design thickness</Txt>
          <Pairs items={m.surfaces} />
        </>
      ) : null}
      <Box wrap={false}>
        <Heading>5. Heat loss</Heading>
        <Pairs items={m.heat} columns={1} />
      </Box>
      {m.coefficients.length ? (
        <Box wrap={false} style={{ flexDirection: 'row', gap: 12 }}>
          <Box style={{ flex: 3 }}>
            <Heading>6. Overall coefficient</Heading>
            <Pairs items={m.coefficients} columns={1} />
            {m.profileNote ? (
              <Txt style={{ fontSize: 6.8, color: MUTED, marginTop: 2 }}>{pdfSafe(m.profileNote)}</Txt>
            ) : null}
          </Box>
          <Box style={{ flex: 2 }}>
            <Heading>7. Temperature profile</Heading>
            <Table
              columns={[
                { header: m.profileHeader[0], width: 1, align: 'right' },
                { header: m.profileHeader[1], width: 1, align: 'right' },
              ]}
              rows={m.profile.map((p) => ({ cells: [p.position, p.temp] }))}
            />
          </Box>
        </Box>
      ) : null}
      {m.cost || m.economics.length ? (
        <Box wrap={false} style={{ flexDirection: 'row', gap: 12 }}>
          {m.cost ? (
            <Box style={{ flex: 1 }}>
              <Heading>8. Cost curve</Heading>
              <CostCurve cost={m.cost} />
            </Box>
          ) : null}
          <Box style={{ flex: 1 }}>
            <Heading>{m.cost ? '9. Economics and annual figures' : '8. Annual figures'}</Heading>
            <Pairs items={[...m.economics, ...m.annual]} columns={1} />
          </Box>
        </Box>
      ) : m.annual.length ? (
        <>
          <Heading>8. Annual figures</Heading>
          <Pairs items={m.annual} columns={1} />
        </>
      ) : null}
      {m.warnings.length ? <Note title="Warnings" tone="plain" lines={m.warnings} /> : null}
      <Note title="Cautions" lines={CAUTIONS} />
    </FramedPage>
  );
}

/** One or more calculation sheets in one PDF document. */
export function SheetsDocument({ models, title }: { models: SheetModel[]; title: string }) {
  return (
    <Doc title={title}>
      {models.map((m) => (
        <SheetPages key={m.tag} m={m} />
      ))}
    </Doc>
  );
}
