'use client';
import { TOUCH_SURFACE_LABEL } from '@/lib/thermal/touch';
import { startTransition, useActionState, useEffect, useRef, useState } from 'react';
import type { OwnJacket, OwnMaterial } from '@/lib/lines/design-basis';
import { addOwnJacketAction, addOwnMaterialAction, removeOwnEntryAction } from './actions';

type Result = Awaited<ReturnType<typeof addOwnMaterialAction>> | undefined;

function Messages({ result, done }: { result: Result; done: string }) {
  if (result?.status === 'success')
    return (
      <p role="status" className="rounded border border-mineral-300 bg-mineral-50 px-3 py-2 text-sm">
        {done} Design-basis revision {result.revision}: lines solved earlier are now stale.
      </p>
    );
  if (result?.error?.[''])
    return (
      <p role="alert" className="text-sm text-alarm-700">
        {result.error[''].join(' ')}
      </p>
    );
  if (result?.status === 'error')
    return (
      <p role="alert" className="text-sm text-alarm-700">
        Some values are not valid; see the fields marked below. Nothing was saved.
      </p>
    );
  return null;
}

function Field({
  id,
  name,
  label,
  errors,
  hint,
  children,
}: {
  id?: string;
  name: string;
  label: string;
  errors: Record<string, string[] | null>;
  hint?: string;
  children: React.ReactElement;
}) {
  const err = errors[name];
  return (
    <div>
      <label htmlFor={id ?? `own-${name}`} className="label">
        {label}
      </label>
      {children}
      {err ? (
        <p className="field-error">{err.join(' ')}</p>
      ) : hint ? (
        <p className="mt-1 text-xs text-ink-500">{hint}</p>
      ) : null}
    </div>
  );
}

/** Sets named fields of a form (uncontrolled inputs keep what the user then types). */
function fill(form: HTMLFormElement, values: Record<string, string | number>) {
  for (const [name, v] of Object.entries(values)) {
    const el = form.elements.namedItem(name) as
      | HTMLInputElement
      | HTMLTextAreaElement
      | HTMLSelectElement
      | null;
    if (el) el.value = String(v);
  }
}

const kSummary = (m: OwnMaterial) => {
  const p = [...m.kPoints].sort((a, b) => a[0] - b[0]);
  return p.length === 1
    ? `${p[0][1]} at ${p[0][0]} °C`
    : `${p[0][1]} at ${p[0][0]} °C … ${p[p.length - 1][1]} at ${p[p.length - 1][0]} °C (${p.length} points)`;
};

function RemoveButton({
  projectId,
  id,
  name,
  onResult,
}: {
  projectId: string;
  id: string;
  name: string;
  onResult: (r: Result) => void;
}) {
  const [result, action, pending] = useActionState(async (prev: unknown, fd: FormData) => {
    const r = await removeOwnEntryAction(prev, fd);
    onResult(r);
    return r;
  }, undefined);
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        startTransition(() => action(fd));
      }}
    >
      <input type="hidden" name="projectId" value={projectId} />
      <input type="hidden" name="id" value={id} />
      <button type="submit" className="btn-quiet" disabled={pending} aria-label={`Remove ${name}`}>
        {pending ? 'Removing…' : 'Remove'}
      </button>
      {result?.error?.[''] ? <span className="sr-only">{result.error[''].join(' ')}</span> : null}
    </form>
  );
}

