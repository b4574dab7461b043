import { loadOrganization } from '@/lib/server/page';
import { listMembers } from '@/db/queries/projects';
import { pendingInvitations } from '@/lib/auth/service';
import { can, ROLE_LABEL, ROLES } from '@/lib/auth/permissions';
import { SimpleForm } from '@/components/simple-form';
import { Denied } from '@/components/denied';
import { changeRoleAction, inviteAction, removeMemberAction } from './actions';
import { listMembershipRequests } from '@/lib/auth/sso';
import { approveRequestAction, refuseRequestAction } from '../company-sign-in/actions';
import Link from 'next/link';
import { MemberRowActions } from './member-row-actions';

export const metadata = { title: 'Members' };

export default async function MembersPage({ params }: { params: Promise<{ orgId: string }> }) {
  const { orgId } = await params;
  const { user, role, allowed } = await loadOrganization(orgId, 'members.read');
  if (!allowed)
    return (
      <main className="p-6">
        <Denied what="The member list" />
      </main>
    );
  const manage = can(role, 'members.manage');
  const [members, invites, requests] = await Promise.all([
    listMembers({ organizationId: orgId }),
    manage ? pendingInvitations(orgId) : [],
    manage ? listMembershipRequests({ organizationId: orgId }) : [],
  ]);
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <div className="mb-4 flex items-baseline justify-between">
        <h1>Members</h1>
        {can(role, 'org.settings') ? (
          <Link href={`/orgs/${orgId}/company-sign-in`}>Company sign-in settings</Link>
        ) : null}
      </div>
      {requests.length ? (
        <section className="panel mb-6 p-4" aria-label="Waiting for a role">
          <h2 className="mb-2">Waiting for a role ({requests.length})</h2>
          <ul className="space-y-2 text-sm">
            {requests.map((r) => (
              <li key={r.userId} className="flex flex-wrap items-center gap-2">
                <span>
                  {r.name} · {r.email}
                </span>
                <form action={approveRequestAction} className="flex items-center gap-1">
                  <input type="hidden" name="organizationId" value={orgId} />
                  <input type="hidden" name="userId" value={r.userId} />
                  <select
                    name="role"
                    aria-label={`Role for ${r.name}`}
                    className="input w-40 py-1"
                    defaultValue="engineer"
                  >
                    {ROLES.map((x) => (
                      <option key={x} value={x}>
                        {ROLE_LABEL[x]}
                      </option>
                    ))}
                  </select>
                  <button type="submit" className="btn-quiet py-1">
                    Approve
                  </button>
                </form>
                <form action={refuseRequestAction}>
                  <input type="hidden" name="organizationId" value={orgId} />
                  <input type="hidden" name="userId" value={r.userId} />
                  <button type="submit" className="btn-quiet py-1" aria-label={`Refuse ${r.name}`}>
                    Refuse
                  </button>
                </form>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <table className="table-dense panel">
        <thead>
          <tr>
            <th>Name</th>
            <th>E-mail</th>
            <th>Role</th>
            {manage ? <th>Change</th> : null}
          </tr>
        </thead>
        <tbody>
          {members.map((m) => (
            <tr key={m.userId}>
              <td>{m.name}</td>
              <td>{m.email}</td>
              <td>{ROLE_LABEL[m.role]}</td>
              {manage ? (
                <td>
                  {m.userId === user.id ? (
                    <span className="text-xs text-ink-500">you</span>
                  ) : (
                    <MemberRowActions
                      organizationId={orgId}
                      userId={m.userId}
                      role={m.role}
                      name={m.name}
                      changeRole={changeRoleAction}
                      remove={removeMemberAction}
                    />
                  )}
                </td>
              ) : null}
            </tr>
          ))}
        </tbody>
      </table>
      {manage ? (
        <div className="mt-6 grid gap-6 md:grid-cols-2">
          <section className="panel p-5">
            <h2 className="mb-3">Invite someone</h2>
            <SimpleForm
              action={inviteAction}
              schema="invite"
              submitLabel="Send invitation"
              hidden={{ organizationId: orgId }}
              successMessage="Invitation sent."
              fields={[
                { name: 'email', label: 'E-mail', type: 'email' },
                {
                  name: 'role',
                  label: 'Role',
                  type: 'select',
                  options: ROLES.map((r) => ({ value: r, label: ROLE_LABEL[r] })),
                },
              ]}
            />
          </section>
          <section className="panel p-5">
            <h2 className="mb-3">Open invitations</h2>
            {invites.length === 0 ? (
              <p className="text-sm text-ink-500">None.</p>
            ) : (
              <ul className="space-y-1 text-sm">
                {invites.map((i) => (
                  <li key={i.id}>
                    {i.email} · {ROLE_LABEL[i.role]} · expires {i.expiresAt.toISOString().slice(0, 10)}
                  </li>
                ))}
              </ul>
            )}
          </section>
        </div>
      ) : null}
    </main>
  );
}
