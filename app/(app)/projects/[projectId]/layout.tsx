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
  const heading = (
    <>
      <div className="font-mono text-xs text-ink-500">{project.code}</div>
      <div className="text-sm font-semibold leading-tight">{project.name}</div>
      <div className="mt-1 text-xs text-ink-500">
        {organizationName} · <span data-testid="role">{ROLE_LABEL[role]}</span>
      </div>
    </>
  );
  // Below 1024 px (a tablet held upright, a phone, a zoomed window) the sidebar folds into a menu
  // above the page, so the page gets the full width; one navigation landmark is shown at a time.
  return (
    <div className="lg:flex">
      <aside className="hidden min-h-[calc(100vh-3rem)] w-56 shrink-0 border-r border-ink-200 bg-white p-3 lg:block">
        <div className="mb-3 px-3">{heading}</div>
        <ProjectNav items={items} />
      </aside>
      <details className="app-menu group border-b border-ink-200 bg-white lg:hidden">
        <summary className="flex cursor-pointer items-center gap-3 px-3 py-2 text-sm">
          <span aria-hidden="true" className="font-mono">
            ≡
          </span>
          <span className="font-medium">Menu</span>
          <span className="min-w-0 truncate text-ink-600">
            {project.code} · {project.name}
          </span>
        </summary>
        <div className="px-3 pb-3">
          <div className="mb-2">{heading}</div>
          <ProjectNav items={items} />
        </div>
      </details>
      <main id="main" tabIndex={-1} className="min-w-0 flex-1 px-3 py-4 focus:outline-none sm:px-6 sm:py-6">
        {children}
      </main>
    </div>
  );
}
