import { loadProject } from '@/lib/server/page';
import { can, ROLE_LABEL, type Action } from '@/lib/auth/permissions';
import { ProjectNav } from '@/components/project-nav';

const SECTIONS: { path: string; label: string; action: Action }[] = [
  { path: '', label: 'Overview', action: 'project.view' },
  { path: '/lines', label: 'Line list', action: 'lines.read' },
  { path: '/design-basis', label: 'Design basis', action: 'lines.read' },
  { path: '/review', label: 'Safety review', action: 'review.read' },
  { path: '/budget', label: 'Heat-loss budget', action: 'budget.read' },
  { path: '/boq', label: 'Bill of quantities', action: 'boq.read' },
  { path: '/report', label: 'Design report', action: 'report.read' },
];

export default async function ProjectLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ projectId: string }>;
}) {
  const { projectId } = await params;
  const { project, role, organizationName } = await loadProject(projectId);
  const base = `/projects/${project.id}`;
  const items = SECTIONS.filter((s) => can(role, s.action)).map((s) => ({
    href: base + s.path,
    label: s.label,
  }));
  if (can(role, 'members.read'))
    items.push({ href: `/orgs/${project.organizationId}/members`, label: 'Members' });
  return (
    <div className="flex">
      <aside className="min-h-[calc(100vh-3rem)] w-56 shrink-0 border-r border-ink-200 bg-white p-3">
        <div className="mb-3 px-3">
          <div className="font-mono text-xs text-ink-500">{project.code}</div>
          <div className="text-sm font-semibold leading-tight">{project.name}</div>
          <div className="mt-1 text-xs text-ink-500">
            {organizationName} · <span data-testid="role">{ROLE_LABEL[role]}</span>
          </div>
        </div>
        <ProjectNav items={items} />
      </aside>
      <main className="min-w-0 flex-1 px-6 py-6">{children}</main>
    </div>
  );
}
