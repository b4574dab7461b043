'use client';
import { startTransition, useActionState } from 'react';
import { getFormProps, getInputProps, useForm, type SubmissionResult } from '@conform-to/react';
import { parseWithZod } from '@conform-to/zod/v4';
import { formSchemas, type FormSchemaName } from '@/lib/forms/schemas';

export interface FieldSpec {
  name: string;
  label: string;
  type?: 'text' | 'email' | 'password' | 'select';
  autoComplete?: string;
  options?: { value: string; label: string }[];
  hint?: string;
}

type Result = (SubmissionResult<string[]> & { data?: unknown }) | undefined;

/**
 * A labelled form driven by one of the shared zod schemas: instant field messages in the browser,
 * the same schema on the server, typed values kept after a server-side error.
 */
export function SimpleForm({
  action,
  schema,
  fields,
  hidden = {},
  submitLabel,
  successMessage,
  className,
}: {
  action: (prev: unknown, fd: FormData) => Promise<Result>;
  schema: FormSchemaName;
  fields: FieldSpec[];
  hidden?: Record<string, string>;
  submitLabel: string;
  successMessage?: string;
  className?: string;
}) {
  const [lastResult, formAction, pending] = useActionState(action, undefined);
  const [form, fieldMeta] = useForm({
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: formSchemas[schema] }),
    shouldValidate: 'onBlur',
    shouldRevalidate: 'onInput',
  });
  const formProps = getFormProps(form);
  const meta = fieldMeta as unknown as Record<string, Parameters<typeof getInputProps>[0]>;
  return (
    <form
      {...formProps}
      className={className ?? 'space-y-4'}
      // Dispatch by hand: React resets a form after a form action, which would drop typed values on an error.
      onSubmit={(e) => {
        formProps.onSubmit(e);
        if (e.defaultPrevented) return;
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        startTransition(() => formAction(fd));
      }}
    >
      {Object.entries(hidden).map(([k, v]) => (
        <input key={k} type="hidden" name={k} value={v} />
      ))}
      {form.errors?.length ? (
        <div
          role="alert"
          className="rounded border border-alarm-500 bg-alarm-50 px-3 py-2 text-sm text-alarm-700"
        >
          {form.errors.join(' ')}
        </div>
      ) : null}
      {lastResult?.status === 'success' && successMessage ? (
        <div
          role="status"
          className="rounded border border-mineral-300 bg-mineral-50 px-3 py-2 text-sm text-mineral-800"
        >
          {successMessage}
        </div>
      ) : null}
      {fields.map((f) => {
        const m = meta[f.name];
        const errId = m.errorId;
        return (
          <div key={f.name}>
            <label htmlFor={m.id} className="label">
              {f.label}
            </label>
            {f.type === 'select' ? (
              <select
                id={m.id}
                name={m.name}
                defaultValue={(m.initialValue as string) ?? f.options?.[0]?.value}
                className="input"
                aria-invalid={m.errors ? true : undefined}
                aria-describedby={m.errors ? errId : undefined}
              >
                {f.options?.map((o) => (
                  <option key={o.value} value={o.value}>
                    {o.label}
                  </option>
                ))}
              </select>
            ) : (
              <input
                {...getInputProps(m, { type: f.type ?? 'text' })}
                key={m.key}
                autoComplete={f.autoComplete}
                className="input"
              />
            )}
            {f.hint && !m.errors ? <p className="mt-1 text-xs text-ink-500">{f.hint}</p> : null}
            {m.errors ? (
              <p id={errId} className="field-error">
                {m.errors.join(' ')}
              </p>
            ) : null}
          </div>
        );
      })}
      <button type="submit" className="btn-primary" disabled={pending}>
        {pending ? 'Working…' : submitLabel}
      </button>
    </form>
  );
}
