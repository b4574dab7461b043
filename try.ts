import { solveSteady } from '@/lib/thermal/solve';
import { compileConductivity } from '@/lib/thermal/conductivity';
// bare pipe 60.3mm at 100C, amb 20, eps 0.9 (roymech ~230 W/m)
const amb = { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.9 };
const bare = solveSteady({
  geometry: 'horizontal-pipe',
  pipeOuterDiameterM: 0.0603,
  heightM: 1,
  characteristicLengthM: 1,
  processC: 100,
  ambient: amb,
  layers: [],
});
console.log('bare', bare.heatFlow, bare.convectiveWPerM2K, bare.radiativeWPerM2K);
const ins = solveSteady({
  geometry: 'horizontal-pipe',
  pipeOuterDiameterM: 0.1143,
  heightM: 1,
  characteristicLengthM: 1,
  processC: 180,
  ambient: { ...amb, emittance: 0.1 },
  layers: [
    { thicknessM: 0.05, conductivity: compileConductivity({ type: 'linear', a: 0.033, b: 0.0002 }) },
    {
      thicknessM: 0.03,
      conductivity: compileConductivity({
        type: 'table',
        points: [
          [0, 0.035],
          [100, 0.045],
          [200, 0.06],
        ],
      }),
    },
  ],
});
console.log(ins);
let t = performance.now();
let s = 0;
for (let i = 0; i < 100000; i++)
  s += solveSteady({
    geometry: 'horizontal-pipe',
    pipeOuterDiameterM: 0.1143,
    heightM: 1,
    characteristicLengthM: 1,
    processC: 180 + i * 1e-4,
    ambient: { ...amb, emittance: 0.1 },
    layers: [
      { thicknessM: 0.05, conductivity: compileConductivity({ type: 'linear', a: 0.033, b: 0.0002 }) },
    ],
  }).heatFlow;
console.log('us/solve', ((performance.now() - t) / 100000) * 1000);
