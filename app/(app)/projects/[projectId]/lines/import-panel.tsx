'use client';
import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { useQueryClient } from '@tanstack/react-query';
import {
  FIELD_BY_KEY,
  FIELDS,
  UNIT_CHOICES,
  VALUE_CHOICES,
  valueKey,
  type LineFieldKey,
  type ValueField,
} from '@/lib/lines/fields';
import { suggestMapping, type ColumnMapping } from '@/lib/lines/mapping';
import { headerView, rowPreview } from '@/lib/lines/header';
import type { DraftSummary, Preview } from '@/lib/lines/import-store';
import type { UnknownValue } from '@/lib/lines/validate';
import { commitImportAction, previewImportAction, uploadLineListAction } from './actions';
import { JobProgressBar, useJobOutcome } from './job-progress';

const MAX_BYTES = 20 * 1024 * 1024;
const letter = (i: number) => {
  let s = '',
    n = i + 1;
  while (n > 0) {
    const m = (n - 1) % 26;
    s = String.fromCharCode(65 + m) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
};

type Sheet = DraftSummary['sheets'][number];

/** Headers and line count of a sheet seen from a header row, worked out in the browser from its top rows. */
function viewOf(s: Sheet, headerRow: number) {
  const v = headerView(s.topRows, headerRow);
  const at = s.topRows.findIndex((r) => r.row === headerRow);
  return {
    headers: v.headers,
    headerRows: v.headerRows,
    rowCount: Math.max(0, s.gridRows - at - v.headerRows.length),
  };
}

/** Upload → header row → map columns → answer unknown values → check → import, each step with its own messages. */
export function ImportPanel({ projectId }: { projectId: string }) {
  const qc = useQueryClient();
  const [starting, start] = useTransition();
  const [step, setStep] = useState<'idle' | 'reading' | 'checking' | 'importing'>('idle');
  const [error, setError] = useState<string | null>(null);
  const [draft, setDraft] = useState<DraftSummary | null>(null);
  const [sheet, setSheet] = useState('');
  const [headerRow, setHeaderRow] = useState(1);
  const [mapping, setMapping] = useState<ColumnMapping>({ columns: {}, units: {} });
  const [preview, setPreview] = useState<Preview | null>(null);
  const [questions, setQuestions] = useState<UnknownValue[]>([]);
  const [done, setDone] = useState<string | null>(null);
  // Reading the file, checking the mapping and the import itself run in the worker; the panel
  // follows one job at a time until it is done or failed.
  const router = useRouter();
  const [jobId, setJobId] = useState<string | null>(null);
  const pending = starting || step !== 'idle';
  const job = useJobOutcome(projectId, jobId, {
    onFailed: (message) => {
      setJobId(null);
      setStep('idle');
      setError(message);
    },
    onDone: (result) => {
      const was = step;
      setJobId(null);
      setStep('idle');
      if (was === 'reading') {
        const d = result as unknown as DraftSummary;
        setDraft(d);
        startSheet(d, d.defaultSheet);
        return;
      }
      if (was === 'checking') {
        const p = result as unknown as Preview;
        setPreview(p);
        // Questions stay on screen once asked (answered ones too), new ones are added.
        setQuestions((q) => {
          const key = (u: UnknownValue) => `${u.field}\u0000${valueKey(u.value)}`;
          const seen = new Set(q.map(key));
          return [...q, ...p.unknownValues.filter((u) => !seen.has(key(u)))];
        });
        return;
      }
      const r = result as {
        revision: number;
        lineCount: number;
        added: number;
        changed: number;
        removed: number;
        solved: number;
      };
      setDone(
        `Revision ${r.revision} imported: ${r.lineCount} lines (${r.added} added, ${r.changed} changed, ${r.removed} removed); ${r.solved} solved.`,
      );
      setDraft(null);
      setPreview(null);
      setQuestions([]);
      qc.invalidateQueries({ queryKey: ['lines', projectId] });
      qc.invalidateQueries({ queryKey: ['jobs', projectId, 'recent'] });
      router.refresh();
    },
  });

  const current = draft?.sheets.find((s) => s.name === sheet);
  const view = current ? viewOf(current, headerRow) : null;

  function startSheet(d: DraftSummary, name: string) {
    const s = d.sheets.find((x) => x.name === name)!;
    setSheet(name);
    setHeaderRow(s.headerRow);
    setPreview(null);
    setQuestions([]);
    setMapping(s.suggested);
  }

  function onFile(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setError(null);
    setDone(null);
    setPreview(null);
    const fd = new FormData(e.currentTarget);
    const file = fd.get('file');
    if (!(file instanceof File) || !file.size) {
      setError('Choose a line-list file (.xlsx or .csv).');
      return;
    }
    if (file.size > MAX_BYTES) {
      setError(
        `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 20 MB. Nothing was uploaded.`,
      );
      return;
    }
    setDraft(null);
    setStep('reading');
    start(async () => {
      const r = await uploadLineListAction(projectId, fd);
      if (!r.ok) {
        setStep('idle');
        setError(r.error);
        return;
      }
      setJobId(r.data.id);
    });
  }

  function chooseSheet(name: string) {
    startSheet(draft!, name);
  }

  /** Another header row: the mapping is suggested again from its names; answers to value questions are kept. */
  function chooseHeaderRow(row: number) {
    setHeaderRow(row);
    setPreview(null);
    setQuestions([]);
    const v = viewOf(current!, row);
    setMapping((m) => ({
      ...suggestMapping(v.headers, draft!.remembered ?? undefined),
      ...(m.values ? { values: m.values } : {}),
    }));
  }

  function answer(field: ValueField, raw: string, meaning: string) {
    setPreview(null);
    setMapping((m) => {
      const values = { ...(m.values ?? {}) };
      const forField = { ...(values[field] ?? {}) };
      if (meaning === '') delete forField[valueKey(raw)];
      else forField[valueKey(raw)] = meaning;
      values[field] = forField;
      return { ...m, values };
    });
  }

  function setColumn(key: LineFieldKey, v: string) {
    setPreview(null);
    setMapping((m) => {
      const columns = { ...m.columns };
      if (v === '') delete columns[key];
      else columns[key] = Number(v);
      return { ...m, columns };
    });
  }

  function check() {
    setError(null);
    setStep('checking');
    start(async () => {
      const r = await previewImportAction(projectId, {
        draftId: draft!.draftId,
        sheetName: sheet,
        headerRow,
        mapping,
      });
      if (!r.ok) {
        setStep('idle');
        setError(r.error);
        return;
      }
      setJobId(r.data.id);
    });
  }

  function commit() {
    setError(null);
    setStep('importing');
    start(async () => {
      const r = await commitImportAction(projectId, {
        draftId: draft!.draftId,
        sheetName: sheet,
        headerRow,
        mapping,
      });
      if (!r.ok) {
        setStep('idle');
        setError(r.error);
        return;
      }
      setJobId(r.data.id);
      qc.invalidateQueries({ queryKey: ['jobs', projectId, 'recent'] });
    });
  }

  return (
    <section className="panel mb-6 p-4" aria-label="Import a line list">
      <div className="flex flex-wrap items-end gap-3">
        <form onSubmit={onFile} className="flex flex-wrap items-end gap-3">
          <div>
            <label htmlFor="line-file" className="label">
              Line-list file (.xlsx or .csv, up to 20 MB)
            </label>
            <input
              id="line-file"
              name="file"
              type="file"
              accept=".xlsx,.xlsm,.csv,.tsv"
              className="text-sm"
            />
          </div>
          <button type="submit" className="btn-primary" disabled={pending}>
            Read file
          </button>
        </form>
        <a className="btn-quiet" href={`/api/v1/projects/${projectId}/lines/template`} download>
          Download template
        </a>
      </div>
      {step !== 'idle' ? (
        <div role="status" className="mt-3 flex items-center gap-2 text-sm text-ink-700">
          <span className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-mineral-500 border-t-transparent" />
          {step === 'reading'
            ? 'Reading the file…'
            : step === 'checking'
              ? 'Checking every row against the mapping…'
              : 'Importing in one transaction and solving the changed lines…'}
        </div>
      ) : null}
      {step === 'importing' && job.data && (job.data.state === 'queued' || job.data.state === 'running') ? (
        <div className="mt-3">
          <JobProgressBar job={job.data} />
        </div>
      ) : null}
      {error ? (
        <p
          role="alert"
          className="mt-3 rounded border border-alarm-500 bg-alarm-50 px-3 py-2 text-sm text-alarm-700"
        >
          {error}
        </p>
      ) : null}
      {done ? (
        <p
          role="status"
          className="mt-3 rounded border border-mineral-300 bg-mineral-50 px-3 py-2 text-sm text-mineral-900"
        >
          {done}
        </p>
      ) : null}

      {draft && current && view ? (
        <div className="mt-4 space-y-4">
          {draft.readAs ? (
            <p role="note" className="text-xs text-ink-700" aria-label="How the file was read">
              Read as {draft.readAs}.
            </p>
          ) : null}
          <div className="flex flex-wrap items-end gap-4">
            <div>
              <label htmlFor="sheet" className="label">
                Sheet
              </label>
              <select
                id="sheet"
                className="input"
                value={sheet}
                onChange={(e) => chooseSheet(e.target.value)}
              >
                {draft.sheets.map((s) => (
                  <option key={s.name} value={s.name}>
                    {s.name}
                    {s.hidden ? ' (hidden)' : ''} — {s.rowCount} rows
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor="header-row" className="label">
                Header row (the column names)
              </label>
              <select
                id="header-row"
                className="input max-w-xl"
                value={headerRow}
                onChange={(e) => chooseHeaderRow(Number(e.target.value))}
              >
                {current.topRows.slice(0, 30).map((r) => (
                  <option key={r.row} value={r.row}>
                    Row {r.row}: {rowPreview(r.cells)}
                  </option>
                ))}
              </select>
            </div>
            <p role="note" className="text-xs text-ink-700" aria-label="Rows to read">
              {view.rowCount} rows below the header
              {view.headerRows.length > 1 ? ` (units read from row ${view.headerRows[1]})` : ''}
              {headerRow > (current.topRows[0]?.row ?? 1) ? `; rows above row ${headerRow} are not read` : ''}
              .
            </p>
            {current.hidden ? (
              <p className="caution text-xs">
                This sheet is hidden in the workbook. Make sure it is the line list you mean.
              </p>
            ) : null}
          </div>
          <div className="overflow-x-auto">
            <table className="table-dense" aria-label="Column mapping">
              <thead>
                <tr>
                  <th>Lagwise field</th>
                  <th>Column in the file</th>
                  <th>Unit</th>
                </tr>
              </thead>
              <tbody>
                {FIELDS.map((f) => (
                  <tr key={f.key}>
                    <td>
                      {f.label}
                      {f.required ? ' *' : ''}
                    </td>
                    <td>
                      <select
                        aria-label={`Column for ${f.label}`}
                        className="input py-1"
                        value={mapping.columns[f.key] ?? ''}
                        onChange={(e) => setColumn(f.key, e.target.value)}
                      >
                        <option value="">— not in the file —</option>
                        {view.headers.map((h, i) => (
                          <option key={i} value={i}>
                            {letter(i)}: {h || '(no header)'}
                          </option>
                        ))}
                      </select>
                    </td>
                    <td>
                      {f.unit !== 'none' ? (
                        <select
                          aria-label={`Unit for ${f.label}`}
                          className="input py-1"
                          value={mapping.units[f.key] ?? UNIT_CHOICES[f.unit][0]}
                          onChange={(e) => {
                            setPreview(null);
                            setMapping((m) => ({ ...m, units: { ...m.units, [f.key]: e.target.value } }));
                          }}
                        >
                          {UNIT_CHOICES[f.unit].map((u) => (
                            <option key={u}>{u}</option>
                          ))}
                        </select>
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {questions.length ? (
            <ValueQuestions questions={questions} mapping={mapping} onAnswer={answer} />
          ) : null}
          <button type="button" className="btn-quiet" onClick={check} disabled={pending}>
            {questions.length && !preview ? 'Check the rows again' : 'Check the rows'}
          </button>
          {preview ? <PreviewView preview={preview} onCommit={commit} pending={pending} /> : null}
        </div>
      ) : null}
    </section>
  );
}

/** Each distinct value the file uses that we do not know, asked once; the answer is remembered with the mapping. */
function ValueQuestions({
  questions,
  mapping,
  onAnswer,
}: {
  questions: UnknownValue[];
  mapping: ColumnMapping;
  onAnswer: (f: ValueField, raw: string, meaning: string) => void;
}) {
  const open = questions.filter((q) => !mapping.values?.[q.field]?.[valueKey(q.value)]).length;
  return (
    <div className="rounded border border-ochre-500 bg-ochre-50 p-3">
      <h3 className="text-sm font-semibold">Values to answer</h3>
      <p className="mb-2 text-xs text-ink-700">
        The file uses {questions.length === 1 ? 'a word' : 'words'} Lagwise does not know. Say once what each
        means; the answers are kept with this project&apos;s column mapping, so the next revision asks
        nothing. {open ? `${open} still open.` : 'All answered — check the rows again.'}
      </p>
      <table className="table-dense" aria-label="Values to answer">
        <thead>
          <tr>
            <th>Field</th>
            <th>Value in the file</th>
            <th>Where</th>
            <th>Means</th>
          </tr>
        </thead>
        <tbody>
          {questions.map((q) => (
            <tr key={`${q.field}:${q.value}`}>
              <td>{FIELD_BY_KEY[q.field].label}</td>
              <td className="font-mono">{q.value}</td>
              <td>
                column {q.column}, {q.count === 1 ? `row ${q.rows[0]}` : `${q.count} rows`}
              </td>
              <td>
                <select
                  aria-label={`Meaning of ${q.value} (${FIELD_BY_KEY[q.field].label})`}
                  className="input py-1"
                  value={mapping.values?.[q.field]?.[valueKey(q.value)] ?? ''}
                  onChange={(e) => onAnswer(q.field, q.value, e.target.value)}
                >
                  <option value="">— choose —</option>
                  {VALUE_CHOICES[q.field].map((c) => (
                    <option key={c.value} value={c.value}>
                      {c.label}
                    </option>
                  ))}
                </select>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function PreviewView({
  preview,
  onCommit,
  pending,
}: {
  preview: Preview;
  onCommit: () => void;
  pending: boolean;
}) {
  const d = preview.diff;
  return (
    <div className="space-y-3">
      <p className="text-sm" role="status" aria-label="Check result">
        {preview.lineCount} lines ready ·{' '}
        <strong className={preview.errorCount ? 'text-alarm-700' : ''}>{preview.errorCount} errors</strong> ·{' '}
        {preview.warningCount} warnings · against revision {preview.previousRevision || '—'}: {d.added.length}{' '}
        added, {d.changed.length} changed, {d.removed.length} removed, {d.unchanged} unchanged
      </p>
      {preview.issues.length ? (
        <div className="max-h-72 overflow-auto">
          <table className="table-dense" aria-label="Problems found">
            <thead>
              <tr>
                <th>Row</th>
                <th>Column</th>
                <th>Severity</th>
                <th>Message</th>
              </tr>
            </thead>
            <tbody>
              {preview.issues.slice(0, 500).map((i, k) => (
                <tr key={k}>
                  <td className="num">{i.row}</td>
                  <td>{i.column ?? '—'}</td>
                  <td className={i.severity === 'error' ? 'text-alarm-700' : 'text-ochre-700'}>
                    {i.severity}
                  </td>
                  <td>{i.message}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {d.changed.length || d.removed.length ? (
        <details className="text-sm">
          <summary>Changes against the current revision</summary>
          <ul className="mt-2 space-y-1">
            {d.removed.map((t) => (
              <li key={t}>
                Removed: <span className="font-mono">{t}</span>
              </li>
            ))}
            {d.changed.slice(0, 200).map((c) => (
              <li key={c.tag}>
                <span className="font-mono">{c.tag}</span>:{' '}
                {c.changes.map((x) => `${x.field} ${fmt(x.from)} → ${fmt(x.to)}`).join('; ')}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
      <button
        type="button"
        className="btn-primary"
        onClick={onCommit}
        disabled={pending || preview.errorCount > 0}
      >
        {preview.errorCount ? 'Fix the errors to import' : `Import ${preview.lineCount} lines`}
      </button>
    </div>
  );
}

const fmt = (v: unknown) =>
  v === null || v === undefined
    ? '—'
    : Array.isArray(v)
      ? v.join(', ')
      : typeof v === 'number'
        ? String(Math.round(v * 100) / 100)
        : String(v);
