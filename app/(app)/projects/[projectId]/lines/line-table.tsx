'use client';
import Link from 'next/link';
import { useMemo, useState, useTransition } from 'react';
import { keepPreviousData, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { acceptRecommendationsAction, pickThicknessAction, solveLinesAction } from './actions';
import { formatter, type Formatter, type FormatOptions, type UnitSystem } from '@/lib/format';
import { isSurfaceGeometry } from '@/lib/lines/fields';

interface Candidate { mm: number; heatFlow: number; surfaceC: number; personnelC: number | null; condensationC: number | null; ok: boolean }
interface Limits { personnelLimitC: number | null; condensationNeedC: number | null; dewPointC: number | null; dewBasis: string | null }
interface Margin { criterion: 'personnel' | 'condensation'; marginK: number }
interface Row {
  id: string; tag: string; service: string; area: string; geometry: string; nps: string | null; outsideDiameterMm: number | null;
  normalTempC: number; recommendedMm: number | null; governing: string | null; heatFlowPerUnit: number | null; surfaceTempC: number | null;
  unmet: string[] | null; chosenMm: number | null; source: 'recommended' | 'manual' | null; belowCriterion: string | null; needsRedecision: boolean | null;
  designVersion: number | null; stale: boolean; candidates: Candidate[]; limits: Limits; worstMargin: Margin | null;
}
interface Page { rows: Row[]; total: number; page: number; size: number }

const GOV: Record<string, string> = { personnel: 'Personnel', condensation: 'Condensation', heatLossLimit: 'Heat-loss limit', processDrop: 'Process drop', freeze: 'Freeze', economic: 'Economic' };
const f1 = (v: number | null | undefined) => (v === null || v === undefined ? '—' : v.toFixed(1));
const ch = createColumnHelper<Row>();

export function LineTable({ projectId, areas, canPick, canSolve, unitSystem = 'SI', format }: { projectId: string; areas: string[]; canPick: boolean; canSolve: boolean; unitSystem?: UnitSystem; format?: FormatOptions }) {
  const fmt = format ?? { unitSystem };
  const u = formatter(fmt);
  const qc = useQueryClient();
  const [page, setPage] = useState(0);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'tag', desc: false }]);
  const [q, setQ] = useState('');
  const [area, setArea] = useState('');
  const [status, setStatus] = useState('');
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const [pending, start] = useTransition();
  const size = 100;
  const sort = sorting[0] ?? { id: 'tag', desc: false };
  const params = new URLSearchParams({ page: String(page), size: String(size), sort: sort.id, dir: sort.desc ? 'desc' : 'asc', ...(q ? { q } : {}), ...(area ? { area } : {}), ...(status ? { status } : {}) });
  const query = useQuery({
    queryKey: ['lines', projectId, params.toString()],
    queryFn: async (): Promise<Page> => {
      const r = await fetch(`/api/v1/projects/${projectId}/lines?${params}`);
      if (!r.ok) throw new Error((await r.json()).error?.message ?? 'The line list could not be loaded.');
      return r.json();
    },
    placeholderData: keepPreviousData,
  });
  const refresh = () => qc.invalidateQueries({ queryKey: ['lines', projectId] });

  const columns = useMemo(() => [
    ch.accessor('tag', { header: 'Tag', cell: (c) => <Link href={`/projects/${projectId}/lines/${c.row.original.id}`} className="font-mono">{c.getValue()}</Link> }),
    ch.accessor('service', { header: 'Service', enableSorting: false }),
    ch.accessor('area', { header: 'Area' }),
    ch.accessor('outsideDiameterMm', { header: 'Size', cell: (c) => c.row.original.nps ? `NPS ${c.row.original.nps}` : c.row.original.geometry === 'vessel' ? 'Vessel' : c.row.original.geometry === 'flat' ? 'Flat' : u.diameter(c.getValue()) }),
    ch.accessor('normalTempC', { header: `T ${u.units.temp}`, cell: (c) => <span className="num block">{u.tempValue(c.getValue())}</span> }),
    ch.accessor('recommendedMm', { header: 'Rec. thickness', cell: (c) => <span className="num block">{u.thickness(c.getValue())}</span> }),
    ch.accessor('governing', { header: 'Governs', cell: (c) => (c.getValue() ? GOV[c.getValue()!] ?? c.getValue() : '—') }),
    ch.accessor('surfaceTempC', { header: `Surface ${u.units.temp}`, cell: (c) => <span className="num block">{u.tempValue(c.getValue())}</span> }),
    // Each cell carries its own unit: pipes in per-length, vessels and flat surfaces in per-area.
    ch.accessor('heatFlowPerUnit', { header: 'Heat loss', cell: (c) => <span className="num block whitespace-nowrap">{u.heatFlowPerUnit(c.getValue(), isSurfaceGeometry(c.row.original.geometry))}</span> }),
    ch.display({ id: 'margin', header: 'Worst margin', cell: (c) => <MarginCell m={c.row.original.worstMargin} u={u} /> }),
    ch.display({ id: 'status', header: 'Status', cell: (c) => <Badges row={c.row.original} /> }),
    ch.display({ id: 'pick', header: 'Chosen thickness', cell: (c) => <PickCell row={c.row.original} projectId={projectId} canPick={canPick} onSaved={refresh} u={u} /> }),
  ], [projectId, canPick, fmt.unitSystem, fmt.thicknessSeries, fmt.currency]); // eslint-disable-line react-hooks/exhaustive-deps

  const data = query.data?.rows ?? [];
  const table = useReactTable({
    data, columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true,
    state: { sorting }, onSortingChange: (u) => { setSorting(u); setPage(0); }, enableSortingRemoval: false,
  });
  const total = query.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / size));

  function solve() {
    start(async () => {
      const r = await solveLinesAction(projectId, { all: false });
      setMessage(r.ok ? { kind: 'ok', text: `${r.data.solved} stale line${r.data.solved === 1 ? '' : 's'} solved in ${r.data.solveMs} ms.` } : { kind: 'error', text: r.error });
      refresh();
    });
  }
  function acceptAll() {
    start(async () => {
      const r = await acceptRecommendationsAction(projectId, { q, area });
      setMessage(r.ok ? { kind: 'ok', text: `Recommendation accepted for ${r.data.accepted} line${r.data.accepted === 1 ? '' : 's'}.` } : { kind: 'error', text: r.error });
      refresh();
    });
  }

  return (
    <section aria-label="Lines">
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div><label className="label" htmlFor="f-q">Search tag or service</label><input id="f-q" className="input" value={q} onChange={(e) => { setQ(e.target.value); setPage(0); }} /></div>
        <div><label className="label" htmlFor="f-area">Area</label>
          <select id="f-area" className="input" value={area} onChange={(e) => { setArea(e.target.value); setPage(0); }}>
            <option value="">All areas</option>{areas.map((a) => <option key={a}>{a}</option>)}
          </select></div>
        <div><label className="label" htmlFor="f-status">Status</label>
          <select id="f-status" className="input" value={status} onChange={(e) => { setStatus(e.target.value); setPage(0); }}>
            <option value="">Any</option><option value="stale">Stale</option><option value="flagged">Flagged</option><option value="overridden">Manual pick</option><option value="undecided">Undecided</option><option value="redecide">Needs re-decision</option>
          </select></div>
        <div className="ml-auto flex gap-2">
          {canSolve ? <button className="btn-quiet" onClick={solve} disabled={pending}>Solve stale lines</button> : null}
          {canPick ? <button className="btn-primary" onClick={acceptAll} disabled={pending || !total}>Accept recommendation for the filtered lines</button> : null}
        </div>
      </div>
      {message ? <p role={message.kind === 'error' ? 'alert' : 'status'} className={`mb-3 text-sm ${message.kind === 'error' ? 'text-alarm-700' : 'text-mineral-800'}`}>{message.text}</p> : null}
      {query.error ? <p role="alert" className="text-sm text-alarm-700">{(query.error as Error).message}</p> : null}
      <div className="panel overflow-x-auto">
        <table className="table-dense" aria-label="Line table">
          <thead>{table.getHeaderGroups().map((g) => (
            <tr key={g.id}>{g.headers.map((h) => (
              <th key={h.id} aria-sort={h.column.getIsSorted() ? (h.column.getIsSorted() === 'desc' ? 'descending' : 'ascending') : undefined}>
                {h.column.getCanSort() ? (
                  <button className="uppercase" onClick={h.column.getToggleSortingHandler()}>{flexRender(h.column.columnDef.header, h.getContext())}{h.column.getIsSorted() === 'asc' ? ' ▲' : h.column.getIsSorted() === 'desc' ? ' ▼' : ''}</button>
                ) : flexRender(h.column.columnDef.header, h.getContext())}
              </th>))}</tr>))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => <tr key={r.id} data-tag={r.original.tag}>{r.getVisibleCells().map((c) => <td key={c.id}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>)}
            {!query.isLoading && data.length === 0 ? <tr><td colSpan={columns.length} className="py-6 text-center text-ink-500">No lines match. {total === 0 && !q && !area && !status ? 'Import a line list above.' : ''}</td></tr> : null}
          </tbody>
        </table>
      </div>
      <div className="mt-2 flex items-center gap-3 text-sm text-ink-600">
        <span>{total} lines{query.isFetching ? ' · loading…' : ''}</span>
        <button className="btn-quiet py-0.5" disabled={page === 0} onClick={() => setPage((p) => p - 1)}>Previous</button>
        <span>Page {page + 1} of {pages}</span>
        <button className="btn-quiet py-0.5" disabled={page + 1 >= pages} onClick={() => setPage((p) => p + 1)}>Next</button>
      </div>
    </section>
  );
}

