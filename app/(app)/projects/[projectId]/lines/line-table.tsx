'use client';
import Link from 'next/link';
import { useEffect, useMemo, useRef, useState, useTransition } from 'react';
import { keepPreviousData, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import {
  applyBulkAcceptAction,
  pickThicknessAction,
  previewBulkAcceptAction,
  solveLinesAction,
  startSheetsBatchAction,
  undoBulkAcceptAction,
} from './actions';
import { LINE_STATUSES, LINE_STATUS_LABEL, type LineFilter, type LineStatus } from '@/lib/lines/filter';
import type { BulkPreview } from '@/lib/lines/bulk-accept';
import { SHEETS_INLINE_LIMIT } from '@/lib/documents/limits';
import { formatter, type Formatter, type FormatOptions, type UnitSystem } from '@/lib/format';
import { isSurfaceGeometry } from '@/lib/lines/fields';

interface Candidate {
  mm: number;
  heatFlow: number;
  surfaceC: number;
  personnelC: number | null;
  condensationC: number | null;
  ok: boolean;
}
interface Margin {
  criterion: 'personnel' | 'condensation';
  marginK: number;
}
interface Row {
  id: string;
  tag: string;
  service: string;
  area: string;
  geometry: string;
  nps: string | null;
  outsideDiameterMm: number | null;
  normalTempC: number;
  recommendedMm: number | null;
  governing: string | null;
  heatFlowPerUnit: number | null;
  surfaceTempC: number | null;
  unmet: string[] | null;
  chosenMm: number | null;
  source: 'recommended' | 'manual' | null;
  belowCriterion: string | null;
  needsRedecision: boolean | null;
  designVersion: number | null;
  stale: boolean;
  solved: boolean;
  personnelLimitC: number | null;
  condensationNeedC: number | null;
  /** Deciding numbers at chosenMm, else recommendedMm. */
  shown: Omit<Candidate, 'mm'> | null;
  worstMargin: Margin | null;
}
interface Page {
  rows: Row[];
  total: number;
  page: number;
  size: number;
}

const GOV: Record<string, string> = {
  personnel: 'Personnel',
  condensation: 'Condensation',
  heatLossLimit: 'Heat-loss limit',
  processDrop: 'Process drop',
  freeze: 'Freeze',
  economic: 'Economic',
};
const ch = createColumnHelper<Row>();

export function LineTable({
  projectId,
  areas,
  canPick,
  canSolve,
  unitSystem = 'SI',
  format,
}: {
  projectId: string;
  areas: string[];
  canPick: boolean;
  canSolve: boolean;
  unitSystem?: UnitSystem;
  format?: FormatOptions;
}) {
  const fmt = format ?? { unitSystem };
  const u = formatter(fmt);
  const qc = useQueryClient();
  const [page, setPage] = useState(0);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'tag', desc: false }]);
  const [q, setQ] = useState('');
  const [area, setArea] = useState('');
  const [status, setStatus] = useState('');
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const [bulkPreview, setBulkPreview] = useState<BulkPreview | null>(null);
  const [undoable, setUndoable] = useState<string | null>(null); // the last bulk accept's id, while it can be undone
  const [pending, start] = useTransition();
  const size = 100;
  const sort = sorting[0] ?? { id: 'tag', desc: false };
  const params = new URLSearchParams({
    page: String(page),
    size: String(size),
    sort: sort.id,
    dir: sort.desc ? 'desc' : 'asc',
    ...(q ? { q } : {}),
    ...(area ? { area } : {}),
    ...(status ? { status } : {}),
  });
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

  // biome-ignore lint/correctness/useExhaustiveDependencies: the columns change with the project, the role and the display units only; the row callbacks read current state through the query
  const columns = useMemo(
    () => [
      ch.accessor('tag', {
        header: 'Tag',
        cell: (c) => (
          <Link href={`/projects/${projectId}/lines/${c.row.original.id}`} className="font-mono">
            {c.getValue()}
          </Link>
        ),
      }),
      ch.accessor('service', { header: 'Service', enableSorting: false }),
      ch.accessor('area', { header: 'Area' }),
      ch.accessor('outsideDiameterMm', {
        header: 'Size',
        cell: (c) =>
          c.row.original.nps
            ? `NPS ${c.row.original.nps}`
            : c.row.original.geometry === 'vessel'
              ? 'Vessel'
              : c.row.original.geometry === 'flat'
                ? 'Flat'
                : u.diameter(c.getValue()),
      }),
      ch.accessor('normalTempC', {
        header: `T ${u.units.temp}`,
        cell: (c) => <span className="num block">{u.tempValue(c.getValue())}</span>,
      }),
      ch.accessor('recommendedMm', {
        header: 'Rec. thickness',
        cell: (c) => <span className="num block">{u.thickness(c.getValue())}</span>,
      }),
      ch.accessor('governing', {
        header: 'Governs',
        cell: (c) => (c.getValue() ? (GOV[c.getValue()!] ?? c.getValue()) : '—'),
      }),
      ch.accessor('surfaceTempC', {
        header: `Surface ${u.units.temp}`,
        cell: (c) => <span className="num block">{u.tempValue(c.getValue())}</span>,
      }),
      // Each cell carries its own unit: pipes in per-length, vessels and flat surfaces in per-area.
      ch.accessor('heatFlowPerUnit', {
        header: 'Heat loss',
        cell: (c) => (
          <span className="num block whitespace-nowrap">
            {u.heatFlowPerUnit(c.getValue(), isSurfaceGeometry(c.row.original.geometry))}
          </span>
        ),
      }),
      ch.display({
        id: 'margin',
        header: 'Worst margin',
        cell: (c) => <MarginCell m={c.row.original.worstMargin} u={u} />,
      }),
      ch.display({ id: 'status', header: 'Status', cell: (c) => <Badges row={c.row.original} /> }),
      // Keyed by the design version: a bulk accept, an undo or someone else's save remounts the picker on the stored choice.
      ch.display({
        id: 'pick',
        header: 'Chosen thickness',
        cell: (c) => (
          <PickCell
            key={c.row.original.designVersion ?? 0}
            row={c.row.original}
            projectId={projectId}
            canPick={canPick}
            onSaved={refresh}
            u={u}
          />
        ),
      }),
    ],
    [projectId, canPick, fmt.unitSystem, fmt.thicknessSeries, fmt.currency],
  );

  const data = query.data?.rows ?? [];
  const table = useReactTable({
    data,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.id,
    manualSorting: true,
    manualPagination: true,
    state: { sorting },
    onSortingChange: (u) => {
      setSorting(u);
      setPage(0);
    },
    enableSortingRemoval: false,
  });
  const total = query.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / size));

  function solve() {
    start(async () => {
      const r = await solveLinesAction(projectId, { all: false });
      setMessage(
        r.ok
          ? {
              kind: 'ok',
              text: 'Solving the stale lines in the background; the progress is shown above the table.',
            }
          : { kind: 'error', text: r.error },
      );
      qc.invalidateQueries({ queryKey: ['jobs', projectId, 'recent'] });
    });
  }
  /** Step 1: the server counts what the button would do for exactly the filter on screen. */
  function previewAccept() {
    const filter: LineFilter = {
      q: q || undefined,
      area: area || undefined,
      status: (status || undefined) as LineStatus | undefined,
    };
    setMessage(null);
    start(async () => {
      const r = await previewBulkAcceptAction(projectId, { filter });
      if (r.ok) setBulkPreview(r.data);
      else setMessage({ kind: 'error', text: r.error });
    });
  }
  /** Step 2, after confirmation: exactly the previewed lines, or a refusal if any of them moved. */
  function applyAccept(p: BulkPreview) {
    start(async () => {
      const r = await applyBulkAcceptAction(projectId, { filter: p.filter, items: p.items });
      setBulkPreview(null);
      if (r.ok) {
        setUndoable(r.data.bulkAcceptId);
        setMessage({
          kind: 'ok',
          text: `Recommendation accepted for ${lineCount(r.data.accepted)}; ${lineCount(p.leftAloneTotal)} left alone.`,
        });
      } else setMessage({ kind: 'error', text: r.error });
      refresh();
    });
  }
  function undoAccept(bulkAcceptId: string) {
    start(async () => {
      const r = await undoBulkAcceptAction(projectId, { bulkAcceptId });
      setUndoable(null);
      if (r.ok) {
        const kept = [
          r.data.changedSince.length
            ? `${lineCount(r.data.changedSince.length)} decided again since ${r.data.changedSince.length === 1 ? 'was' : 'were'} left as ${r.data.changedSince.length === 1 ? 'it is' : 'they are'} (${r.data.changedSince.join(', ')}).`
            : '',
          r.data.removed.length
            ? `${lineCount(r.data.removed.length)} no longer in the list (${r.data.removed.join(', ')}).`
            : '',
        ]
          .filter(Boolean)
          .join(' ');
        setMessage({
          kind: 'ok',
          text: `Bulk accept undone: ${lineCount(r.data.restored)} ${r.data.restored === 1 ? 'has its' : 'have their'} previous decision back.${kept ? ` ${kept}` : ''}`,
        });
      } else setMessage({ kind: 'error', text: r.error });
      refresh();
    });
  }

  return (
    <section aria-label="Lines">
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div>
          <label className="label" htmlFor="f-q">
            Search tag or service
          </label>
          <input
            id="f-q"
            className="input"
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              setPage(0);
            }}
          />
        </div>
        <div>
          <label className="label" htmlFor="f-area">
            Area
          </label>
          <select
            id="f-area"
            className="input"
            value={area}
            onChange={(e) => {
              setArea(e.target.value);
              setPage(0);
            }}
          >
            <option value="">All areas</option>
            {areas.map((a) => (
              <option key={a}>{a}</option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="f-status">
            Status
          </label>
          <select
            id="f-status"
            className="input"
            value={status}
            onChange={(e) => {
              setStatus(e.target.value);
              setPage(0);
            }}
          >
            <option value="">Any</option>
            {LINE_STATUSES.map((s) => (
              <option key={s} value={s}>
                {LINE_STATUS_LABEL[s]}
              </option>
            ))}
          </select>
        </div>
        <DocumentLinks projectId={projectId} filter={{ q, area, status }} total={total} />
        <div className="ml-auto flex gap-2">
          {canSolve ? (
            <button type="button" className="btn-quiet" onClick={solve} disabled={pending}>
              Solve stale lines
            </button>
          ) : null}
          {canPick ? (
            <button
              type="button"
              className="btn-primary"
              onClick={previewAccept}
              disabled={pending || !total}
            >
              Accept recommendation for the filtered lines
            </button>
          ) : null}
        </div>
      </div>
      {message ? (
        <div className="mb-3 flex items-center gap-3">
          <p
            role={message.kind === 'error' ? 'alert' : 'status'}
            className={`text-sm ${message.kind === 'error' ? 'text-alarm-700' : 'text-mineral-800'}`}
          >
            {message.text}
          </p>
          {undoable && message.kind === 'ok' ? (
            <UndoButton onUndo={() => undoAccept(undoable)} disabled={pending} />
          ) : null}
        </div>
      ) : null}
      {bulkPreview ? (
        <BulkAcceptDialog
          preview={bulkPreview}
          pending={pending}
          onConfirm={() => applyAccept(bulkPreview)}
          onCancel={() => setBulkPreview(null)}
        />
      ) : null}
      {query.error ? (
        <p role="alert" className="text-sm text-alarm-700">
          {(query.error as Error).message}
        </p>
      ) : null}
      <div className="panel overflow-x-auto">
        <table className="table-dense" aria-label="Line table">
          <thead>
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <th
                    key={h.id}
                    aria-sort={
                      h.column.getIsSorted()
                        ? h.column.getIsSorted() === 'desc'
                          ? 'descending'
                          : 'ascending'
                        : undefined
                    }
                  >
                    {h.column.getCanSort() ? (
                      <button
                        type="button"
                        className="uppercase"
                        onClick={h.column.getToggleSortingHandler()}
                      >
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        {h.column.getIsSorted() === 'asc'
                          ? ' ▲'
                          : h.column.getIsSorted() === 'desc'
                            ? ' ▼'
                            : ''}
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} data-tag={r.original.tag}>
                {r.getVisibleCells().map((c) => (
                  <td key={c.id}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>
                ))}
              </tr>
            ))}
            {!query.isLoading && data.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="py-6 text-center text-ink-500">
                  No lines match. {total === 0 && !q && !area && !status ? 'Import a line list above.' : ''}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <div className="mt-2 flex items-center gap-3 text-sm text-ink-600">
        <span>
          {total} lines{query.isFetching ? ' · loading…' : ''}
        </span>
        <button
          type="button"
          className="btn-quiet py-0.5"
          disabled={page === 0}
          onClick={() => setPage((p) => p - 1)}
        >
          Previous
        </button>
        <span>
          Page {page + 1} of {pages}
        </span>
        <button
          type="button"
          className="btn-quiet py-0.5"
          disabled={page + 1 >= pages}
          onClick={() => setPage((p) => p + 1)}
        >
          Next
        </button>
      </div>
    </section>
  );
}

