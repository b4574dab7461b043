'use client';
import { useState, useTransition } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { FIELDS, UNIT_CHOICES, type LineFieldKey } from '@/lib/lines/fields';
import type { ColumnMapping } from '@/lib/lines/mapping';
import type { DraftSummary, Preview } from '@/lib/lines/store';
import { commitImportAction, previewImportAction, uploadLineListAction } from './actions';

const MAX_BYTES = 20 * 1024 * 1024;
const letter = (i: number) => { let s = '', n = i + 1; while (n > 0) { const m = (n - 1) % 26; s = String.fromCharCode(65 + m) + s; n = Math.floor((n - 1) / 26); } return s; };

/** Upload → map columns → check → import, each step with its own messages. */
export function ImportPanel({ projectId }: { projectId: string }) {
  const qc = useQueryClient();
  const [pending, start] = useTransition();
  const [step, setStep] = useState<'idle' | 'reading' | 'importing'>('idle');
  const [error, setError] = useState<string | null>(null);
  const [draft, setDraft] = useState<DraftSummary | null>(null);
  const [sheet, setSheet] = useState('');
  const [mapping, setMapping] = useState<ColumnMapping>({ columns: {}, units: {} });
  const [preview, setPreview] = useState<Preview | null>(null);
  const [done, setDone] = useState<string | null>(null);

  const current = draft?.sheets.find((s) => s.name === sheet);

  function onFile(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setError(null); setDone(null); setPreview(null);
    const fd = new FormData(e.currentTarget);
    const file = fd.get('file');
    if (!(file instanceof File) || !file.size) { setError('Choose a line-list file (.xlsx or .csv).'); return; }
    if (file.size > MAX_BYTES) { setError(`The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 20 MB. Nothing was uploaded.`); return; }
    setStep('reading');
    start(async () => {
      const r = await uploadLineListAction(projectId, fd);
      setStep('idle');
      if (!r.ok) { setError(r.error); return; }
      setDraft(r.data);
      setSheet(r.data.defaultSheet);
      setMapping(r.data.sheets.find((s) => s.name === r.data.defaultSheet)!.suggested);
    });
  }

  function chooseSheet(name: string) {
    setSheet(name); setPreview(null);
    setMapping(draft!.sheets.find((s) => s.name === name)!.suggested);
  }

  function setColumn(key: LineFieldKey, v: string) {
    setPreview(null);
    setMapping((m) => {
      const columns = { ...m.columns };
      if (v === '') delete columns[key]; else columns[key] = Number(v);
      return { ...m, columns };
    });
  }

  function check() {
    setError(null);
    start(async () => {
      const r = await previewImportAction(projectId, { draftId: draft!.draftId, sheetName: sheet, mapping });
      if (!r.ok) { setError(r.error); return; }
      setPreview(r.data);
    });
  }

  function commit() {
    setError(null); setStep('importing');
    start(async () => {
      const r = await commitImportAction(projectId, { draftId: draft!.draftId, sheetName: sheet, mapping });
      setStep('idle');
      if (!r.ok) { setError(r.error); return; }
      setDone(`Revision ${r.data.revision} imported: ${r.data.lineCount} lines (${r.data.diff.added.length} added, ${r.data.diff.changed.length} changed, ${r.data.diff.removed.length} removed); ${r.data.solved} solved.`);
      setDraft(null); setPreview(null);
      await qc.invalidateQueries({ queryKey: ['lines', projectId] });
    });
  }

  return (
    <section className="panel mb-6 p-4" aria-label="Import a line list">
      <div className="flex flex-wrap items-end gap-3">
        <form onSubmit={onFile} className="flex flex-wrap items-end gap-3">
          <div>
            <label htmlFor="line-file" className="label">Line-list file (.xlsx or .csv, up to 20 MB)</label>
            <input id="line-file" name="file" type="file" accept=".xlsx,.xlsm,.csv" className="text-sm" />
          </div>
          <button className="btn-primary" disabled={pending}>Read file</button>
        </form>
        <a className="btn-quiet" href={`/api/v1/projects/${projectId}/lines/template`} download>Download template</a>
      </div>
      {step !== 'idle' ? (
        <div role="status" className="mt-3 flex items-center gap-2 text-sm text-ink-700">
          <span className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-mineral-500 border-t-transparent" />
          {step === 'reading' ? 'Reading the file…' : 'Importing in one transaction and solving the changed lines…'}
        </div>
      ) : null}
      {error ? <p role="alert" className="mt-3 rounded border border-alarm-500 bg-alarm-50 px-3 py-2 text-sm text-alarm-700">{error}</p> : null}
      {done ? <p role="status" className="mt-3 rounded border border-mineral-300 bg-mineral-50 px-3 py-2 text-sm text-mineral-900">{done}</p> : null}

      {draft && current ? (
        <div className="mt-4 space-y-4">
          <div className="flex flex-wrap items-end gap-4">
            <div>
              <label htmlFor="sheet" className="label">Sheet</label>
              <select id="sheet" className="input" value={sheet} onChange={(e) => chooseSheet(e.target.value)}>
                {draft.sheets.map((s) => <option key={s.name} value={s.name}>{s.name}{s.hidden ? ' (hidden)' : ''} — {s.rowCount} rows</option>)}
              </select>
            </div>
            {current.hidden ? <p className="caution text-xs">This sheet is hidden in the workbook. Make sure it is the line list you mean.</p> : null}
          </div>
          <div className="overflow-x-auto">
            <table className="table-dense" aria-label="Column mapping">
              <thead><tr><th>Lagwise field</th><th>Column in the file</th><th>Unit</th></tr></thead>
              <tbody>
                {FIELDS.map((f) => (
                  <tr key={f.key}>
                    <td>{f.label}{f.required ? ' *' : ''}</td>
                    <td>
                      <select aria-label={`Column for ${f.label}`} className="input py-1" value={mapping.columns[f.key] ?? ''} onChange={(e) => setColumn(f.key, e.target.value)}>
                        <option value="">— not in the file —</option>
                        {current.headers.map((h, i) => <option key={i} value={i}>{letter(i)}: {h || '(no header)'}</option>)}
                      </select>
                    </td>
                    <td>
                      {f.unit !== 'none' ? (
                        <select aria-label={`Unit for ${f.label}`} className="input py-1" value={mapping.units[f.key] ?? UNIT_CHOICES[f.unit][0]} onChange={(e) => { setPreview(null); setMapping((m) => ({ ...m, units: { ...m.units, [f.key]: e.target.value } })); }}>
                          {UNIT_CHOICES[f.unit].map((u) => <option key={u}>{u}</option>)}
                        </select>
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <button className="btn-quiet" onClick={check} disabled={pending}>Check the rows</button>
          {preview ? <PreviewView preview={preview} onCommit={commit} pending={pending} /> : null}
        </div>
      ) : null}
    </section>
  );
}

function PreviewView({ preview, onCommit, pending }: { preview: Preview; onCommit: () => void; pending: boolean }) {
  const d = preview.diff;
  return (
    <div className="space-y-3">
      <p className="text-sm" role="status" aria-label="Check result">
        {preview.lineCount} lines ready · <strong className={preview.errorCount ? 'text-alarm-700' : ''}>{preview.errorCount} errors</strong> · {preview.warningCount} warnings ·
        against revision {preview.previousRevision || '—'}: {d.added.length} added, {d.changed.length} changed, {d.removed.length} removed, {d.unchanged} unchanged
      </p>
      {preview.issues.length ? (
        <div className="max-h-72 overflow-auto">
          <table className="table-dense" aria-label="Problems found">
            <thead><tr><th>Row</th><th>Column</th><th>Severity</th><th>Message</th></tr></thead>
            <tbody>
              {preview.issues.slice(0, 500).map((i, k) => (
                <tr key={k}><td className="num">{i.row}</td><td>{i.column ?? '—'}</td><td className={i.severity === 'error' ? 'text-alarm-700' : 'text-ochre-700'}>{i.severity}</td><td>{i.message}</td></tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {d.changed.length || d.removed.length ? (
        <details className="text-sm">
          <summary>Changes against the current revision</summary>
          <ul className="mt-2 space-y-1">
            {d.removed.map((t) => <li key={t}>Removed: <span className="font-mono">{t}</span></li>)}
            {d.changed.slice(0, 200).map((c) => (
              <li key={c.tag}><span className="font-mono">{c.tag}</span>: {c.changes.map((x) => `${x.field} ${fmt(x.from)} → ${fmt(x.to)}`).join('; ')}</li>
            ))}
          </ul>
        </details>
      ) : null}
      <button className="btn-primary" onClick={onCommit} disabled={pending || preview.errorCount > 0}>
        {preview.errorCount ? 'Fix the errors to import' : `Import ${preview.lineCount} lines`}
      </button>
    </div>
  );
}

const fmt = (v: unknown) => (v === null || v === undefined ? '—' : Array.isArray(v) ? v.join(', ') : typeof v === 'number' ? String(Math.round(v * 100) / 100) : String(v));