function Badges({ row }: { row: Row }) {
  return (
    <span className="flex flex-wrap gap-1">
      {row.stale ? <span className="badge bg-ochre-100 text-ochre-900">stale</span> : null}
      {row.unmet?.length ? <span className="badge bg-alarm-100 text-alarm-700" title={row.unmet.join(', ')}>unmet: {row.unmet.map((u) => GOV[u] ?? u).join(', ')}</span> : null}
      {row.belowCriterion ? <span className="badge bg-alarm-100 text-alarm-700">below {row.belowCriterion}</span> : null}
      {row.source === 'manual' ? <span className="badge bg-ink-100 text-ink-700">manual</span> : null}
      {row.needsRedecision ? <span className="badge bg-ochre-100 text-ochre-900">re-decide</span> : null}
      {row.chosenMm === null && !row.stale ? <span className="badge bg-ink-50 text-ink-500">undecided</span> : null}
    </span>
  );
}

/** The smallest margin to a temperature limit at the chosen thickness (the recommendation while undecided). */
function MarginCell({ m, u }: { m: Margin | null; u: Formatter }) {
  if (!m) return <span className="text-ink-400">—</span>;
  return <span className={`num block whitespace-nowrap ${m.marginK < 0 ? 'font-semibold text-alarm-700' : ''}`} title={m.criterion === 'personnel' ? 'Touch limit minus the personnel surface temperature' : 'Condensation surface temperature minus dew point + margin'}>{u.tempDelta(m.marginK)} {m.criterion}</span>;
}

