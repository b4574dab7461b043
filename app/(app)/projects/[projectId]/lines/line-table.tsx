'use client';
import Link from 'next/link';
import { useCallback, useEffect, useMemo, useRef, useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { keepPreviousData, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import {
  applyBulkAcceptAction,
  pickThicknessAction,
  previewBulkAcceptAction,
  saveLineTableViewAction,
  solveLinesAction,
  startSheetsBatchAction,
  undoBulkAcceptAction,
} from './actions';
import { LINE_STATUSES, LINE_STATUS_LABEL, type LineFilter, type LineStatus } from '@/lib/lines/filter';
import type { BulkPreview } from '@/lib/lines/bulk-accept';
import { SHEETS_INLINE_LIMIT } from '@/lib/documents/limits';
import { formatter, type Formatter, type FormatOptions, type UnitSystem } from '@/lib/format';
import { isSurfaceGeometry } from '@/lib/lines/fields';
import { criterionLabel } from '@/lib/lines/criterion-labels';
import { type Margin, worstMargin } from '@/lib/lines/margin';
import {
  DEFAULT_LINE_TABLE_VIEW,
  HIDEABLE_COLUMNS,
  type Density,
  type LineTableColumnId,
  type LineTableView,
} from '@/lib/preferences/line-table-view';

interface Candidate {
  mm: number;
  heatFlow: number;
  surfaceC: number;
  personnelC: number | null;
  condensationC: number | null;
  ok: boolean;
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
  /** A vessel picked part by part, in words (its picker is on the line page). */
  chosenParts?: string | null;
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
}
export interface LineTablePage {
  rows: Row[];
  total: number;
  page: number;
  size: number;
}

type Page = LineTablePage;
const ch = createColumnHelper<Row>();
/** The first page as the server renders it: what the table asks for before anyone filters, sorts or pages. */
const FIRST_PAGE_KEY = 'page=0&size=100&sort=tag&dir=asc';

export function LineTable({
  projectId,
  areas,
  canPick,
  canSolve,
  unitSystem = 'SI',
  format,
  firstPage,
  firstPageAt,
  initialView = DEFAULT_LINE_TABLE_VIEW,
}: {
  projectId: string;
  areas: string[];
  canPick: boolean;
  canSolve: boolean;
  unitSystem?: UnitSystem;
  format?: FormatOptions;
  /** The first 100 rows in tag order, rendered on the server so the table is there before any script runs. */
  firstPage?: Page;
  /** When the server read `firstPage` (ms since the epoch): it counts as fresh as of then. */
  firstPageAt?: number;
  /** The signed-in person's hidden columns and density (kept on the server, per user). */
  initialView?: LineTableView;
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
    ...(firstPage && params.toString() === FIRST_PAGE_KEY
      ? { initialData: firstPage, initialDataUpdatedAt: firstPageAt }
      : {}),
  });
  const refresh = () => qc.invalidateQueries({ queryKey: ['lines', projectId] });
  const router = useRouter();
  const boxRef = useRef<HTMLDivElement>(null);
  const messageRef = useRef<HTMLParagraphElement>(null);
  // The grid's one Tab stop (row, column among the visible cells): arrow keys move it.
  const active = useRef({ r: 0, c: 0 });
  const [announce, setAnnounce] = useState('');
  const pagedBy = useRef<'next' | 'previous' | null>(null);
  // Hidden columns and density, as the person left them (in any browser): saved on every change.
  const [view, setView] = useState<LineTableView>(initialView);
  const density = view.density;
  const columnVisibility: VisibilityState = Object.fromEntries(view.hiddenColumns.map((id) => [id, false]));
  const savedView = useRef(initialView);
  function changeView(next: LineTableView) {
    setView(next);
    saveLineTableViewAction(next).then((r) => {
      if (r.ok) savedView.current = r.data;
      else {
        setView(savedView.current);
        setMessage({ kind: 'error', text: r.error });
      }
    });
  }

  /** The body's cells row by row, only those shown at this width. */
  const gridCells = useCallback((): HTMLTableCellElement[][] => {
    const rows = boxRef.current?.querySelectorAll('tbody tr[data-tag]') ?? [];
    return [...rows].map((tr) =>
      [...tr.querySelectorAll<HTMLTableCellElement>(':scope > td')].filter(
        (td) => td.getClientRects().length > 0,
      ),
    );
  }, []);
  /** Roving tab stop: every control in the body leaves the Tab order except the active cell's. */
  const syncTabStops = useCallback(() => {
    const box = boxRef.current;
    if (!box) return;
    for (const el of box.querySelectorAll<HTMLElement>(
      'tbody td, tbody a, tbody select, tbody input, tbody button',
    ))
      el.tabIndex = -1;
    const grid = gridCells();
    if (!grid.length) return;
    const r = Math.min(active.current.r, grid.length - 1);
    const c = Math.min(active.current.c, grid[r].length - 1);
    active.current = { r, c };
    const td = grid[r][c];
    cellTarget(td).tabIndex = 0;
    for (const el of td.querySelectorAll<HTMLElement>('select, input, button')) el.tabIndex = 0;
  }, [gridCells]);
  useEffect(() => {
    syncTabStops();
  });

  function onGridKey(e: React.KeyboardEvent) {
    const t = e.target as HTMLElement;
    const td = t.closest('td');
    if (!td?.closest('tbody')) return;
    const onCell = t === cellTarget(td);
    if (!onCell) {
      // Inside the picker: Escape hands the arrow keys back to the grid.
      if (e.key === 'Escape') {
        e.preventDefault();
        cellTarget(td).focus();
      }
      return;
    }
    const grid = gridCells();
    const r = grid.findIndex((row) => row.includes(td as HTMLTableCellElement));
    if (r < 0) return;
    const c = grid[r].indexOf(td as HTMLTableCellElement);
    let [nr, nc] = [r, c];
    switch (e.key) {
      case 'ArrowDown':
        nr = r + 1;
        break;
      case 'ArrowUp':
        nr = r - 1;
        break;
      case 'ArrowRight':
        nc = c + 1;
        break;
      case 'ArrowLeft':
        nc = c - 1;
        break;
      case 'PageDown':
        nr = r + 10;
        break;
      case 'PageUp':
        nr = r - 10;
        break;
      case 'Home':
        nc = 0;
        if (e.ctrlKey) nr = 0;
        break;
      case 'End':
        nc = grid[r].length - 1;
        if (e.ctrlKey) nr = grid.length - 1;
        break;
      case 'Enter':
      case 'F2': {
        // Enter on the tag follows its link (the browser's own); on the picker it enters the picker;
        // anywhere else it opens the line.
        const control = td.querySelector<HTMLElement>('select, input, button');
        if (control) {
          e.preventDefault();
          control.focus();
        } else if (t.tagName !== 'A') {
          const href = td.closest('tr')?.querySelector('a')?.getAttribute('href');
          if (href) {
            e.preventDefault();
            router.push(href);
          }
        }
        return;
      }
      default:
        return;
    }
    e.preventDefault();
    nr = Math.max(0, Math.min(grid.length - 1, nr));
    nc = Math.max(0, Math.min(grid[nr].length - 1, nc));
    active.current = { r: nr, c: nc };
    syncTabStops();
    const target = cellTarget(grid[nr][nc]);
    target.focus();
    target.scrollIntoView({ block: 'nearest', inline: 'nearest' });
  }
  function onGridFocus(e: React.FocusEvent) {
    const td = (e.target as HTMLElement).closest('td');
    if (!td?.closest('tbody')) return;
    const grid = gridCells();
    const r = grid.findIndex((row) => row.includes(td as HTMLTableCellElement));
    if (r < 0) return;
    const c = grid[r].indexOf(td as HTMLTableCellElement);
    if (r !== active.current.r || c !== active.current.c) {
      active.current = { r, c };
      syncTabStops();
    }
  }

  /** After a pick: the picker of that row has the focus again (it remounts on the new version), and the result is announced. */
  async function afterPick(row: Row, mm: number) {
    await refresh();
    setAnnounce(`${row.tag}: ${u.thickness(mm)} saved.`);
    requestAnimationFrame(() => {
      const td = boxRef.current?.querySelector<HTMLElement>(
        `tr[data-row-id="${row.id}"] td[data-col="pick"]`,
      );
      if (td && (document.activeElement === document.body || !document.activeElement?.isConnected))
        td.focus();
    });
  }
  function goToPage(p: number, how: 'next' | 'previous') {
    pagedBy.current = how;
    setPage(p);
  }

  // biome-ignore lint/correctness/useExhaustiveDependencies: the columns change with the project, the role and the display units only; the row callbacks read current state through the query
  const columns = useMemo(
    () => [
      ch.accessor('tag', {
        header: 'Tag',
        enableHiding: false,
        cell: (c) => (
          <Link href={`/projects/${projectId}/lines/${c.row.original.id}`} className="font-mono">
            {c.getValue()}
          </Link>
        ),
      }),
      ch.accessor('service', {
        header: 'Service',
        enableSorting: false,
        cell: (c) => <Truncated text={c.getValue()} width="max-w-[11rem]" />,
      }),
      ch.accessor('area', {
        header: 'Area',
        cell: (c) => <Truncated text={c.getValue()} width="max-w-[9rem]" />,
      }),
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
        cell: (c) => u.tempValue(c.getValue()),
      }),
      ch.accessor('recommendedMm', {
        header: 'Recommended',
        cell: (c) => u.thickness(c.getValue()),
      }),
      ch.accessor('governing', {
        header: 'Governs',
        cell: (c) => (c.getValue() ? criterionLabel(c.getValue()!, true) : '—'),
      }),
      ch.accessor('surfaceTempC', {
        header: `Surface ${u.units.temp}`,
        cell: (c) => u.tempValue(c.getValue()),
      }),
      // One unit per column: pipes lose heat per length, vessels and flat surfaces per area.
      ch.accessor('heatFlowPerUnit', {
        id: 'heatLossLinear',
        header: `Heat loss ${u.units.linearLoss}`,
        enableSorting: false,
        cell: (c) => (isSurfaceGeometry(c.row.original.geometry) ? '' : u.linearLossValue(c.getValue())),
      }),
      ch.accessor('heatFlowPerUnit', {
        id: 'heatLossAreal',
        header: `Heat loss ${u.units.arealLoss}`,
        enableSorting: false,
        cell: (c) => (isSurfaceGeometry(c.row.original.geometry) ? u.arealLossValue(c.getValue()) : ''),
      }),
      ch.display({
        id: 'margin',
        header: 'Worst margin',
        cell: (c) => <MarginCell m={marginOf(c.row.original)} u={u} />,
      }),
      ch.display({
        id: 'status',
        header: 'Status',
        enableHiding: false,
        cell: (c) => <Badges row={c.row.original} />,
      }),
      // Keyed by the design version: a bulk accept, an undo or someone else's save remounts the picker on the stored choice.
      ch.display({
        id: 'pick',
        header: 'Chosen thickness',
        enableHiding: false,
        cell: (c) => (
          <PickCell
            key={c.row.original.designVersion ?? 0}
            row={c.row.original}
            projectId={projectId}
            canPick={canPick}
            onSaved={afterPick}
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
    state: { sorting, columnVisibility },
    onColumnVisibilityChange: (update) => {
      const next = typeof update === 'function' ? update(columnVisibility) : update;
      changeView({
        ...view,
        hiddenColumns: HIDEABLE_COLUMNS.map((c) => c.id).filter((id) => next[id] === false),
      });
    },
    onSortingChange: (u) => {
      setSorting(u);
      setPage(0);
    },
    enableSortingRemoval: false,
  });
  const total = query.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / size));
  const shownPage = query.data?.page ?? page;
  const firstShown = total ? shownPage * size + 1 : 0;
  const lastShown = Math.min(total, (shownPage + 1) * size);
  // A new page is at the top of the table box, with the table's top in view, and is announced; the
  // focus stays on the pager button (or moves to the other one when it became disabled).
  useEffect(() => {
    if (!pagedBy.current || query.isPlaceholderData || !query.data) return;
    const how = pagedBy.current;
    pagedBy.current = null;
    const box = boxRef.current;
    if (box) {
      box.scrollTop = 0;
      if (box.getBoundingClientRect().top < 0) box.scrollIntoView({ block: 'start' });
    }
    active.current = { r: 0, c: 0 };
    syncTabStops();
    setAnnounce(
      `Page ${query.data.page + 1} of ${Math.max(1, Math.ceil(query.data.total / size))}: lines ${firstShown} to ${lastShown} of ${query.data.total}.`,
    );
    const stay = document.getElementById(
      how === 'next' ? 'lines-next' : 'lines-previous',
    ) as HTMLButtonElement | null;
    const other = document.getElementById(
      how === 'next' ? 'lines-previous' : 'lines-next',
    ) as HTMLButtonElement | null;
    if (stay?.disabled && other && !other.disabled) other.focus();
  }, [query.data, query.isPlaceholderData, syncTabStops, firstShown, lastShown]);

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
      // The Undo button is gone: the focus goes to the sentence saying what happened.
      requestAnimationFrame(() => messageRef.current?.focus());
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
            ref={messageRef}
            tabIndex={-1}
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
      <p id="line-grid-help" className="sr-only">
        One Tab stop for the table: arrow keys move between cells, Enter opens a line or enters the picker,
        Escape leaves the picker.
      </p>
      {/* The table scrolls inside its own box (both ways) under a sticky header, so the page itself
          never scrolls sideways and the pager stays close. */}
      {/* biome-ignore lint/a11y/noStaticElementInteractions: key and focus events bubble up from the focusable cells and controls inside; the box itself is no control */}
      <div
        ref={boxRef}
        id="line-table"
        className="panel max-h-[calc(100vh-7rem)] overflow-auto"
        onKeyDown={onGridKey}
        onFocus={onGridFocus}
      >
        <table
          className={`table-dense line-grid ${density === 'compact' ? 'line-grid-compact' : ''}`}
          aria-label="Line table"
          aria-describedby="line-grid-help"
          aria-rowcount={total + 1}
        >
          <thead>
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <th
                    key={h.id}
                    scope="col"
                    data-col={h.column.id}
                    className={colClass(h.column.id)}
                    aria-sort={
                      h.column.getIsSorted()
                        ? h.column.getIsSorted() === 'desc'
                          ? 'descending'
                          : 'ascending'
                        : undefined
                    }
                  >
                    {h.column.getCanSort() ? (
                      <button type="button" onClick={h.column.getToggleSortingHandler()}>
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true">
                          {h.column.getIsSorted() === 'asc'
                            ? ' ▲'
                            : h.column.getIsSorted() === 'desc'
                              ? ' ▼'
                              : ''}
                        </span>
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
            {table.getRowModel().rows.map((r, i) => (
              <tr
                key={r.id}
                data-tag={r.original.tag}
                data-row-id={r.original.id}
                aria-rowindex={firstShown + i + 1}
              >
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} data-col={c.column.id} className={colClass(c.column.id)}>
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {!query.isLoading && data.length === 0 ? (
              <tr>
                <td colSpan={table.getVisibleLeafColumns().length} className="py-6 text-center text-ink-600">
                  No lines match. {total === 0 && !q && !area && !status ? 'Import a line list above.' : ''}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <nav
        aria-label="Line table pages"
        className="mt-2 flex flex-wrap items-center gap-3 text-sm text-ink-700"
      >
        <span>
          {total} lines{query.isFetching ? ' · loading…' : ''}
        </span>
        {total ? (
          <span>
            showing {firstShown}–{lastShown}
          </span>
        ) : null}
        <button
          type="button"
          id="lines-previous"
          className="btn-quiet py-0.5"
          disabled={page === 0}
          onClick={() => goToPage(page - 1, 'previous')}
        >
          Previous
        </button>
        <span>
          Page {page + 1} of {pages}
        </span>
        <button
          type="button"
          id="lines-next"
          className="btn-quiet py-0.5"
          disabled={page + 1 >= pages}
          onClick={() => goToPage(page + 1, 'next')}
        >
          Next
        </button>
        <ColumnMenu
          hidden={view.hiddenColumns}
          onToggle={(id, shown) => table.getColumn(id)?.toggleVisibility(shown)}
        />
        <label className="flex items-center gap-2">
          <span>Row density</span>
          <select
            className="input w-auto py-0.5 text-sm"
            value={density}
            onChange={(e) =>
              changeView({
                ...view,
                density: (e.target.value === 'comfortable' ? 'comfortable' : 'compact') as Density,
              })
            }
          >
            <option value="compact">Compact</option>
            <option value="comfortable">Comfortable</option>
          </select>
        </label>
      </nav>
      {/* Downloads of the filter below the table, so filters and actions share one row above it (more rows
          in view at 1440×900) and the way from the search field to "Next" stays short. */}
      <div className="mt-2">
        <DocumentLinks projectId={projectId} filter={{ q, area, status }} total={total} />
      </div>
      {/* Paging and saved picks, for screen readers: polite, and not a role=status of its own. */}
      <p aria-live="polite" className="sr-only" data-testid="line-table-announce">
        {announce}
      </p>
    </section>
  );
}

/** Which columns show: a checkbox per column that may be hidden; tag, status and chosen thickness always show. */
function ColumnMenu({
  hidden,
  onToggle,
}: {
  hidden: LineTableColumnId[];
  onToggle: (id: LineTableColumnId, shown: boolean) => void;
}) {
  return (
    <details className="relative ml-auto">
      <summary className="btn-quiet cursor-pointer py-0.5">
        Columns{hidden.length ? ` (${hidden.length} hidden)` : ''}
      </summary>
      <fieldset className="absolute bottom-full right-0 z-30 mb-1 w-64 max-w-[90vw] rounded-md border border-ink-300 bg-white p-3 shadow-lg">
        <legend className="sr-only">Columns shown in the line table</legend>
        <p className="mb-2 text-xs text-ink-600">
          Kept for you in every browser. Tag, status and chosen thickness always show; below 1024 px wide
          service, area, governing criterion, surface temperature, heat loss per area and worst margin are
          left out.
        </p>
        {HIDEABLE_COLUMNS.map((c) => (
          <label key={c.id} className="flex items-center gap-2 py-0.5">
            <input
              type="checkbox"
              checked={!hidden.includes(c.id)}
              onChange={(e) => onToggle(c.id, e.target.checked)}
            />
            {c.label}
          </label>
        ))}
      </fieldset>
    </details>
  );
}

/** Where the keyboard lands in a cell: its link when it has one, otherwise the cell itself. */
function cellTarget(td: HTMLElement): HTMLElement {
  return td.querySelector<HTMLElement>(':scope > a') ?? td;
}

/** Numbers right-aligned under right-aligned headers; the tag stays in view when the table scrolls sideways; the
 * columns a 768 px tablet can spare are left out below 1024 px so tag, status and picker fit (a vessel's
 * loss per area is on its own page there). */
const NUMERIC_COLS = new Set([
  'normalTempC',
  'recommendedMm',
  'surfaceTempC',
  'heatLossLinear',
  'heatLossAreal',
  'margin',
]);
const NARROW_HIDDEN = new Set(['service', 'area', 'governing', 'surfaceTempC', 'heatLossAreal', 'margin']);
function colClass(id: string): string {
  return [
    NUMERIC_COLS.has(id) ? 'num' : '',
    NARROW_HIDDEN.has(id) ? 'max-lg:hidden' : '',
    id === 'tag' ? 'line-grid-tag' : '',
  ]
    .filter(Boolean)
    .join(' ');
}

/** One line of text, cut with an ellipsis; the full value on hover and for screen readers. */
function Truncated({ text, width }: { text: string; width: string }) {
  return (
    <span className={`block truncate ${width}`} title={text}>
      {text}
    </span>
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
            Produce the calculation sheets of the {total} filtered lines (zip of PDFs, in the background)
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
    <span className="flex gap-1 whitespace-nowrap">
      {row.stale ? <span className="badge bg-ochre-100 text-ochre-900">stale</span> : null}
      {row.unmet?.length ? (
        <span className="badge bg-alarm-100 text-alarm-700" title={row.unmet.join(', ')}>
          unmet: {row.unmet.map((u) => criterionLabel(u, true)).join(', ')}
        </span>
      ) : null}
      {row.belowCriterion ? (
        <span className="badge bg-alarm-100 text-alarm-700">below {row.belowCriterion}</span>
      ) : null}
      {row.source === 'manual' ? <span className="badge bg-ink-100 text-ink-700">manual</span> : null}
      {row.needsRedecision ? <span className="badge bg-ochre-100 text-ochre-900">re-decide</span> : null}
      {row.chosenMm === null && !row.stale ? (
        <span className="badge bg-ink-100 text-ink-800">undecided</span>
      ) : null}
    </span>
  );
}

/** The smallest margin to a temperature limit at the chosen thickness (the recommendation while undecided). */
/** The worst margin at the shown candidate (derived here: the route does not send it). */
const marginOf = (row: Row): Margin | null => (row.shown ? worstMargin(row.shown, row) : null);

function MarginCell({ m, u }: { m: Margin | null; u: Formatter }) {
  if (!m) return <span className="text-ink-600">—</span>;
  return (
    <span
      className={`whitespace-nowrap ${m.marginK < 0 ? 'font-semibold text-alarm-700' : ''}`}
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
    `heat loss ${u.heatFlowPerUnit(c.heatFlow, isSurfaceGeometry(row.geometry))} (surface ${u.temp(c.surfaceC)})`,
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
  onSaved: (row: Row, mm: number) => void;
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
  if (row.chosenParts)
    return (
      <span className="whitespace-nowrap text-xs" data-testid="chosen-parts">
        {row.chosenParts}
        {canPick ? (
          <>
            {' '}
            (<a href={`/projects/${projectId}/lines/${row.id}#parts-h`}>change per part</a>)
          </>
        ) : null}
      </span>
    );
  if (!canPick) return <span className="whitespace-nowrap">{u.thickness(row.chosenMm)}</span>;
  if (!row.solved) return <span className="text-xs text-ink-600">solve first</span>;
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
    // Save stays in the Tab order after the reason (a disabled button would be skipped): it says what is missing.
    if (needsReason && !reason.trim()) {
      setError('Give a reason for a thickness other than the recommendation.');
      return;
    }
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
      onSaved(row, picked!);
    });
  }
  const decidingId = `deciding-${row.id}`;
  // One line: picker, then (when the pick needs one) the reason, then Save, then the deciding numbers of the
  // thickness shown, cut to fit with the whole text on hover and read with the picker.
  return (
    <div className="flex items-center gap-1 whitespace-nowrap">
      <select
        aria-label={`Thickness for ${row.tag}`}
        aria-describedby={shownCand ? decidingId : undefined}
        className="input w-28 shrink-0 py-0.5 text-xs"
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
                  {mm === row.recommendedMm ? ' ★ recommended' : ''}
                </option>
              ))
          : null}
        {(options.data ?? []).map((c) => (
          <option key={c.mm} value={c.mm} disabled={!c.ok}>
            {u.thickness(c.mm)}
            {c.mm === row.recommendedMm ? ' ★ recommended' : ''} · {candidateText(c, row, u)}
            {!c.ok ? ' · layer over its service limit' : ''}
          </option>
        ))}
      </select>
      {dirty && needsReason ? (
        <input
          aria-label={`Reason for ${row.tag}`}
          aria-required="true"
          className="input w-48 shrink-0 py-0.5 text-xs"
          placeholder="Reason for this pick (required)"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              e.preventDefault();
              save();
            }
          }}
        />
      ) : null}
      {dirty ? (
        <button
          type="button"
          className="btn-primary shrink-0 px-2 py-0.5 text-xs"
          onClick={save}
          disabled={pending}
          aria-disabled={needsReason && !reason.trim() ? true : undefined}
        >
          Save
        </button>
      ) : null}
      {shownCand ? (
        <span
          id={decidingId}
          className="block min-w-0 max-w-[26rem] truncate text-xs text-ink-700"
          title={`${u.thickness(shownCand.mm)}: ${candidateText(shownCand, row, u)}`}
          data-testid={`deciding-${row.tag}`}
        >
          {u.thickness(shownCand.mm)}: {candidateText(shownCand, row, u)}
        </span>
      ) : null}
      {error ? (
        <p role="alert" className="whitespace-normal text-xs text-alarm-700">
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
