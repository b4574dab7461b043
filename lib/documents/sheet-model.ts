/**
 * What a calculation sheet says about one line, as plain data: every number taken from the stored
 * result (the deciding numbers, economics view and fittings heat from their own modules, never
 * recomputed here) and written by the one formatting layer in the project's units. The PDF
 * (sheet-pdf.tsx) only lays it out; tests read the PDF back against the same stored values.
 */
import type { Line, LineDesign, LineResult } from '@/db/schema';
import { formatterFor, localizeMessage, sig, type Formatter } from '@/lib/format';
import { catalogueOf } from '@/lib/lines/catalogue';
import { candidateNumbers, decidingLimits, worstMargin, type CandidateRow } from '@/lib/lines/deciding';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { economicsView } from '@/lib/lines/economics-view';
import { GEOMETRY_LABEL, PURPOSE_LABEL, isSurfaceGeometry, type Purpose } from '@/lib/lines/fields';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { inputOf } from '@/lib/lines/result-row';
import { criteriaFor } from '@/lib/lines/solve-line';

export const CRITERION_LABEL: Record<string, string> = {
  personnel: 'Personnel protection',
  condensation: 'Condensation control',
  heatLossLimit: 'Heat-loss limit',
  processDrop: 'Process temperature drop',
  freeze: 'Freeze protection',
  energyCode: 'Energy code minimum',
  economic: 'Economic thickness',
};

/** The method each criterion follows, named on the sheet and in the report's method statement. */
export const CRITERION_METHOD: Record<string, string> = {
  personnel:
    "Surface temperature by ASTM C680 / ISO 12241 under the personnel conditions, against the touch limit (ISO 13732-1 contact-time burn threshold, or the project's fixed limit).",
  condensation:
    'Surface temperature by ISO 12241 under the condensation conditions, at or above the dew (frost) point + margin; dew point by the Magnus form (Alduchov & Eskridge 1996).',
  heatLossLimit:
    'Heat flow by ASTM C680 / ISO 12241 under the heat-loss conditions, against the project limit.',
  processDrop:
    'Temperature change along the run from the heat flow and the fluid flow (ISO 12241, temperature drop in a pipe).',
  freeze:
    'Cooling of the stagnant water and steel to 0 °C, then the allowed ice fraction at the 0 °C heat flow (ISO 12241 method).',
  energyCode:
    'Minimum pipe insulation of ASHRAE 90.1 Table 6.8.3-1 with the footnote conductivity correction.',
  economic:
    'Lowest annualised cost: capital recovery × installed cost + levelised energy cost over the life.',
};

/** How the project sets its touch limit, in words (the design-basis mode). */
export function touchLimitText(basis: DesignBasis, u: Formatter): string {
  return basis.touchLimitMode === 'contact-time'
    ? `ISO 13732-1 burn threshold for ${sig(basis.touchContactSeconds, 3)} s of contact on the jacket's surface`
    : `fixed: ${u.temp(basis.touchLimitMetalC)} metal jacket, ${u.temp(basis.touchLimitNonMetalC)} non-metal`;
}

export const HARD_CRITERIA_IDS = new Set([
  'personnel',
  'condensation',
  'heatLossLimit',
  'processDrop',
  'freeze',
  'energyCode',
]);

interface Outcome {
  id: string;
  requiredMm: number | null;
  message: string;
  hours?: number;
  iceHours?: number;
  range?: { fromMm: number; toMm: number; optimumMm: number };
  tableMm?: number;
  minimumMm?: number;
}
type StoredDesign = {
  profileC: { radiusOrDepthM: number; tempC: number }[];
  overall: {
    perLengthWPerMK?: number;
    outerSurface: { valueWPerM2K: number; diameterM?: number };
    innerSurface: { valueWPerM2K: number; diameterM?: number };
  };
  convective: number;
  radiative: number;
};

export interface SheetInput {
  organization: string;
  project: { code: string; name: string; site?: string | null };
  basis: DesignBasis;
  basisRevision: number;
  line: Line;
  result: LineResult | null;
  design: LineDesign | null;
  stale: boolean;
  generatedAt: Date;
}

export interface CriterionRow {
  id: string;
  name: string;
  conditions: string;
  limit: string;
  required: string;
  atDesign: string;
  met: boolean | null;
  method: string;
  governing: boolean;
  message: string;
}

