'use client';
import { CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

export interface CurvePoint { mm: number; heatFlow: number; annualCost: number | null }

/** Heat loss and annualised cost against thickness, with the economic optimum and the chosen thickness marked. */
export function CostChart({ points, optimumMm, chosenMm, unit }: { points: CurvePoint[]; optimumMm: number | null; chosenMm: number | null; unit: string }) {
  const data = points.filter((p) => p.mm > 0);
  return (
    <div className="h-72 w-full" role="img" aria-label="Heat loss and annual cost against thickness">
      <ResponsiveContainer>
        <LineChart data={data} margin={{ top: 10, right: 30, left: 10, bottom: 10 }}>
          <CartesianGrid stroke="#d5d9df" strokeDasharray="3 3" />
          <XAxis dataKey="mm" type="number" domain={['dataMin', 'dataMax']} label={{ value: 'Thickness, mm', position: 'insideBottom', offset: -4 }} tick={{ fontSize: 11 }} />
          <YAxis yAxisId="q" tick={{ fontSize: 11 }} label={{ value: `Heat loss, ${unit}`, angle: -90, position: 'insideLeft', fontSize: 11 }} />
          <YAxis yAxisId="c" orientation="right" tick={{ fontSize: 11 }} label={{ value: 'Annual cost per unit', angle: 90, position: 'insideRight', fontSize: 11 }} />
          <Tooltip formatter={(v) => (typeof v === 'number' ? v.toFixed(2) : String(v))} labelFormatter={(l) => `${l} mm`} />
          <Legend verticalAlign="top" height={24} />
          <Line yAxisId="q" dataKey="heatFlow" name="Heat loss" stroke="#257a74" dot={false} strokeWidth={2} isAnimationActive={false} />
          <Line yAxisId="c" dataKey="annualCost" name="Annualised cost" stroke="#a15a1c" dot={false} strokeWidth={2} isAnimationActive={false} />
          {optimumMm ? <ReferenceLine yAxisId="c" x={optimumMm} stroke="#a15a1c" strokeDasharray="4 2" label={{ value: 'economic', fontSize: 10, position: 'insideTopLeft' }} /> : null}
          {chosenMm ? <ReferenceLine yAxisId="q" x={chosenMm} stroke="#23282e" label={{ value: 'chosen', fontSize: 10, position: 'insideTopRight' }} /> : null}
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}