export function OwnCatalogue({
  projectId,
  materials,
  jackets,
  prices,
  canEdit,
  note,
}: {
  projectId: string;
  materials: OwnMaterial[];
  jackets: OwnJacket[];
  prices: Record<string, number>;
  canEdit: boolean;
  note: string;
}) {
  const [mResult, mAction, mPending] = useActionState(addOwnMaterialAction, undefined);
  const [jResult, jAction, jPending] = useActionState(addOwnJacketAction, undefined);
  const [rResult, setRemoveResult] = useState<Result>(undefined);
  // The entry being changed (its values fill the form, which then saves in place), or null to add one.
  const [editM, setEditM] = useState<OwnMaterial | null>(null),
    [editJ, setEditJ] = useState<OwnJacket | null>(null);
  const mWasEdit = useRef(false),
    jWasEdit = useRef(false);
  const pricesRef = useRef(prices);
  pricesRef.current = prices;
  const mForm = useRef<HTMLFormElement>(null),
    jForm = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (mResult?.status === 'success') {
      mForm.current?.reset();
      setEditM(null);
    }
  }, [mResult]);
  useEffect(() => {
    if (jResult?.status === 'success') {
      jForm.current?.reset();
      setEditJ(null);
    }
  }, [jResult]);
  // Changing an entry fills the one form with its values; cancelling (or saving) resets it to the defaults for a new one.
  // Never on mount: a value typed before the page finished loading must not be wiped.
  const mShown = useRef<OwnMaterial | null>(null),
    jShown = useRef<OwnJacket | null>(null);
  useEffect(() => {
    const f = mForm.current;
    if (!f || mShown.current === editM) return;
    mShown.current = editM;
    f.reset();
    if (editM)
      fill(f, {
        name: editM.name,
        productForm: editM.productForm,
        source: editM.source,
        kTable: [...editM.kPoints]
          .sort((a, b) => a[0] - b[0])
          .map((p) => `${p[0]}, ${p[1]}`)
          .join('\n'),
        minServiceC: editM.minServiceC,
        maxServiceC: editM.maxServiceC,
        densityKgPerM3: editM.densityKgPerM3,
        specificHeatJPerKgK: editM.specificHeatJPerKgK,
        thicknesses: editM.thicknessesMm.join(', '),
        maxLayerMm: editM.maxLayerMm,
        maxLayers: editM.maxLayers,
        pricePerM3: pricesRef.current[editM.id] ?? '',
      });
  }, [editM]);
  useEffect(() => {
    const f = jForm.current;
    if (!f || jShown.current === editJ) return;
    jShown.current = editJ;
    f.reset();
    if (editJ) {
      fill(f, { name: editJ.name, emittance: editJ.emittance, source: editJ.source });
      (f.elements.namedItem('metal') as HTMLInputElement).checked = editJ.metal;
      (f.elements.namedItem('touchSurface') as HTMLSelectElement).value = editJ.touchSurface ?? '';
    }
  }, [editJ]);
  const mErr = (mResult?.error ?? {}) as Record<string, string[] | null>;
  const jErr = (jResult?.error ?? {}) as Record<string, string[] | null>;
  const submit = (act: (fd: FormData) => void) => (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    startTransition(() => act(fd));
  };
  return (
    <section className="mt-8 space-y-4" aria-labelledby="own-heading">
      <h2 id="own-heading">Project materials and jackets</h2>
      <p className="max-w-3xl text-sm text-ink-600">
        {note} Entries added here can be chosen in the specification bands above and as a line&apos;s jacket
        override (by the id shown).
      </p>
      <Messages result={rResult} done="Removed." />

      <div className="panel overflow-x-auto p-3">
        <table className="table-dense" aria-label="Project materials">
          <thead>
            <tr>
              <th>Material</th>
              <th>Id</th>
              <th>Form</th>
              <th>k, W/(m·K)</th>
              <th>Service °C</th>
              <th>Thicknesses mm</th>
              <th>Price per m³</th>
              <th>Source of data</th>
              {canEdit ? <th /> : null}
            </tr>
          </thead>
          <tbody>
            {materials.length === 0 ? (
              <tr>
                <td colSpan={9} className="text-ink-500">
                  No project materials yet: the library&apos;s typical values are in use.
                </td>
              </tr>
            ) : (
              materials.map((m) => (
                <tr key={m.id}>
                  <td className="font-medium">{m.name}</td>
                  <td className="font-mono text-xs">{m.id}</td>
                  <td>{m.productForm}</td>
                  <td>{kSummary(m)}</td>
                  <td>
                    {m.minServiceC} to {m.maxServiceC}
                  </td>
                  <td>
                    {m.thicknessesMm.join(', ')} (≤ {m.maxLayerMm} per layer, {m.maxLayers} layers)
                  </td>
                  <td>{prices[m.id] ?? '—'}</td>
                  <td className="max-w-xs text-xs">{m.source}</td>
                  {canEdit ? (
                    <td className="flex gap-1">
                      <button
                        type="button"
                        className="btn-quiet"
                        aria-label={`Change ${m.name}`}
                        onClick={() => setEditM(m)}
                      >
                        Change
                      </button>
                      <RemoveButton
                        projectId={projectId}
                        id={m.id}
                        name={m.name}
                        onResult={setRemoveResult}
                      />
                    </td>
                  ) : null}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>

      <div className="panel overflow-x-auto p-3">
        <table className="table-dense" aria-label="Project jackets">
          <thead>
            <tr>
              <th>Jacket</th>
              <th>Id</th>
              <th>Emittance</th>
              <th>Surface</th>
              <th>Source</th>
              {canEdit ? <th /> : null}
            </tr>
          </thead>
          <tbody>
            {jackets.length === 0 ? (
              <tr>
                <td colSpan={6} className="text-ink-500">
                  No project jackets yet.
                </td>
              </tr>
            ) : (
              jackets.map((j) => (
                <tr key={j.id}>
                  <td className="font-medium">{j.name}</td>
                  <td className="font-mono text-xs">{j.id}</td>
                  <td>{j.emittance}</td>
                  <td>
                    {j.metal ? 'metal' : 'non-metal'}
                    {j.touchSurface ? ` (touch: ${TOUCH_SURFACE_LABEL[j.touchSurface]})` : ''}
                  </td>
                  <td className="max-w-xs text-xs">{j.source}</td>
                  {canEdit ? (
                    <td className="flex gap-1">
                      <button
                        type="button"
                        className="btn-quiet"
                        aria-label={`Change ${j.name}`}
                        onClick={() => setEditJ(j)}
                      >
                        Change
                      </button>
                      <RemoveButton
                        projectId={projectId}
                        id={j.id}
                        name={j.name}
                        onResult={setRemoveResult}
                      />
                    </td>
                  ) : null}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>

      {canEdit ? (
        <div className="grid gap-4 xl:grid-cols-3">
          <form
            ref={mForm}
            className="panel space-y-3 p-3 xl:col-span-2"
            aria-label={editM ? 'Change a project material' : 'Add a project material'}
            onSubmit={(e) => {
              mWasEdit.current = !!editM;
              submit(mAction)(e);
            }}
            noValidate
          >
            <h3 className="text-sm font-semibold">{editM ? `Change ${editM.name}` : 'Add a material'}</h3>
            <Messages result={mResult} done={mWasEdit.current ? 'Material changed.' : 'Material added.'} />
            <input type="hidden" name="projectId" value={projectId} />
            {editM ? <input type="hidden" name="id" value={editM.id} /> : null}
            <div className="grid gap-3 md:grid-cols-3">
              <Field name="name" label="Name" errors={mErr}>
                <input
                  id="own-name"
                  name="name"
                  className="input"
                  aria-invalid={mErr.name ? true : undefined}
                />
              </Field>
              <Field name="productForm" label="Product form" errors={mErr}>
                <select id="own-productForm" name="productForm" className="input" defaultValue="pipe-section">
                  <option value="pipe-section">pipe section</option>
                  <option value="blanket">blanket</option>
                  <option value="board">board</option>
                  <option value="tube">tube</option>
                </select>
              </Field>
              <Field
                name="source"
                label="Source of the data"
                errors={mErr}
                hint="Data sheet, revision, test standard."
              >
                <input
                  id="own-source"
                  name="source"
                  className="input"
                  aria-invalid={mErr.source ? true : undefined}
                />
              </Field>
              <Field
                name="kTable"
                label="Conductivity: mean °C, k W/(m·K) — one per line"
                errors={mErr}
                hint="Between the points k is interpolated linearly; beyond the ends it stays constant."
              >
                <textarea
                  id="own-kTable"
                  name="kTable"
                  rows={5}
                  className="input font-mono"
                  placeholder={'10, 0.035\n100, 0.044\n200, 0.058'}
                  aria-invalid={mErr.kTable ? true : undefined}
                />
              </Field>
              <div className="grid grid-cols-2 gap-3 md:col-span-2">
                <Field name="minServiceC" label="Lowest service °C" errors={mErr}>
                  <input
                    id="own-minServiceC"
                    name="minServiceC"
                    type="number"
                    step="any"
                    className="input"
                    aria-invalid={mErr.minServiceC ? true : undefined}
                  />
                </Field>
                <Field name="maxServiceC" label="Highest service °C" errors={mErr}>
                  <input
                    id="own-maxServiceC"
                    name="maxServiceC"
                    type="number"
                    step="any"
                    className="input"
                    aria-invalid={mErr.maxServiceC ? true : undefined}
                  />
                </Field>
                <Field name="densityKgPerM3" label="Density kg/m³" errors={mErr}>
                  <input
                    id="own-densityKgPerM3"
                    name="densityKgPerM3"
                    type="number"
                    step="any"
                    className="input"
                    aria-invalid={mErr.densityKgPerM3 ? true : undefined}
                  />
                </Field>
                <Field name="specificHeatJPerKgK" label="Specific heat J/(kg·K)" errors={mErr}>
                  <input
                    id="own-specificHeatJPerKgK"
                    name="specificHeatJPerKgK"
                    type="number"
                    step="any"
                    defaultValue="840"
                    className="input"
                    aria-invalid={mErr.specificHeatJPerKgK ? true : undefined}
                  />
                </Field>
              </div>
              <Field name="thicknesses" label="Thicknesses sold, mm" errors={mErr}>
                <input
                  id="own-thicknesses"
                  name="thicknesses"
                  className="input"
                  placeholder="25, 30, 40, 50, 60, 80, 100"
                  aria-invalid={mErr.thicknesses ? true : undefined}
                />
              </Field>
              <Field
                name="maxLayerMm"
                label="Thickest single layer, mm"
                errors={mErr}
                hint="Thicker totals go to staggered layers."
              >
                <input
                  id="own-maxLayerMm"
                  name="maxLayerMm"
                  type="number"
                  step="any"
                  defaultValue="100"
                  className="input"
                  aria-invalid={mErr.maxLayerMm ? true : undefined}
                />
              </Field>
              <Field name="maxLayers" label="Most layers" errors={mErr}>
                <input
                  id="own-maxLayers"
                  name="maxLayers"
                  type="number"
                  step="1"
                  defaultValue="3"
                  className="input"
                  aria-invalid={mErr.maxLayers ? true : undefined}
                />
              </Field>
              <Field
                name="pricePerM3"
                label="Price per m³ (optional)"
                errors={mErr}
                hint="Else the default material price."
              >
                <input
                  id="own-pricePerM3"
                  name="pricePerM3"
                  type="number"
                  step="any"
                  className="input"
                  aria-invalid={mErr.pricePerM3 ? true : undefined}
                />
              </Field>
            </div>
            <div className="flex gap-2">
              <button type="submit" className="btn-primary" disabled={mPending}>
                {mPending ? 'Saving…' : editM ? 'Save changes' : 'Add material'}
              </button>
              {editM ? (
                <button type="button" className="btn-quiet" onClick={() => setEditM(null)}>
                  Cancel
                </button>
              ) : null}
            </div>
          </form>

          <form
            ref={jForm}
            className="panel space-y-3 p-3"
            aria-label={editJ ? 'Change a project jacket' : 'Add a project jacket'}
            onSubmit={(e) => {
              jWasEdit.current = !!editJ;
              submit(jAction)(e);
            }}
            noValidate
          >
            <h3 className="text-sm font-semibold">{editJ ? `Change ${editJ.name}` : 'Add a jacket'}</h3>
            <Messages result={jResult} done={jWasEdit.current ? 'Jacket changed.' : 'Jacket added.'} />
            <input type="hidden" name="projectId" value={projectId} />
            {editJ ? <input type="hidden" name="id" value={editJ.id} /> : null}
            <Field id="own-j-name" name="name" label="Name" errors={jErr}>
              <input
                id="own-j-name"
                name="name"
                className="input"
                aria-invalid={jErr.name ? true : undefined}
              />
            </Field>
            <Field
              id="own-j-emittance"
              name="emittance"
              label="Emittance (0–1)"
              errors={jErr}
              hint="Low-emittance metal runs hotter: it matters for the touch check."
            >
              <input
                id="own-j-emittance"
                name="emittance"
                type="number"
                step="any"
                className="input"
                aria-invalid={jErr.emittance ? true : undefined}
              />
            </Field>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" name="metal" defaultChecked /> Metal surface (metal touch limit applies)
            </label>
            <Field
              id="own-j-touchSurface"
              name="touchSurface"
              label="Surface a hand touches (ISO 13732-1)"
              errors={jErr}
            >
              <select id="own-j-touchSurface" name="touchSurface" className="input" defaultValue="">
                <option value="">From the metal box (bare metal or plastics)</option>
                {(Object.keys(TOUCH_SURFACE_LABEL) as (keyof typeof TOUCH_SURFACE_LABEL)[]).map((k) => (
                  <option key={k} value={k}>
                    {TOUCH_SURFACE_LABEL[k]}
                  </option>
                ))}
              </select>
            </Field>
            <Field id="own-j-source" name="source" label="Source of the emittance" errors={jErr}>
              <input
                id="own-j-source"
                name="source"
                className="input"
                aria-invalid={jErr.source ? true : undefined}
              />
            </Field>
            <div className="flex gap-2">
              <button type="submit" className="btn-primary" disabled={jPending}>
                {jPending ? 'Saving…' : editJ ? 'Save changes' : 'Add jacket'}
              </button>
              {editJ ? (
                <button type="button" className="btn-quiet" onClick={() => setEditJ(null)}>
                  Cancel
                </button>
              ) : null}
            </div>
          </form>
        </div>
      ) : null}
    </section>
  );
}