const lineCount = (n: number) => `${n} line${n === 1 ? '' : 's'}`;

/** Focused when it appears, so the keyboard user lands next to what just happened. */
function UndoButton({ onUndo, disabled }: { onUndo: () => void; disabled: boolean }) {
  const ref = useRef<HTMLButtonElement>(null);
  const focused = useRef(false);
  // It appears while the accept is still finishing (disabled): focus it once it can take focus.
  useEffect(() => {
    if (!disabled && !focused.current) {
      ref.current?.focus();
      focused.current = true;
    }
  }, [disabled]);
  return (
    <button type="button" ref={ref} className="btn-quiet py-0.5" onClick={onUndo} disabled={disabled}>
      Undo
    </button>
  );
}

/** Downloads of exactly what the filter shows: results (.xlsx, .csv), everything, and the calculation sheets. */
function DocumentLinks({
  projectId,
  filter,
  total,
}: {
  projectId: string;
  filter: { q: string; area: string; status: string };
  total: number;
}) {
  const qc = useQueryClient();
  const [busy, setBusy] = useState(false);
  const [note, setNote] = useState<string | null>(null);
  const f = new URLSearchParams(Object.entries(filter).filter(([, v]) => v));
  const base = `/api/v1/projects/${projectId}`;
  const withF = (path: string, extra: Record<string, string> = {}) =>
    `${base}/${path}?${new URLSearchParams([...f.entries(), ...Object.entries(extra)]).toString()}`;
  return (
    <section className="text-xs" aria-label="Downloads">
      <span className="label">Download</span>
      <span className="flex flex-wrap gap-x-3">
        <a href={withF('export', { format: 'xlsx' })} download>
          Results of the filtered lines (.xlsx)
        </a>
        <a href={withF('export', { format: 'csv' })} download>
          (.csv)
        </a>
        <a href={`${base}/export?scope=all&format=xlsx`} download>
          All lines (.xlsx)
        </a>
        {total > 0 && total <= SHEETS_INLINE_LIMIT ? (
          <a href={withF('sheets')} download>
            Calculation sheets of the {total} filtered lines (PDF)
          </a>
        ) : null}
        {total > SHEETS_INLINE_LIMIT ? (
          <button
            type="button"
            className="underline"
            disabled={busy}
            onClick={() => {
              setBusy(true);
              setNote(null);
              startSheetsBatchAction(projectId, { filter }).then((r) => {
                setBusy(false);
                setNote(
                  r.ok ? 'The sheets are being produced; the download appears under Recent jobs.' : r.error,
                );
                qc.invalidateQueries({ queryKey: ['jobs', projectId] });
              });
            }}
          >
            Produce the calculation sheets of the {total} filtered lines (PDF, in the background)
          </button>
        ) : null}
      </span>
      {note ? (
        <span role="status" className="block text-ink-600">
          {note}
        </span>
      ) : null}
    </section>
  );
}

