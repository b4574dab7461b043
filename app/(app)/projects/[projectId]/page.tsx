import Link from 'next/link';
import { loadProject } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';

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
  return (
    <>
      <h1 className="mb-1">{project.name}</h1>
      <p className="mb-6 text-sm text-ink-600">{project.site}</p>
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
