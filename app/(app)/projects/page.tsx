import Link from 'next/link';
import { requireUser } from '@/lib/auth/session';
import { listOrganizationsForUser, listProjectsForUser } from '@/db/queries/projects';
import { can, ROLE_LABEL } from '@/lib/auth/permissions';
import { SimpleForm } from '@/components/simple-form';
import { EmptyState } from '@/components/empty-state';
import { createProjectAction } from './actions';

export const metadata = { title: 'Projects' };

export default async function ProjectsPage() {
  const { user } = await requireUser();
  const [projects, orgs] = await Promise.all([
    listProjectsForUser({ userId: user.id }),
    listOrganizationsForUser({ userId: user.id }),
  ]);
  const creatable = orgs.filter((o) => can(o.role, 'project.create'));
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <h1 className="mb-4">Projects</h1>
      {projects.length === 0 ? (
        <EmptyState title="No projects yet">
          A project holds one plant&apos;s line list, design basis, safety review and bill of quantities.
          {creatable.length
            ? ' Create the first one below.'
            : ' Ask an owner or engineer of your organization to add you to a project.'}
        </EmptyState>
      ) : (
        <table className="table-dense panel">
          <thead>
            <tr>
              <th>Code</th>
              <th>Project</th>
              <th>Site</th>
              <th>Organization</th>
              <th>Your role</th>
            </tr>
          </thead>
          <tbody>
            {projects.map((p) => (
              <tr key={p.id}>
                <td className="font-mono">{p.code}</td>
                <td>
                  <Link href={`/projects/${p.id}`}>{p.name}</Link>
                </td>
                <td>{p.site}</td>
                <td>{p.organizationName}</td>
                <td>{ROLE_LABEL[p.role]}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <div className="mt-6 grid gap-6 md:grid-cols-2">
        {creatable.length ? (
          <section className="panel p-5">
            <h2 className="mb-3">New project</h2>
            <SimpleForm
              action={createProjectAction}
              schema="createProject"
              submitLabel="Create project"
              fields={[
                {
                  name: 'organizationId',
                  label: 'Organization',
                  type: 'select',
                  options: creatable.map((o) => ({ value: o.id, label: o.name })),
                },
                { name: 'code', label: 'Code', hint: 'Short reference, e.g. P-2207' },
                { name: 'name', label: 'Name' },
                { name: 'site', label: 'Site' },
              ]}
            />
          </section>
        ) : null}
        <section className="panel p-5">
          <h2 className="mb-3">Organizations</h2>
          <ul className="space-y-1 text-sm">
            {orgs.map((o) => (
              <li key={o.id} className="flex justify-between">
                <span>
                  {o.name} <span className="text-ink-500">· {ROLE_LABEL[o.role]}</span>
                </span>
                {can(o.role, 'members.read') ? <Link href={`/orgs/${o.id}/members`}>Members</Link> : null}
              </li>
            ))}
          </ul>
        </section>
      </div>
    </main>
  );
}