/** The confirmation: how many lines change and how many are left alone (and why), for the filter shown. */
function BulkAcceptDialog({
  preview: p,
  pending,
  onConfirm,
  onCancel,
}: {
  preview: BulkPreview;
  pending: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (d && !d.open) d.showModal();
    return () => d?.close();
  }, []);
  const f = p.filter;
  const shown = [
    f.q ? `search "${f.q}"` : '',
    f.area ? `area ${f.area}` : '',
    f.status ? `status ${LINE_STATUS_LABEL[f.status]}` : '',
  ].filter(Boolean);
  const la = p.leftAlone;
  const alone = [
    la.manual ? `${la.manual} manual pick${la.manual === 1 ? '' : 's'}` : '',
    la.redecide ? `${lineCount(la.redecide)} needing re-decision` : '',
    la.stale ? `${lineCount(la.stale)} stale or not solved (solve first)` : '',
    la.alreadyAccepted ? `${lineCount(la.alreadyAccepted)} already at the current recommendation` : '',
    la.noRecommendation ? `${lineCount(la.noRecommendation)} without a recommendation` : '',
  ].filter(Boolean);
  return (
    <dialog
      ref={ref}
      aria-labelledby="bulk-accept-title"
      aria-describedby="bulk-accept-counts"
      onCancel={(e) => {
        e.preventDefault();
        if (!pending) onCancel();
      }}
      className="w-[32rem] max-w-[95vw] rounded-md border border-ink-300 bg-white p-5 text-ink-900 shadow-xl backdrop:bg-ink-900/40"
    >
      <h2 id="bulk-accept-title" className="mb-2 text-lg font-semibold">
        Accept the recommendation for the filtered lines?
      </h2>
      <p className="mb-2 text-sm text-ink-700">
        Lines shown: {shown.length ? shown.join(', ') : 'all lines'}.
      </p>
      <p id="bulk-accept-counts" className="mb-2 text-sm">
        {p.change ? (
          <>
            This changes <strong>{lineCount(p.change)}</strong> and leaves{' '}
            <strong>{lineCount(p.leftAloneTotal)}</strong> alone.
          </>
        ) : !p.leftAloneTotal ? (
          'No line matches this filter.'
        ) : p.leftAloneTotal === 1 ? (
          'Nothing would change: the 1 line shown is left alone.'
        ) : (
          <>
            Nothing would change: all <strong>{lineCount(p.leftAloneTotal)}</strong> shown are left alone.
          </>
        )}
      </p>
      {p.change ? (
        <>
          <h3 id="bulk-accept-change" className="text-xs font-semibold text-ink-700">
            Lines that change
          </h3>
          <ul className="mb-2 list-disc pl-5 text-sm" aria-labelledby="bulk-accept-change">
            {p.newDecisions ? (
              <li>{lineCount(p.newDecisions)} without a decision get the recommendation</li>
            ) : null}
            {p.updated ? (
              <li>{lineCount(p.updated)} with an earlier accepted recommendation get the current one</li>
            ) : null}
          </ul>
        </>
      ) : null}
      {alone.length ? (
        <>
          <h3 id="bulk-accept-alone" className="text-xs font-semibold text-ink-700">
            Lines left alone
          </h3>
          <ul className="mb-2 list-disc pl-5 text-sm" aria-labelledby="bulk-accept-alone">
            {alone.map((text) => (
              <li key={text}>{text}</li>
            ))}
          </ul>
        </>
      ) : null}
      <p className="mb-4 text-xs text-ink-600">
        Manual picks and lines needing re-decision are never changed. You can undo the accept right after.
      </p>
      <div className="flex justify-end gap-2">
        <button type="button" className="btn-quiet" onClick={onCancel} disabled={pending}>
          {p.change ? 'Cancel' : 'Close'}
        </button>
        {p.change ? (
          // biome-ignore lint/a11y/noAutofocus: the confirmation opens on the user's own press; focus goes to its action
          <button type="button" className="btn-primary" onClick={onConfirm} disabled={pending} autoFocus>
            Accept for {lineCount(p.change)}
          </button>
        ) : null}
      </div>
    </dialog>
  );
}

