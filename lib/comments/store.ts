/**
 * Comments on a line — free of Next.js (the server action calls it after the wrapper checked the
 * session and the role). Threads are one level deep: a reply to a reply joins the thread of the
 * comment that opened it, so a thread reads top to bottom. Every comment is also in the project's
 * audit trail with its text.
 */
import { and, asc, eq } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineComments, lines } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { AppError } from '@/lib/errors';
import { cleanComment, commentProblem } from './rules';

export interface CommentView {
  id: string;
  authorName: string;
  body: string;
  /** ISO 8601, UTC. */
  createdAt: string;
}
export interface CommentThread extends CommentView {
  replies: CommentView[];
}

const view = (c: typeof lineComments.$inferSelect): CommentView => ({
  id: c.id,
  authorName: c.authorName,
  body: c.body,
  createdAt: c.createdAt.toISOString(),
});

/** The line's comments as threads, oldest first, each with its replies oldest first. */
export async function listComments({
  projectId,
  lineId,
}: {
  projectId: string;
  lineId: string;
}): Promise<CommentThread[]> {
  const rows = await db
    .select()
    .from(lineComments)
    .where(and(eq(lineComments.projectId, projectId), eq(lineComments.lineId, lineId)))
    .orderBy(asc(lineComments.createdAt), asc(lineComments.id));
  const threads = new Map<string, CommentThread>();
  for (const r of rows) if (!r.parentId) threads.set(r.id, { ...view(r), replies: [] });
  for (const r of rows) if (r.parentId) threads.get(r.parentId)?.replies.push(view(r));
  return [...threads.values()];
}

/** Adds a comment (or a reply to `parentId`) to a line of the project; returns the line's threads. */
export async function addComment(o: {
  projectId: string;
  lineId: string;
  userId: string;
  body: string;
  parentId?: string | null;
}): Promise<CommentThread[]> {
  const problem = commentProblem(o.body);
  if (problem) throw new AppError('invalid', problem, { body: [problem] });
  const body = cleanComment(o.body);
  const [line] = await db
    .select({ id: lines.id, tag: lines.tag })
    .from(lines)
    .where(and(eq(lines.projectId, o.projectId), eq(lines.id, o.lineId)));
  if (!line) throw new AppError('not_found', 'This line is no longer in the line list.');
  const name = await actorName(o.userId);
  await db.transaction(async (tx) => {
    let parentId: string | null = null;
    if (o.parentId) {
      const [parent] = await tx
        .select({ id: lineComments.id, parentId: lineComments.parentId })
        .from(lineComments)
        .where(and(eq(lineComments.id, o.parentId), eq(lineComments.lineId, line.id)));
      if (!parent)
        throw new AppError(
          'not_found',
          'The comment you replied to is no longer on this line; reload the page.',
        );
      parentId = parent.parentId ?? parent.id;
    }
    const [c] = await tx
      .insert(lineComments)
      .values({
        projectId: o.projectId,
        lineId: line.id,
        parentId,
        authorId: o.userId,
        authorName: name,
        body,
      })
      .returning({ id: lineComments.id });
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        lineId: line.id,
        tag: line.tag,
        actorId: o.userId,
        actorName: name,
        action: parentId ? 'comment replied' : 'comment added',
        after: { comment: body },
      },
    ]);
    return c;
  });
  return listComments({ projectId: o.projectId, lineId: line.id });
}
