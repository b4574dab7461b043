'use client';
import { useRouter } from 'next/navigation';

export interface SwitcherProject {
  id: string;
  code: string;
  name: string;
  organizationName: string;
}

export function ProjectSwitcher({ projects, current }: { projects: SwitcherProject[]; current?: string }) {
  const router = useRouter();
  const orgs = [...new Set(projects.map((p) => p.organizationName))];
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only">Project</span>
      <select
        aria-label="Project"
        className="max-w-[22rem] rounded border border-ink-600 bg-ink-800 px-2 py-1 text-sm text-ink-50"
        value={current ?? ''}
        onChange={(e) => router.push(e.target.value ? `/projects/${e.target.value}` : '/projects')}
      >
        <option value="">All projects</option>
        {orgs.map((o) => (
          <optgroup key={o} label={o}>
            {projects
              .filter((p) => p.organizationName === o)
              .map((p) => (
                <option key={p.id} value={p.id}>
                  {p.code} — {p.name}
                </option>
              ))}
          </optgroup>
        ))}
      </select>
    </label>
  );
}