function Badges({ row }: { row: Row }) {
  return (
    <span className="flex flex-wrap gap-1">
      {row.stale ? <span className="badge bg-ochre-100 text-ochre-900">stale</span> : null}
      {row.unmet?.length ? (
        <span className="badge bg-alarm-100 text-alarm-700" title={row.unmet.join(', ')}>
          unmet: {row.unmet.map((u) => GOV[u] ?? u).join(', ')}
        </span>
      ) : null}
      {row.belowCriterion ? (
        <span className="badge bg-alarm-100 text-alarm-700">below {row.belowCriterion}</span>
      ) : null}
      {row.source === 'manual' ? <span className="badge bg-ink-100 text-ink-700">manual</span> : null}
      {row.needsRedecision ? <span className="badge bg-ochre-100 text-ochre-900">re-decide</span> : null}
      {row.chosenMm === null && !row.stale ? (
        <span className="badge bg-ink-50 text-ink-500">undecided</span>
      ) : null}
    </span>
  );
}

/** The smallest margin to a temperature limit at the chosen thickness (the recommendation while undecided). */
function MarginCell({ m, u }: { m: Margin | null; u: Formatter }) {
  if (!m) return <span className="text-ink-400">—</span>;
  return (
    <span
      className={`num block whitespace-nowrap ${m.marginK < 0 ? 'font-semibold text-alarm-700' : ''}`}
      title={
        m.criterion === 'personnel'
          ? 'Touch limit minus the personnel surface temperature'
          : 'Condensation surface temperature minus dew point + margin'
      }
    >
      {u.tempDelta(m.marginK)} {m.criterion}
    </span>
  );
}

