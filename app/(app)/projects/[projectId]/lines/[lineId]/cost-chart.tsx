'use client';
import {
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { convert, formatter, sig, type FormatOptions } from '@/lib/format';

export interface CurvePoint {
  mm: number;
  heatFlow: number;
  annualCost: number | null;
}

/** Heat loss and annualised cost against thickness, with the economic optimum and the chosen thickness marked; in the project's units. */
export function CostChart({
  points,
  optimumMm,
  chosenMm,
  surface,
  format,
}: {
  points: CurvePoint[];
  optimumMm: number | null;
  chosenMm: number | null;
  surface: boolean;
  format: FormatOptions;
}) {
  const u = formatter(format);
  const us = format.unitSystem === 'US';
  const x = (mm: number) => u.thicknessValue(mm) ?? 0;
  const q = (v: number) => (us ? (surface ? convert.wPerM2ToBtuPerHFt2(v) : convert.wPerMToBtuPerHFt(v)) : v);
  const cost = (v: number | null) =>
    v === null ? null : us ? (surface ? convert.perM2ToPerFt2(v) : convert.perMToPerFt(v)) : v;
  const data = points
    .filter((p) => p.mm > 0)
    .map((p) => ({ x: x(p.mm), mm: p.mm, heatFlow: q(p.heatFlow), annualCost: cost(p.annualCost) }));
  const qUnit = surface ? u.units.arealLoss : u.units.linearLoss;
  const per = surface ? u.units.area : u.units.length;
  const thicknessUnit = us || u.series === 'inch' ? 'in' : 'mm';
  // The two series differ by more than colour: heat loss is a solid line with round markers, cost a
  // dashed line with square markers, and the legend shows both; the same numbers follow as a table.
  return (
    <>
      <div
        className="h-72 w-full"
        role="img"
        aria-label="Heat loss and annual cost against thickness (the data follow as a table)"
      >
        <ResponsiveContainer>
          <LineChart data={data} margin={{ top: 10, right: 30, left: 10, bottom: 10 }}>
            <CartesianGrid stroke="#d5d9df" strokeDasharray="3 3" />
            <XAxis
              dataKey="x"
              type="number"
              domain={['dataMin', 'dataMax']}
              tickFormatter={(v: number) => sig(v, 3)}
              label={{ value: `Thickness, ${thicknessUnit}`, position: 'insideBottom', offset: -4 }}
              tick={{ fontSize: 11 }}
            />
            <YAxis
              yAxisId="q"
              tick={{ fontSize: 11 }}
              tickFormatter={(v: number) => sig(v, 3)}
              label={{ value: `Heat loss, ${qUnit}`, angle: -90, position: 'insideLeft', fontSize: 11 }}
            />
            <YAxis
              yAxisId="c"
              orientation="right"
              tick={{ fontSize: 11 }}
              tickFormatter={(v: number) => sig(v, 3)}
              label={{
                value: `Annual cost, ${u.currency} per ${per}`,
                angle: 90,
                position: 'insideRight',
                fontSize: 11,
              }}
            />
            <Tooltip
              formatter={(v) => (typeof v === 'number' ? sig(v, 3) : String(v))}
              labelFormatter={(l) =>
                thicknessUnit === 'in' ? `${sig(Number(l), 3)} in` : `${sig(Number(l), 4)} mm`
              }
            />
            <Legend verticalAlign="top" height={24} />
            <Line
              yAxisId="q"
              dataKey="heatFlow"
              name="Heat loss"
              stroke="#257a74"
              dot={{ r: 3, fill: '#257a74' }}
              legendType="circle"
              strokeWidth={2}
              isAnimationActive={false}
            />
            <Line
              yAxisId="c"
              dataKey="annualCost"
              name="Annualised cost"
              stroke="#a15a1c"
              strokeDasharray="6 3"
              dot={<SquareDot />}
              legendType="square"
              strokeWidth={2}
              isAnimationActive={false}
            />
            {optimumMm ? (
              <ReferenceLine
                yAxisId="c"
                x={x(optimumMm)}
                stroke="#a15a1c"
                strokeDasharray="4 2"
                label={{ value: 'economic', fontSize: 10, position: 'insideTopLeft' }}
              />
            ) : null}
            {chosenMm ? (
              <ReferenceLine
                yAxisId="q"
                x={x(chosenMm)}
                stroke="#23282e"
                label={{ value: 'chosen', fontSize: 10, position: 'insideTopRight' }}
              />
            ) : null}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-mineral-800">Chart data as a table</summary>
        <div className="mt-2 max-h-64 overflow-auto">
          <table className="table-dense" aria-label="Heat loss and annual cost against thickness">
            <thead>
              <tr>
                <th className="num" scope="col">
                  Thickness, {thicknessUnit}
                </th>
                <th className="num" scope="col">
                  Heat loss, {qUnit}
                </th>
                <th className="num" scope="col">
                  Annual cost, {u.currency} per {per}
                </th>
                <th scope="col">Marked</th>
              </tr>
            </thead>
            <tbody>
              {data.map((d) => (
                <tr key={d.mm}>
                  <td className="num">{sig(d.x, 3)}</td>
                  <td className="num">{sig(d.heatFlow, 3)}</td>
                  <td className="num">{d.annualCost === null ? '—' : sig(d.annualCost, 3)}</td>
                  <td>
                    {[d.mm === optimumMm ? 'economic optimum' : '', d.mm === chosenMm ? 'chosen' : '']
                      .filter(Boolean)
                      .join(', ')}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </>
  );
}

/** A square marker for the cost series, so it is told from the heat-loss series without colour. */
function SquareDot(props: { cx?: number; cy?: number; stroke?: string }) {
  const { cx, cy, stroke } = props;
  if (cx === undefined || cy === undefined) return null;
  return <rect x={cx - 3} y={cy - 3} width={6} height={6} fill={stroke} />;
}
