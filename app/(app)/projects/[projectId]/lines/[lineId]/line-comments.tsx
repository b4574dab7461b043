'use client';
/**
 * Comments on a line: threads (a comment and its replies), each with its author and time (UTC), and
 * the form to add one. Self-contained: the line page passes the threads it loaded and whether the
 * viewer may write; posting goes through `addLineCommentAction` and shows the threads it answers.
 * Text is rendered as text (React escapes it), with line breaks kept — never as markup.
 */
import { useId, useState, useTransition } from 'react';
import type { CommentThread, CommentView } from '@/lib/comments/store';
import { COMMENT_MAX, commentProblem } from '@/lib/comments/rules';
import { addLineCommentAction } from './comment-actions';

const when = (iso: string) => `${iso.slice(0, 16).replace('T', ' ')} UTC`;

function Comment({ c }: { c: CommentView }) {
  return (
    <article aria-label={`Comment by ${c.authorName}`} className="text-sm">
      <p className="text-xs text-ink-600">
        <span className="font-semibold text-ink-800">{c.authorName}</span> ·{' '}
        <time dateTime={c.createdAt}>{when(c.createdAt)}</time>
      </p>
      <p className="whitespace-pre-wrap [overflow-wrap:anywhere]">{c.body}</p>
    </article>
  );
}

function CommentForm({
  label,
  submit,
  onPost,
  onCancel,
}: {
  label: string;
  submit: string;
  onPost: (body: string) => Promise<string | null>;
  onCancel?: () => void;
}) {
  const id = useId();
  const [body, setBody] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const n = [...body.trim()].length;
  return (
    <form
      className="mt-2 space-y-1"
      onSubmit={(e) => {
        e.preventDefault();
        const problem = commentProblem(body);
        if (problem) return setError(problem);
        start(async () => {
          const err = await onPost(body);
          setError(err);
          if (!err) setBody('');
        });
      }}
    >
      <label htmlFor={id} className="block text-sm font-medium">
        {label}
      </label>
      <textarea
        id={id}
        rows={3}
        value={body}
        onChange={(e) => setBody(e.target.value)}
        aria-describedby={`${id}-count${error ? ` ${id}-error` : ''}`}
        aria-invalid={error ? true : undefined}
        className="input w-full max-w-2xl"
      />
      <p id={`${id}-count`} className={`text-xs ${n > COMMENT_MAX ? 'text-alarm-700' : 'text-ink-600'}`}>
        {n.toLocaleString('en')} of {COMMENT_MAX.toLocaleString('en')} characters · plain text
      </p>
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-sm text-alarm-700">
          {error}
        </p>
      ) : null}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? 'Posting…' : submit}
        </button>
        {onCancel ? (
          <button type="button" className="underline" onClick={onCancel}>
            Cancel
          </button>
        ) : null}
      </div>
    </form>
  );
}

export function LineComments({
  projectId,
  lineId,
  tag,
  initial,
  canWrite,
}: {
  projectId: string;
  lineId: string;
  tag: string;
  initial: CommentThread[];
  canWrite: boolean;
}) {
  const [threads, setThreads] = useState(initial);
  const [replyTo, setReplyTo] = useState<string | null>(null);
  const post = async (body: string, parentId: string | null) => {
    let r: Awaited<ReturnType<typeof addLineCommentAction>>;
    try {
      r = await addLineCommentAction(projectId, { lineId, parentId, body });
    } catch {
      return 'The server could not be reached, so nothing was posted. Try again.';
    }
    if (!r.ok) return r.error;
    setThreads(r.data);
    setReplyTo(null);
    return null;
  };
  return (
    <section className="panel mt-4 p-4" aria-labelledby="line-comments-heading">
      <h2 id="line-comments-heading" className="mb-2">
        Comments
      </h2>
      {threads.length === 0 ? (
        <p className="text-sm text-ink-500">No comments on {tag} yet.</p>
      ) : (
        <ol className="space-y-3" aria-label="Comment threads">
          {threads.map((t) => (
            <li key={t.id} className="border-l-2 border-ink-300 pl-3">
              <Comment c={t} />
              {t.replies.length ? (
                <ol
                  className="mt-2 space-y-2 border-l border-ink-200 pl-4"
                  aria-label={`Replies to ${t.authorName}`}
                >
                  {t.replies.map((r) => (
                    <li key={r.id}>
                      <Comment c={r} />
                    </li>
                  ))}
                </ol>
              ) : null}
              {canWrite ? (
                replyTo === t.id ? (
                  <CommentForm
                    label={`Reply to ${t.authorName}`}
                    submit="Post reply"
                    onPost={(b) => post(b, t.id)}
                    onCancel={() => setReplyTo(null)}
                  />
                ) : (
                  <button type="button" className="mt-1 text-sm underline" onClick={() => setReplyTo(t.id)}>
                    Reply<span className="sr-only"> to {t.authorName}</span>
                  </button>
                )
              ) : null}
            </li>
          ))}
        </ol>
      )}
      {canWrite ? (
        <CommentForm label="New comment" submit="Post comment" onPost={(b) => post(b, null)} />
      ) : (
        <p className="mt-2 text-sm text-ink-500">Your role can read comments but not add them.</p>
      )}
    </section>
  );
}