export interface SheetModel {
  tag: string;
  title: string;
  organization: string;
  projectLine: string;
  meta: string[];
  stale: boolean;
  lineData: [string, string][];
  conditions: [string, string][];
  criteria: CriterionRow[];
  design: [string, string][];
  surfaces: [string, string][];
  heat: [string, string][];
  coefficients: [string, string][];
  profile: { position: string; temp: string }[];
  profileHeader: [string, string];
  profileNote: string | null;
  cost: {
    points: { mm: number; cost: number }[];
    optimumMm: number | null;
    chosenMm: number | null;
    xLabel: string;
    yLabel: string;
    fmtX: (mm: number) => string;
    fmtY: (v: number) => string;
  } | null;
  economics: [string, string][];
  annual: [string, string][];
  warnings: string[];
  /** Raw values the tests compare the PDF with. */
  raw: {
    heatFlowPerUnit: number | null;
    lineHeatW: number | null;
    fittingsW: number;
    chosenMm: number | null;
    recommendedMm: number | null;
  };
  u: Formatter;
}

const cond = (
  u: Formatter,
  c: { airC: number; windMs: number; relativeHumidityPct?: number; surroundingsC?: number },
) =>
  `air ${u.temp(c.airC)}, wind ${sig(c.windMs, 3)} m/s${c.relativeHumidityPct !== undefined ? `, RH ${sig(c.relativeHumidityPct, 3)} %` : ''}${c.surroundingsC !== undefined ? `, surroundings ${u.temp(c.surroundingsC)}` : ''}`;

