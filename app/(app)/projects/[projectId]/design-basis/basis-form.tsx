'use client';
import { startTransition, useActionState } from 'react';
import type { DesignBasis } from '@/lib/lines/design-basis';
import { saveDesignBasisAction } from './actions';
import { fieldKind, kindUnit, toFormValue } from '@/lib/format/basis-units';
import { CURRENCIES } from '@/lib/format';
import { TOUCH_SURFACE_LABEL, burnThresholdC, type TouchSurface } from '@/lib/thermal/touch';
import { COOLING_SOURCES, HEAT_SOURCES } from '@/lib/thermal/economics';

const TOUCH_SURFACES = Object.keys(TOUCH_SURFACE_LABEL) as TouchSurface[];

interface Option {
  id: string;
  name: string;
}

function get(o: unknown, path: string): unknown {
  return path
    .split('.')
    .reduce<unknown>(
      (a, k) =>
        a && typeof a === 'object'
          ? (a as Record<string, unknown>)[k.replace(/\[(\d+)\]/, '.$1')]
          : undefined,
      o,
    );
}

export function BasisForm({
  projectId,
  basis,
  materials,
  jackets,
  canEdit,
  notes,
}: {
  projectId: string;
  basis: DesignBasis;
  materials: Option[];
  jackets: Option[];
  canEdit: boolean;
  notes: Record<string, string>;
}) {
  const [result, action, pending] = useActionState(saveDesignBasisAction, undefined);
  const errors = (result?.error ?? {}) as Record<string, string[] | null>;
  // Shown in the project's units; the action converts back to SI with the system named in shownUnits.
  const sys = basis.unitSystem;
  const shown = (name: string, v: unknown) =>
    typeof v === 'number'
      ? String(toFormValue(fieldKind(name), sys, v))
      : v === undefined || v === null
        ? ''
        : String(v);
  const withUnit = (name: string, label: string) => {
    const u = kindUnit(fieldKind(name), sys);
    return u ? `${label} ${u}` : label;
  };
  // biome-ignore lint/correctness/noComponentHookFactories: a field helper closing over the form's state; it holds no state of its own (to be lifted out with the form's other repeated fields)
  const Num = ({
    name,
    label,
    step = 'any',
    hint,
  }: {
    name: string;
    label: string;
    step?: string;
    hint?: string;
  }) => {
    const id = `db-${name.replace(/[^a-z0-9]/gi, '-')}`;
    const err = errors[name];
    const value = get(basis, name.replace(/\[(\d+)\]/g, '.$1'));
    return (
      <div>
        <label htmlFor={id} className="label">
          {withUnit(name, label)}
        </label>
        <input
          id={id}
          name={name}
          type="number"
          step={step}
          defaultValue={shown(name, value)}
          disabled={!canEdit}
          className="input"
          aria-invalid={err ? true : undefined}
        />
        {err ? (
          <p className="field-error">{err.join(' ')}</p>
        ) : hint ? (
          <p className="mt-1 text-xs text-ink-500">{hint}</p>
        ) : null}
      </div>
    );
  };
  /** A band's choice of material or jacket, with its error; `empty` labels the "no choice" option where one is allowed. */
  const bandSelect = (
    i: number,
    field: 'outerId' | 'innerId' | 'flatOuterId' | 'jacketId',
    label: string,
    value: string | undefined,
    options: Option[],
    empty?: string,
  ) => {
    const name = `systems[${i}].${field}`;
    return (
      <td>
        <select
          aria-label={`Band ${i + 1} ${label}`}
          name={name}
          defaultValue={value ?? ''}
          disabled={!canEdit}
          className="input"
        >
          {empty !== undefined ? <option value="">{empty}</option> : null}
          {options.map((o) => (
            <option key={o.id} value={o.id}>
              {o.name}
            </option>
          ))}
        </select>
        {errors[name] ? <p className="field-error">{errors[name]!.join(' ')}</p> : null}
      </td>
    );
  };
  const condition = (key: 'heatLoss' | 'personnel' | 'condensation', title: string, rh: boolean) => (
    <fieldset className="panel p-3">
      <legend className="px-1 text-sm font-semibold">{title}</legend>
      {(['outdoor', 'indoor'] as const).map((side) => (
        <div key={side} className="mb-2 grid grid-cols-3 items-end gap-2">
          <Num name={`conditions.${key}.${side}.airC`} label={`${side} air`} />
          <Num name={`conditions.${key}.${side}.windMs`} label={`${side} wind`} />
          {rh ? <Num name={`conditions.${key}.${side}.relativeHumidityPct`} label={`${side} RH %`} /> : null}
        </div>
      ))}
      {notes[key] ? <p className="text-xs text-ink-500">{notes[key]}</p> : null}
    </fieldset>
  );
  // Materials the bands use, and any with factors already set (kept when the form is saved).
  const designMaterials = [
    ...new Set([
      ...basis.systems.flatMap((s) => [s.outerId, s.innerId, s.flatOuterId]).filter((x): x is string => !!x),
      ...Object.keys(basis.designConductivity ?? {}),
    ]),
  ];
  return (
    <form
      className="space-y-5"
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        startTransition(() => action(fd));
      }}
    >
      <input type="hidden" name="projectId" value={projectId} />

      {result?.status === 'success' ? (
        <p role="status" className="rounded border border-mineral-300 bg-mineral-50 px-3 py-2 text-sm">
          Saved as design-basis revision {result.data?.revision}. Lines solved under the earlier revision are
          now marked stale.
        </p>
      ) : null}
      {result?.error?.[''] ? (
        <p role="alert" className="text-sm text-alarm-700">
          {result.error[''].join(' ')}
        </p>
      ) : null}
      {result?.status === 'error' && !result.error?.[''] ? (
        <p role="alert" className="text-sm text-alarm-700">
          Some values are not valid; see the fields marked below. Nothing was saved.
        </p>
      ) : null}
      {/* Keyed on the unit system: after a change of units every field is shown anew in the new units
          (uncontrolled inputs keep their first values otherwise), and shownUnits names the units they are in. */}
      <div key={sys} className="space-y-5">
        <input type="hidden" name="shownUnits" value={sys} />
        <div className="max-w-xs">
          <label htmlFor="db-unitSystem" className="label">
            Units for display
          </label>
          <select
            id="db-unitSystem"
            name="unitSystem"
            defaultValue={basis.unitSystem}
            disabled={!canEdit}
            className="input"
          >
            <option value="SI">SI (°C, mm, m, W/m)</option>
            <option value="US">US customary (°F, in, ft, Btu/h·ft)</option>
          </select>
          <p className="mt-1 text-xs text-ink-500">
            Line-list columns choose their own units at import. This form shows the project&apos;s units; a
            change of units applies to it after saving.
          </p>
        </div>
        <div className="max-w-xs">
          <label htmlFor="db-currency" className="label">
            Currency
          </label>
          <select
            id="db-currency"
            name="currency"
            defaultValue={basis.currency}
            disabled={!canEdit}
            className="input"
          >
            {[...new Set([basis.currency, ...CURRENCIES])].map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
          {errors.currency ? (
            <p className="field-error">{errors.currency.join(' ')}</p>
          ) : (
            <p className="mt-1 text-xs text-ink-500">{notes.currency}</p>
          )}
        </div>
        <div className="max-w-md">
          <label htmlFor="db-thicknessSeries" className="label">
            Nominal thicknesses
          </label>
          <select
            id="db-thicknessSeries"
            name="thicknessSeries"
            defaultValue={basis.thicknessSeries}
            disabled={!canEdit}
            className="input"
          >
            <option value="mm">Millimetre series</option>
            <option value="inch">Inch series</option>
          </select>
          <p className="mt-1 text-xs text-ink-500">{notes.thicknessSeries}</p>
        </div>
        <div className="grid gap-4 lg:grid-cols-3">
          {condition('heatLoss', 'Heat loss (average conditions)', false)}
          {condition('personnel', 'Personnel protection (hottest, still air)', false)}
          {condition('condensation', 'Condensation control (design humidity)', true)}
        </div>
        <fieldset className="panel p-3">
          <legend className="px-1 text-sm font-semibold">Touch limit (personnel protection)</legend>
          <div className="grid gap-4 md:grid-cols-4">
            <div>
              <label htmlFor="db-touchLimitMode" className="label">
                Touch limit set by
              </label>
              <select
                id="db-touchLimitMode"
                name="touchLimitMode"
                defaultValue={basis.touchLimitMode}
                disabled={!canEdit}
                className="input"
              >
                <option value="contact-time">Contact time and surface (ISO 13732-1)</option>
                <option value="fixed">Fixed numbers (override)</option>
              </select>
              {errors.touchLimitMode ? (
                <p className="field-error">{errors.touchLimitMode.join(' ')}</p>
              ) : null}
            </div>
            <Num name="touchContactSeconds" label="Contact time, s" />
            <Num name="touchLimitMetalC" label="Fixed limit, metal jacket" hint={notes.touchLimitMetalC} />
            <Num name="touchLimitNonMetalC" label="Fixed limit, non-metal" hint={notes.touchLimitNonMetalC} />
          </div>
          <table className="table-dense mt-2" aria-label="Touch limit by surface">
            <caption className="text-left text-xs text-ink-600">
              Limits by surface at the saved contact time of {basis.touchContactSeconds} s (ISO 13732-1 burn
              thresholds, lower end of each band)
              {basis.touchLimitMode === 'fixed' ? ' — not in use while fixed numbers are chosen' : ''}
            </caption>
            <thead>
              <tr>
                <th>Surface touched</th>
                <th>Limit {kindUnit('temp', sys)}</th>
                <th>Published band {kindUnit('temp', sys)}</th>
              </tr>
            </thead>
            <tbody>
              {TOUCH_SURFACES.map((sf) => {
                const t = burnThresholdC(sf, basis.touchContactSeconds);
                return (
                  <tr key={sf}>
                    <td>{TOUCH_SURFACE_LABEL[sf]}</td>
                    <td>{toFormValue('temp', sys, Math.round(t.limitC * 10) / 10)}</td>
                    <td>
                      {t.bandC
                        ? `${toFormValue('temp', sys, t.bandC[0])} – ${toFormValue('temp', sys, t.bandC[1])}`
                        : '—'}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <p className="mt-1 text-xs text-ink-500">{notes.touchLimit}</p>
        </fieldset>
        <div className="grid gap-4 md:grid-cols-4">
          <Num name="dewPointMarginK" label="Dew-point margin" hint={notes.dewPointMarginK} />
          <Num name="heatLossLimitWPerM" label="Heat-loss limit (optional)" />
          <Num name="maxProcessDropK" label="Allowed process temperature change" />
          <Num name="freeze.initialWaterTempC" label="Freeze: starting water" />
          <Num name="freeze.requiredHours" label="Freeze: required hours" />
          <Num name="freeze.iceFractionPct" label="Freeze: ice allowed by then %" />
          <Num name="conditions.freeze.airC" label="Freeze: air" />
          <Num name="conditions.freeze.windMs" label="Freeze: wind" />
        </div>
        <fieldset className="panel p-3">
          <legend className="px-1 text-sm font-semibold">
            Insulation specification by normal temperature
          </legend>
          <table className="table-dense">
            <thead>
              <tr>
                <th>From {kindUnit('temp', sys)}</th>
                <th>To {kindUnit('temp', sys)}</th>
                <th>Main material</th>
                <th>Inner layer (high temperature)</th>
                <th>Vessels and flat surfaces</th>
                <th>Jacket</th>
              </tr>
            </thead>
            <tbody>
              {basis.systems.map((s, i) => (
                <tr key={i}>
                  <td>
                    <input
                      aria-label={`Band ${i + 1} from`}
                      name={`systems[${i}].fromC`}
                      type="number"
                      step="any"
                      defaultValue={shown('fromC', s.fromC)}
                      disabled={!canEdit}
                      className="input w-24"
                    />
                  </td>
                  <td>
                    <input
                      aria-label={`Band ${i + 1} to`}
                      name={`systems[${i}].toC`}
                      type="number"
                      step="any"
                      defaultValue={shown('toC', s.toC)}
                      disabled={!canEdit}
                      className="input w-24"
                    />
                    {errors[`systems[${i}].toC`] ? (
                      <p className="field-error">{errors[`systems[${i}].toC`]!.join(' ')}</p>
                    ) : null}
                  </td>
                  {bandSelect(i, 'outerId', 'material', s.outerId, materials)}
                  {bandSelect(i, 'innerId', 'inner layer', s.innerId, materials, 'none')}
                  {bandSelect(
                    i,
                    'flatOuterId',
                    'vessels and flat surfaces',
                    s.flatOuterId,
                    materials,
                    'same as main',
                  )}
                  {bandSelect(i, 'jacketId', 'jacket', s.jacketId, jackets)}
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-1 text-xs text-ink-500">{notes.systems}</p>
        </fieldset>
        <fieldset className="panel p-3">
          <legend className="px-1 text-sm font-semibold">
            Corrosion under insulation (AMPP/NACE SP0198, API RP 583)
          </legend>
          <div className="flex flex-wrap gap-4 text-sm">
            {(
              [
                [
                  'cui.metals',
                  'carbon-steel',
                  'Lines of carbon or low-alloy steel',
                  basis.cui.metals.includes('carbon-steel'),
                ],
                [
                  'cui.metals',
                  'austenitic-stainless',
                  'Lines of austenitic stainless steel',
                  basis.cui.metals.includes('austenitic-stainless'),
                ],
                ['cui.screenIdle', 'on', 'Lines stand idle at ambient air', basis.cui.screenIdle],
                [
                  'cui.requireCoatingNote',
                  'on',
                  'Screened lines: coating under the insulation',
                  basis.cui.requireCoatingNote,
                ],
                [
                  'cui.requireChlorideFree',
                  'on',
                  'Screened stainless lines: chloride-free insulation (ASTM C795)',
                  basis.cui.requireChlorideFree,
                ],
                ['cui.reviewFlag', 'on', 'Flag screened lines for review', basis.cui.reviewFlag],
              ] as const
            ).map(([name, value, label, checked]) => {
              const id = `db-${name.replace('.', '-')}-${value}`;
              return (
                <span key={id} className="flex items-center gap-1">
                  <input
                    id={id}
                    type="checkbox"
                    name={name}
                    value={value}
                    defaultChecked={checked}
                    disabled={!canEdit}
                  />
                  <label htmlFor={id}>{label}</label>
                </span>
              );
            })}
          </div>
          {errors['cui.metals'] ? <p className="field-error">{errors['cui.metals'].join(' ')}</p> : null}
          <p className="mt-1 text-xs text-ink-500">{notes.cui}</p>
        </fieldset>
        <fieldset className="panel p-3">
          <legend className="px-1 text-sm font-semibold">Design conductivity (EN ISO 23993)</legend>
          <table className="table-dense" aria-label="Design conductivity factors">
            <thead>
              <tr>
                <th>Material</th>
                <th>Ageing</th>
                <th>Moisture</th>
                <th>Installation</th>
                <th>Product</th>
                <th>Source of the factors</th>
              </tr>
            </thead>
            <tbody>
              {designMaterials.map((id) => {
                const f = basis.designConductivity?.[id] ?? {
                  ageing: 1,
                  moisture: 1,
                  installation: 1,
                  source: '',
                };
                const name = materials.find((m) => m.id === id)?.name ?? id;
                const cell = (k: 'ageing' | 'moisture' | 'installation') => {
                  const field = `designConductivity.${id}.${k}`;
                  return (
                    <td>
                      <input
                        aria-label={`${name} ${k} factor`}
                        name={field}
                        type="number"
                        step="any"
                        min="1"
                        defaultValue={f[k]}
                        disabled={!canEdit}
                        className="input w-20"
                      />
                      {errors[field] ? <p className="field-error">{errors[field]!.join(' ')}</p> : null}
                    </td>
                  );
                };
                return (
                  <tr key={id}>
                    <td>{name}</td>
                    {cell('ageing')}
                    {cell('moisture')}
                    {cell('installation')}
                    <td className="font-mono">{(f.ageing * f.moisture * f.installation).toFixed(3)}</td>
                    <td>
                      <input
                        aria-label={`${name} factors source`}
                        name={`designConductivity.${id}.source`}
                        defaultValue={f.source}
                        disabled={!canEdit}
                        className="input"
                      />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {errors.designConductivity ? (
            <p className="field-error">{errors.designConductivity.join(' ')}</p>
          ) : null}
          <p className="mt-1 text-xs text-ink-500">{notes.designConductivity}</p>
        </fieldset>
        <div className="grid gap-4 md:grid-cols-4">
          <div>
            <label htmlFor="db-energyCode" className="label">
              Energy code
            </label>
            <select
              id="db-energyCode"
              name="energyCode"
              defaultValue={basis.energyCode ?? 'none'}
              disabled={!canEdit}
              className="input"
            >
              <option value="none">None</option>
              <option value="ashrae-90.1">ASHRAE 90.1 minimum pipe insulation</option>
            </select>
            <p className="mt-1 text-xs text-ink-600">{notes.energyCode}</p>
          </div>
          <Num name="fittings.elbowM" label="Elbow: metres of insulated pipe" hint={notes.fittings} />
          <Num name="fittings.teeM" label="Tee: metres of insulated pipe" />
          <Num name="fittings.valveM" label="Covered valve: metres of insulated pipe" />
          <Num name="fittings.flangePairM" label="Covered flange pair: metres of insulated pipe" />
          <Num name="fittings.bareValveM" label="Bare valve: metres of bare pipe" />
          <Num name="fittings.bareFlangePairM" label="Bare flange pair: metres of bare pipe" />
          <Num name="fittings.supportM" label="Support: metres of insulated pipe" />
          <Num name="fittings.supportsPerM" label="Supports per metre of pipe" />
          <div className="flex items-end gap-2 pb-2">
            <input
              id="db-valvesBare"
              type="checkbox"
              name="fittings.valvesBare"
              defaultChecked={basis.fittings?.valvesBare ?? false}
              disabled={!canEdit}
            />
            <label htmlFor="db-valvesBare" className="text-sm">
              Valves and flanges are left bare
            </label>
          </div>
          <fieldset className="panel p-3 md:col-span-4">
            <legend className="px-1 text-sm font-semibold">
              Heat tracing (IEEE 515 / IEC/IEEE 60079-30-2)
            </legend>
            <p className="mb-2 text-xs text-ink-600">{notes.heatTracing}</p>
            <div className="mb-2 flex flex-wrap gap-4">
              {(
                [
                  [
                    'heatTracing.traceFreezeProtection',
                    'Trace freeze-protected lines',
                    basis.heatTracing.traceFreezeProtection,
                  ],
                  [
                    'heatTracing.traceProcessControl',
                    'Trace process-control lines (held at their normal temperature)',
                    basis.heatTracing.traceProcessControl,
                  ],
                ] as const
              ).map(([name, label, checked]) => (
                <div key={name} className="flex items-center gap-2">
                  <input
                    id={`db-${name.replace('.', '-')}`}
                    type="checkbox"
                    name={name}
                    defaultChecked={checked}
                    disabled={!canEdit}
                  />
                  <label htmlFor={`db-${name.replace('.', '-')}`} className="text-sm">
                    {label}
                  </label>
                </div>
              ))}
            </div>
            <div className="grid gap-4 md:grid-cols-4">
              <Num name="heatTracing.maintainTempC" label="Maintain temperature (freeze protection)" />
              <Num name="heatTracing.minAmbientC" label="Minimum design ambient (blank: freeze conditions)" />
              <Num name="heatTracing.windMs" label="Design wind for tracing (blank: freeze conditions)" />
              <Num
                name="heatTracing.safetyFactor"
                label="Tracing safety factor"
                hint={notes.tracingSafetyFactor}
              />
              <Num name="heatTracing.valveM" label="Tracer per valve, m" hint={notes.tracerAllowances} />
              <Num name="heatTracing.flangePairM" label="Tracer per flange pair, m" />
              <Num name="heatTracing.elbowM" label="Tracer per elbow, m" />
              <Num name="heatTracing.teeM" label="Tracer per tee, m" />
              <Num name="heatTracing.supportM" label="Tracer per support, m" />
            </div>
          </fieldset>
          <Num name="economics.energyPricePerKWh" label="Energy price per kWh" hint={notes.economics} />
          <Num name="economics.efficiency" label="Heat-generation efficiency" />
          <Num name="economics.hoursPerYear" label="Operating hours per year" />
          <Num name="economics.discountRate" label="Discount rate (fraction)" />
          <Num name="economics.lifeYears" label="Life, years" step="1" />
          <Num name="economics.escalationRate" label="Energy price escalation (fraction)" />
          <div>
            <label htmlFor="db-heatSource" className="label">
              Heat source (hot lines)
            </label>
            <select
              id="db-heatSource"
              name="economics.heatSource"
              defaultValue={basis.economics.heatSource}
              disabled={!canEdit}
              className="input"
            >
              {(Object.keys(HEAT_SOURCES) as (keyof typeof HEAT_SOURCES)[]).map((k) => (
                <option key={k} value={k}>
                  {HEAT_SOURCES[k].label} — {HEAT_SOURCES[k].scope}
                </option>
              ))}
            </select>
            {errors['economics.heatSource'] ? (
              <p className="field-error">{errors['economics.heatSource'].join(' ')}</p>
            ) : null}
          </div>
          <Num name="economics.co2KgPerKWh" label="CO₂ kg per kWh" hint={notes.co2KgPerKWh} />
          <div>
            <label htmlFor="db-coolingSource" className="label">
              Cooling source (cold lines)
            </label>
            <select
              id="db-coolingSource"
              name="economics.cooling.source"
              defaultValue={basis.economics.cooling.source}
              disabled={!canEdit}
              className="input"
            >
              {(Object.keys(COOLING_SOURCES) as (keyof typeof COOLING_SOURCES)[]).map((k) => (
                <option key={k} value={k}>
                  {COOLING_SOURCES[k].label} — {COOLING_SOURCES[k].scope}
                </option>
              ))}
            </select>
          </div>
          <Num
            name="economics.cooling.electricityPricePerKWh"
            label="Cold lines: electricity per kWh"
            hint={notes.cooling}
          />
          <Num name="economics.cooling.cop" label="Cold lines: chiller COP" />
          <Num name="economics.cooling.co2KgPerKWh" label="Cold lines: CO₂ kg per kWh of electricity" />
          <div className="md:col-span-4">
            <table className="table-dense" aria-label="Energy sources: default factors">
              <caption className="text-left text-xs text-ink-600">
                Defaults per energy source (type the project&apos;s own figures in the fields above)
              </caption>
              <thead>
                <tr>
                  <th>Source</th>
                  <th>Scope</th>
                  <th className="text-right">kg CO₂/kWh bought</th>
                  <th>Factor from</th>
                  <th className="text-right">Efficiency / COP</th>
                  <th>From</th>
                </tr>
              </thead>
              <tbody>
                {[...Object.values(HEAT_SOURCES), ...Object.values(COOLING_SOURCES)].map((s) => (
                  <tr key={s.label}>
                    <td>{s.label}</td>
                    <td>{s.scope}</td>
                    <td className="num">{s.co2KgPerKWh.toFixed(3)}</td>
                    <td className="text-xs">{s.co2Source}</td>
                    <td className="num">{s.efficiency}</td>
                    <td className="text-xs">{s.efficiencySource}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-1 text-xs text-ink-500">{notes.heatSource}</p>
          </div>
          <Num
            name="economics.flatRangePct"
            label="Flat range around the optimum, %"
            hint={notes.flatRange}
          />
          <div>
            <label htmlFor="db-economicChoice" className="label">
              Economic thickness to require
            </label>
            <select
              id="db-economicChoice"
              name="economics.economicChoice"
              defaultValue={basis.economics.economicChoice ?? 'optimum'}
              disabled={!canEdit}
              className="input"
            >
              <option value="optimum">The optimum (lowest annual cost)</option>
              <option value="thinnest-within-range">The thinnest within the flat range</option>
            </select>
          </div>
          <Num name="prices.defaultMaterialPerM3" label="Material price (default)" />
          <Num name="prices.wasteFraction" label="Waste allowance (fraction)" />
          <Num name="prices.labourPerMPerLayer" label="Labour per layer (a pipe of unknown size)" />
          <Num name="prices.labourPerM2PerLayer" label="Labour on surfaces per layer" />
          <Num name="prices.jacketPerM2" label="Jacket price" />
          <Num
            name="prices.fittingsAllowanceFraction"
            label="Fittings allowance when a line has no counts (fraction)"
          />
          {basis.prices.labourByNps?.map((b, i) => (
            <Num
              key={`lab${i}`}
              name={`prices.labourByNps[${i}].perMPerLayer`}
              label={`Pipe labour per layer, ${i === 0 ? `up to NPS ${b.maxNps}` : b.maxNps >= 1000 ? `over NPS ${basis.prices.labourByNps![i - 1].maxNps}` : `NPS ${basis.prices.labourByNps![i - 1].maxNps}–${b.maxNps}`}`}
            />
          ))}
          {basis.prices.labourByNps?.map((b, i) => (
            <input key={`labn${i}`} type="hidden" name={`prices.labourByNps[${i}].maxNps`} value={b.maxNps} />
          ))}
          <Num name="prices.accessoriesPerM" label="Accessories on pipe" />
          <Num name="prices.accessoriesPerM2" label="Accessories on vessels and flat surfaces" />
          <Num name="prices.fittingItem.elbow" label="Insulating an elbow, per layer" />
          <Num name="prices.fittingItem.tee" label="Insulating a tee, per layer" />
          <Num name="prices.fittingItem.valve" label="Insulating a valve (removable cover), per layer" />
          <Num name="prices.fittingItem.flangePair" label="Insulating a flange pair, per layer" />
        </div>
      </div>
      {canEdit ? (
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? 'Saving…' : 'Save design basis'}
        </button>
      ) : (
        <p className="text-sm text-ink-500">Only owners and engineers change the design basis.</p>
      )}
    </form>
  );
}
