import Link from 'next/link';
import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { projectProgress } from '@/lib/lines/progress';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Overview') };
}

export default async function ProjectOverview({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role } = await loadProject(projectId);
  const base = `/projects/${project.id}`;
  const steps = [
    {
      href: `${base}/design-basis`,
      label: 'Set the design basis',
      text: 'Condition sets, touch limit, dew-point margin, material systems and economics.',
      action: 'lines.read' as const,
    },
    {
      href: `${base}/lines`,
      label: 'Upload the line list',
      text: 'Map the spreadsheet columns once; each revision is compared line by line.',
      action: 'lines.read' as const,
    },
    {
      href: `${base}/review`,
      label: 'Review hot and cold surfaces',
      text: 'The safety reviewer disposes every surface over the touch limit or under the dew point.',
      action: 'review.read' as const,
    },
    {
      href: `${base}/budget`,
      label: 'Keep heat loss in budget',
      text: 'Per-area totals against the plant allocation.',
      action: 'budget.read' as const,
    },
    {
      href: `${base}/boq`,
      label: 'Issue the bill of quantities',
      text: 'Lengths, areas and volumes per material and thickness for the contractor.',
      action: 'boq.read' as const,
    },
  ].filter((s) => can(role, s.action));
  // Counts per step for the roles that read the line list (a contractor sees the bill only).
  const p = can(role, 'lines.read') ? await projectProgress({ projectId: project.id }) : null;
  const counts = p
    ? [
        ['Lines', p.lines],
        ['Solved', p.solved],
        ['Decided', p.decided],
        ['Flagged', p.flagged],
        ['Signed off', p.signedOff],
        [p.lastIssue ? `Billed (issue ${p.lastIssue})` : 'Billed', p.billed ?? '—'],
      ]
    : [];
  return (
    <>
      <h1 className="mb-1">{project.name}</h1>
      <p className="mb-4 text-sm text-ink-600">{project.site}</p>
      {counts.length ? (
        <dl className="mb-6 grid grid-cols-3 gap-2 md:grid-cols-6" aria-label="Progress">
          {counts.map(([label, n]) => (
            <div key={String(label)} className="panel px-3 py-2">
              <dt className="text-xs text-ink-500">{label}</dt>
              <dd className="text-xl font-semibold tabular-nums">{n}</dd>
            </div>
          ))}
        </dl>
      ) : null}
      <ol className="grid gap-3 md:grid-cols-2">
        {steps.map((s, i) => (
          <li key={s.href} className="panel p-4">
            <div className="text-xs text-ink-500">Step {i + 1}</div>
            <Link href={s.href} className="font-medium">
              {s.label}
            </Link>
            <p className="mt-1 text-sm text-ink-600">{s.text}</p>
          </li>
        ))}
      </ol>
    </>
  );
}