/** A candidate's deciding numbers in one line: heat-loss surface and loss, then each applicable criterion with its limit. */
function candidateText(c: Candidate, row: Row, u: Formatter): string {
  const parts = [`heat loss ${u.temp(c.surfaceC)}, ${u.heatFlowPerUnit(c.heatFlow, isSurfaceGeometry(row.geometry))}`];
  if (row.limits.personnelLimitC !== null) parts.push(`personnel ${u.temp(c.personnelC)} (limit ${u.temp(row.limits.personnelLimitC)})`);
  if (row.limits.condensationNeedC !== null) parts.push(`condensation ${u.temp(c.condensationC)} (min ${u.temp(row.limits.condensationNeedC)})`);
  return parts.join(' · ');
}

function PickCell({ row, projectId, canPick, onSaved, u }: { row: Row; projectId: string; canPick: boolean; onSaved: () => void; u: Formatter }) {
  const [value, setValue] = useState<string>(row.chosenMm !== null ? String(row.chosenMm) : '');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  if (!canPick) return <span className="num block">{u.thickness(row.chosenMm)}</span>;
  if (!row.candidates.length) return <span className="text-xs text-ink-500">solve first</span>;
  const picked = value === '' ? null : Number(value);
  const needsReason = picked !== null && picked !== row.recommendedMm;
  const dirty = picked !== null && picked !== row.chosenMm;
  const shownCand = row.candidates.find((c) => c.mm === (picked ?? row.recommendedMm));
  function save() {
    setError(null);
    start(async () => {
      const r = await pickThicknessAction(projectId, { lineId: row.id, thicknessMm: picked!, reason: reason || undefined, expectedVersion: row.designVersion ?? 0 });
      if (!r.ok) { setError(r.error); return; }
      setReason(''); onSaved();
    });
  }
  return (
    <div className="min-w-[15rem] space-y-1">
      <div className="flex gap-1">
        <select aria-label={`Thickness for ${row.tag}`} className="input py-0.5 text-xs" value={value} onChange={(e) => setValue(e.target.value)}>
          <option value="">—</option>
          {row.candidates.map((c) => (
            <option key={c.mm} value={c.mm} disabled={!c.ok}>
              {u.thickness(c.mm)}{c.mm === row.recommendedMm ? ' ★' : ''} · {candidateText(c, row, u)}{!c.ok ? ' · layer over its service limit' : ''}
            </option>
          ))}
        </select>
        {dirty ? <button className="btn-primary px-2 py-0.5 text-xs" onClick={save} disabled={pending || (needsReason && !reason.trim())}>Save</button> : null}
      </div>
      {shownCand ? <p className="text-xs text-ink-600" data-testid={`deciding-${row.tag}`}>{u.thickness(shownCand.mm)}: {candidateText(shownCand, row, u)}</p> : null}
      {dirty && needsReason ? <input aria-label={`Reason for ${row.tag}`} className="input py-0.5 text-xs" placeholder="Reason for this pick (required)" value={reason} onChange={(e) => setReason(e.target.value)} /> : null}
      {error ? <p role="alert" className="text-xs text-alarm-700">{error}</p> : null}
    </div>
  );
}