/** A candidate's deciding numbers in one line: heat-loss surface and loss, then each applicable criterion with its limit. */
function candidateText(c: Candidate, row: Row, u: Formatter): string {
  const parts = [
    `heat loss ${u.temp(c.surfaceC)}, ${u.heatFlowPerUnit(c.heatFlow, isSurfaceGeometry(row.geometry))}`,
  ];
  if (row.personnelLimitC !== null)
    parts.push(`personnel ${u.temp(c.personnelC)} (limit ${u.temp(row.personnelLimitC)})`);
  if (row.condensationNeedC !== null)
    parts.push(`condensation ${u.temp(c.condensationC)} (min ${u.temp(row.condensationNeedC)})`);
  return parts.join(' · ');
}

function PickCell({
  row,
  projectId,
  canPick,
  onSaved,
  u,
}: {
  row: Row;
  projectId: string;
  canPick: boolean;
  onSaved: () => void;
  u: Formatter;
}) {
  const [value, setValue] = useState<string>(row.chosenMm !== null ? String(row.chosenMm) : '');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  // The thickness options arrive when the picker is opened (focus, pointer or key), not with the table.
  const [opened, setOpened] = useState(false);
  const options = useQuery({
    queryKey: ['lines', projectId, 'candidates', row.id],
    queryFn: async (): Promise<Candidate[]> => {
      const r = await fetch(`/api/v1/projects/${projectId}/lines/${row.id}/candidates`);
      if (!r.ok)
        throw new Error((await r.json()).error?.message ?? 'The thickness options could not be loaded.');
      return (await r.json()).candidates;
    },
    enabled: opened && canPick && row.solved,
    staleTime: 60_000,
  });
  if (!canPick) return <span className="num block">{u.thickness(row.chosenMm)}</span>;
  if (!row.solved) return <span className="text-xs text-ink-500">solve first</span>;
  const picked = value === '' ? null : Number(value);
  const needsReason = picked !== null && picked !== row.recommendedMm;
  const dirty = picked !== null && picked !== row.chosenMm;
  const shownMm = picked ?? row.recommendedMm;
  const shownCand =
    options.data?.find((c) => c.mm === shownMm) ??
    (row.shown && shownMm !== null && shownMm === (row.chosenMm ?? row.recommendedMm)
      ? { ...row.shown, mm: shownMm }
      : undefined);
  function save() {
    setError(null);
    start(async () => {
      const r = await pickThicknessAction(projectId, {
        lineId: row.id,
        thicknessMm: picked!,
        reason: reason || undefined,
        expectedVersion: row.designVersion ?? 0,
      });
      if (!r.ok) {
        setError(r.error);
        return;
      }
      setReason('');
      onSaved();
    });
  }
  return (
    <div className="min-w-[15rem] space-y-1">
      <div className="flex gap-1">
        <select
          aria-label={`Thickness for ${row.tag}`}
          className="input py-0.5 text-xs"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          onFocus={() => setOpened(true)}
          onPointerDown={() => setOpened(true)}
          onKeyDown={() => setOpened(true)}
          aria-busy={options.isFetching}
        >
          <option value="">—</option>
          {!options.data
            ? [row.chosenMm, row.recommendedMm]
                .filter((mm, i, a): mm is number => mm !== null && a.indexOf(mm) === i)
                .map((mm) => (
                  <option key={mm} value={mm}>
                    {u.thickness(mm)}
                    {mm === row.recommendedMm ? ' ★' : ''}
                  </option>
                ))
            : null}
          {(options.data ?? []).map((c) => (
            <option key={c.mm} value={c.mm} disabled={!c.ok}>
              {u.thickness(c.mm)}
              {c.mm === row.recommendedMm ? ' ★' : ''} · {candidateText(c, row, u)}
              {!c.ok ? ' · layer over its service limit' : ''}
            </option>
          ))}
        </select>
        {dirty ? (
          <button
            type="button"
            className="btn-primary px-2 py-0.5 text-xs"
            onClick={save}
            disabled={pending || (needsReason && !reason.trim())}
          >
            Save
          </button>
        ) : null}
      </div>
      {shownCand ? (
        <p className="text-xs text-ink-600" data-testid={`deciding-${row.tag}`}>
          {u.thickness(shownCand.mm)}: {candidateText(shownCand, row, u)}
        </p>
      ) : null}
      {dirty && needsReason ? (
        <input
          aria-label={`Reason for ${row.tag}`}
          className="input py-0.5 text-xs"
          placeholder="Reason for this pick (required)"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
        />
      ) : null}
      {error ? (
        <p role="alert" className="text-xs text-alarm-700">
          {error}
        </p>
      ) : null}
      {options.error ? (
        <p role="alert" className="text-xs text-alarm-700">
          {(options.error as Error).message}
        </p>
      ) : null}
    </div>
  );
}