export function sheetModel(i: SheetInput): SheetModel {
  const { basis, line, result, design } = i;
  const u = formatterFor(basis);
  const msg = (t: string) => localizeMessage(t, u);
  const cat = catalogueOf(basis);
  const input = inputOf(line);
  const surface = isSurfaceGeometry(line.geometry);
  const crit = criteriaFor(basis, line.outdoor);
  const cands = (result?.candidates ?? []) as CandidateRow[];
  const limits = decidingLimits(basis, input, result?.jacketId ?? null);
  const nums = result ? candidateNumbers(basis, input, result.jacketId, cands, limits) : [];
  const chosenMm = design?.thicknessMm ?? null;
  const atMm = chosenMm ?? result?.recommendedMm ?? null;
  const at = nums.find((c) => c.mm === atMm) ?? null;
  const atRow = cands.find((c) => c[0] === atMm) ?? null;
  const outcomes = (result?.outcomes ?? []) as Outcome[];
  const jacket = cat.jackets.get(line.jacketId ?? '') ?? cat.jackets.get(result?.jacketId ?? '');
  const per = surface ? u.units.area : u.units.length;

  const lineData: [string, string][] = [
    ['Tag', line.tag],
    ['Service', line.service || '—'],
    ['Area', line.area || '—'],
    ['Geometry', GEOMETRY_LABEL[line.geometry]],
    [
      'Size',
      [
        line.nps ? `NPS ${line.nps}` : '',
        line.outsideDiameterMm ? `${u.diameter(line.outsideDiameterMm)} OD` : '',
      ]
        .filter(Boolean)
        .join(', ') || '—',
    ],
    [
      surface ? 'Area / height' : 'Length',
      surface ? `${u.area(line.surfaceAreaM2)} / ${u.length(line.heightM)}` : u.length(line.lengthM),
    ],
    ['Normal temperature', u.temp(line.normalTempC)],
    ['Maximum temperature', u.temp(line.maxTempC)],
    ['Steam pressure', u.pressure(line.steamPressureBarG)],
    ['Location', line.outdoor ? 'Outdoor' : 'Indoor'],
    [
      'Access',
      line.accessible
        ? `Within reach${line.accessHeightM !== null ? ` (${u.length(line.accessHeightM)})` : ''}`
        : 'Not accessible',
    ],
    ['Purposes', (line.purposes as Purpose[]).map((p) => PURPOSE_LABEL[p]).join(', ') || '—'],
    [
      'Fittings',
      `${line.elbows} elbows, ${line.tees} tees, ${line.valves} valves, ${line.flanges} flange pairs`,
    ],
    ['Line-list revision', `${line.revision} (input version ${line.inputVersion})`],
  ];

  const conditions: [string, string][] = [
    ['Heat loss', cond(u, crit.conditions.heatLoss)],
    ['Personnel', cond(u, crit.conditions.personnel)],
    ['Condensation', cond(u, crit.conditions.condensation)],
    ['Freeze', cond(u, crit.conditions.freeze)],
    ['Touch limit', touchLimitText(basis, u)],
    ['Dew-point margin', u.tempDelta(basis.dewPointMarginK).replace(/^\+/, '')],
  ];

  const limitOf = (o: Outcome): [string, string] => {
    switch (o.id) {
      case 'personnel':
        return [
          cond(u, crit.conditions.personnel) + `; process ${u.temp(line.maxTempC ?? line.normalTempC)}`,
          limits.personnelLimitC !== null ? `surface at most ${u.temp(limits.personnelLimitC)}` : '—',
        ];
      case 'condensation':
        return [
          cond(u, crit.conditions.condensation),
          limits.condensationNeedC !== null
            ? `surface at least ${u.temp(limits.condensationNeedC)} (${limits.dewBasis} ${u.temp(limits.dewPointC)} + ${u.tempDelta(basis.dewPointMarginK).replace(/^\+/, '')})`
            : '—',
        ];
      case 'heatLossLimit':
        return [
          cond(u, crit.conditions.heatLoss),
          basis.heatLossLimitWPerM !== undefined
            ? `at most ${u.heatFlowPerUnit(basis.heatLossLimitWPerM, surface)}`
            : '—',
        ];
      case 'processDrop':
        return [
          cond(u, crit.conditions.heatLoss),
          `change at most ${u.tempDelta(basis.maxProcessDropK).replace(/^\+/, '')}`,
        ];
      case 'freeze':
        return [
          cond(u, crit.conditions.freeze) + `; water from ${u.temp(basis.freeze.initialWaterTempC)}`,
          `${sig(basis.freeze.requiredHours, 3)} h, ${sig(basis.freeze.iceFractionPct, 3)} % ice${o.hours !== undefined ? `; ${sig(o.hours, 3)} h to 0 °C at the requirement` : ''}`,
        ];
      case 'energyCode':
        return [
          'Table 6.8.3-1',
          o.minimumMm !== undefined
            ? `at least ${u.thickness(o.minimumMm)} (table ${u.thickness(o.tableMm)})`
            : '—',
        ];
      case 'economic':
        return [
          cond(u, crit.conditions.heatLoss),
          o.range
            ? `optimum ${u.thickness(o.range.optimumMm)}; within ${sig(basis.economics.flatRangePct ?? 2, 2)} %: ${u.thickness(o.range.fromMm)} – ${u.thickness(o.range.toMm)}`
            : '—',
        ];
      default:
        return ['—', '—'];
    }
  };
  const atValue = (id: string): string => {
    if (!at) return '—';
    if (id === 'personnel') return u.temp(at.personnelC);
    if (id === 'condensation') return u.temp(at.condensationC);
    if (id === 'heatLossLimit' || id === 'economic') return u.heatFlowPerUnit(at.heatFlow, surface);
    return u.thickness(at.mm);
  };
  const criteria: CriterionRow[] = outcomes.map((o) => {
    const [c, l] = limitOf(o);
    return {
      id: o.id,
      name: CRITERION_LABEL[o.id] ?? o.id,
      conditions: c,
      limit: l,
      required: o.requiredMm === null ? 'not met by any thickness' : u.thickness(o.requiredMm),
      atDesign: atValue(o.id),
      met:
        atMm === null || o.requiredMm === null
          ? o.requiredMm === null
            ? false
            : null
          : atMm >= o.requiredMm,
      method: CRITERION_METHOD[o.id] ?? '',
      governing: o.id === result?.governing,
      message: msg(o.message),
    };
  });

  const layers = (design?.layers ?? result?.layers ?? []) as { materialId: string; thicknessMm: number }[];
  const designPairs: [string, string][] = [
    [
      'Recommended',
      result
        ? `${u.thickness(result.recommendedMm)}${result.governing ? `, governed by ${(CRITERION_LABEL[result.governing] ?? result.governing).toLowerCase()}` : ''}`
        : 'not solved',
    ],
    [
      'Chosen',
      design
        ? `${u.thickness(design.thicknessMm)} (${design.source === 'manual' ? 'manual pick' : 'recommendation accepted'}, ${design.decidedAt.toISOString().slice(0, 10)})`
        : 'no thickness chosen yet',
    ],
    [
      'Layers (inner first)',
      layers
        .map(
          (l, k) =>
            `${k + 1}: ${u.thickness(l.thicknessMm)} ${cat.materials.get(l.materialId)?.name ?? l.materialId}`,
        )
        .join('; ') || 'no insulation',
    ],
    [
      'Jacket',
      jacket
        ? `${jacket.name}, emittance ${sig(jacket.emittance, 2)} (${jacket.metal ? 'metal' : 'non-metal'})`
        : '—',
    ],
  ];
  if (design?.reason) designPairs.push(['Reason', design.reason]);
  if (design?.belowCriterion)
    designPairs.push([
      'Below',
      `${design.belowCriterion
        .split(',')
        .map((c) => CRITERION_LABEL[c] ?? c)
        .join(', ')}: flagged for safety review`,
    ]);
  if (design?.needsRedecision)
    designPairs.push(['Needs re-decision', design.redecisionReason ?? 'the line changed']);

  const m = at ? worstMargin(at, limits) : null;
  const surfaces: [string, string][] = at
    ? [
        ['Heat-loss conditions', u.temp(at.heatLossC)],
        ...(limits.personnelLimitC !== null
          ? [
              [
                'Personnel conditions',
                `${u.temp(at.personnelC)} (limit ${u.temp(limits.personnelLimitC)})`,
              ] as [string, string],
            ]
          : []),
        ...(limits.condensationNeedC !== null
          ? [
              [
                'Condensation conditions',
                `${u.temp(at.condensationC)} (at least ${u.temp(limits.condensationNeedC)})`,
              ] as [string, string],
            ]
          : []),
        ['Worst margin', m ? `${u.tempDelta(m.marginK)} (${m.criterion})` : 'no temperature limit applies'],
      ]
    : [];

  const extent = cands.length && cands[0][2] !== 0 && result ? result.bareHeatW / cands[0][2] : 0;
  const heatFlowPerUnit = atRow ? atRow[2] : null;
  const straightW = heatFlowPerUnit !== null && extent ? heatFlowPerUnit * extent : null;
  const fittingsW =
    result && atRow ? lineFittingsW(basis, line, atRow[2], cands[0]?.[2] ?? 0, atRow[0] === 0) : 0;
  const heat: [string, string][] = result
    ? [
        [
          `Heat flow per ${surface ? u.units.area : u.units.length === 'ft' ? 'foot' : 'metre'}`,
          `${u.heatFlowPerUnit(heatFlowPerUnit, surface)} (bare ${u.heatFlowPerUnit(cands[0]?.[2], surface)})`,
        ],
        ['Straight run', straightW === null ? 'no length given (solved per unit only)' : u.power(straightW)],
        [
          'Fittings and supports',
          fittingsW
            ? `${u.power(fittingsW)} (equivalent lengths${basis.fittings.valvesBare ? '; valves and flanges bare' : ''})`
            : surface
              ? 'not applicable'
              : u.power(0),
        ],
        ['Line total', straightW === null ? '—' : u.power(straightW + fittingsW)],
        ['Bare line (straight run)', u.power(result.bareHeatW)],
      ]
    : [];

  const d = result?.design as StoredDesign | null | undefined;
  const recIsAt = result?.recommendedMm === atMm;
  const coefficients: [string, string][] = d
    ? [
        ['Outside film', `convection ${u.htc(d.convective)}, radiation ${u.htc(d.radiative)}`],
        ...(d.overall.perLengthWPerMK !== undefined
          ? [
              [
                `U per ${u.units.length === 'ft' ? 'foot' : 'metre'}`,
                u.system === 'US'
                  ? `${sig((d.overall.perLengthWPerMK * 0.3048 * 3600) / 1055.05585262 / 1.8, 4)} Btu/(h·ft·°F)`
                  : `${sig(d.overall.perLengthWPerMK, 4)} W/(m·K)`,
              ] as [string, string],
            ]
          : []),
        [
          'U, outer surface',
          `${u.htc(d.overall.outerSurface.valueWPerM2K)}${d.overall.outerSurface.diameterM ? ` on D = ${u.diameter(d.overall.outerSurface.diameterM * 1000)}` : ''}`,
        ],
        [
          'U, inner surface',
          `${u.htc(d.overall.innerSurface.valueWPerM2K)}${d.overall.innerSurface.diameterM ? ` on D = ${u.diameter(d.overall.innerSurface.diameterM * 1000)}` : ''}`,
        ],
      ]
    : [];
  const profile = d
    ? d.profileC.map((p) => ({
        position: u.diameter(p.radiusOrDepthM * 1000).replace(/ (mm|in)$/, ''),
        temp: u.tempValue(p.tempC),
      }))
    : [];

  const econ = outcomes.find((o) => o.id === 'economic');
  const perUs = u.system === 'US' ? (surface ? 0.3048 * 0.3048 : 0.3048) : 1; // cost per m → per ft (per m² → per ft²)
  const costPts = cands
    .filter((c) => c[5] !== null && c[0] > 0)
    .map((c) => ({ mm: c[0], cost: (c[5] as number) * perUs }));
  const ev = result ? economicsView(basis, input, chosenMm) : null;
  const economics: [string, string][] = ev
    ? [
        ['Optimum', u.thickness(ev.optimumMm)],
        [
          `Within ${ev.flatRangePct} % of the lowest cost`,
          ev.range ? `${u.thickness(ev.range.fromMm)} – ${u.thickness(ev.range.toMm)}` : '—',
        ],
        ...(ev.vsBare
          ? [
              [
                `${u.thickness(ev.atMm)} against bare, per ${per}`,
                `extra first cost ${u.money(ev.vsBare.extraInstalled, 2)}, saves ${u.money(ev.vsBare.annualSaving, 2)} a year, payback ${ev.vsBare.paybackYears === null ? 'none' : `${sig(ev.vsBare.paybackYears, 2)} years`}`,
              ] as [string, string],
            ]
          : []),
        ...ev.sensitivity.map(
          (s) => [`Optimum if ${s.label.toLowerCase()}`, u.thickness(s.optimumMm)] as [string, string],
        ),
      ]
    : [];
  const annual: [string, string][] = result
    ? [
        ['Energy', `${u.energy(result.annualMWh)} a year`],
        ['Cost', `${u.money(result.annualCost)} a year`],
        ['CO2', `${sig(result.co2Tonnes, 3)} t a year`],
        ...(result.condensateKgPerH !== null
          ? [['Condensate', `${u.mass(result.condensateKgPerH)}/h`] as [string, string]]
          : []),
      ]
    : [];

  const basisNote = result && result.basisRevision !== i.basisRevision ? ` (current ${i.basisRevision})` : '';
  return {
    tag: line.tag,
    title: 'Insulation calculation sheet',
    organization: i.organization,
    projectLine: `${i.project.code} · ${i.project.name}${i.project.site ? ` · ${i.project.site}` : ''}`,
    meta: [
      `Line-list revision ${line.revision} · design basis revision ${result?.basisRevision ?? i.basisRevision}${basisNote}`,
      `Calculation version ${result?.calcVersion ?? '—'} · solved ${result ? result.solvedAt.toISOString().slice(0, 16).replace('T', ' ') : '—'} UTC`,
      `Printed ${i.generatedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC · units ${u.system}${u.series === 'inch' ? ', inch series' : ''}`,
    ],
    stale: i.stale,
    lineData,
    conditions,
    criteria,
    design: designPairs,
    surfaces,
    heat,
    coefficients,
    profile,
    profileHeader: [
      `${line.geometry === 'flat' ? 'Depth' : 'Radius'}, ${u.units.diameter}`,
      `Temperature, ${u.units.temp}`,
    ],
    profileNote: d
      ? recIsAt
        ? null
        : `Coefficients and profile are at the recommended ${u.thickness(result?.recommendedMm)}; the chosen ${u.thickness(atMm)} is in the rows above.`
      : null,
    cost:
      costPts.length > 1
        ? {
            points: costPts,
            optimumMm: econ?.range?.optimumMm ?? econ?.requiredMm ?? null,
            chosenMm,
            xLabel: `Thickness, ${u.units.thickness}`,
            yLabel: `Annual cost, ${u.currency} per ${per} (bare: ${sig((cands[0]?.[5] ?? NaN) * perUs, 3)})`,
            fmtX: (mm) => (mm === 0 ? '0' : u.thickness(mm).replace(/ (mm|in)$/, '')),
            fmtY: (v) => sig(v, 3),
          }
        : null,
    economics,
    annual: recIsAt ? annual : annual.map(([k, v]) => [`${k} (at the recommendation)`, v]),
    warnings: ((result?.warnings ?? []) as string[]).map(msg),
    raw: {
      heatFlowPerUnit,
      lineHeatW: straightW === null ? null : straightW + fittingsW,
      fittingsW,
      chosenMm,
      recommendedMm: result?.recommendedMm ?? null,
    },
    u,
  };
}
