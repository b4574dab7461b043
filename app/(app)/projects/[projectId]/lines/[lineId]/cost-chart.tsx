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
  return (
    <div className="h-72 w-full" role="img" aria-label="Heat loss and annual cost against thickness">
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
            dot={false}
            strokeWidth={2}
            isAnimationActive={false}
          />
          <Line
            yAxisId="c"
            dataKey="annualCost"
            name="Annualised cost"
            stroke="#a15a1c"
            dot={false}
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
  );
}
