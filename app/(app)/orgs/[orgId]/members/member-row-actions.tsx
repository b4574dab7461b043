'use client';
import { useActionState } from 'react';
import { ROLE_LABEL, ROLES } from '@/lib/auth/permissions';
import type { Role } from '@/db/schema';

type Act = (
  prev: unknown,
  fd: FormData,
) => Promise<{ status?: string; error?: Record<string, string[] | null> | null } | undefined>;

export function MemberRowActions({
  organizationId,
  userId,
  role,
  changeRole,
  remove,
  name,
}: {
  organizationId: string;
  userId: string;
  role: Role;
  changeRole: Act;
  remove: Act;
  name: string;
}) {
  const [roleResult, roleAction, rolePending] = useActionState(changeRole, undefined);
  const [removeResult, removeAction, removePending] = useActionState(remove, undefined);
  const err = [roleResult, removeResult].flatMap((r) => Object.values(r?.error ?? {}).flat()).filter(Boolean);
  return (
    <div className="flex flex-wrap items-center gap-2">
      <form action={roleAction} className="flex items-center gap-1">
        <input type="hidden" name="organizationId" value={organizationId} />
        <input type="hidden" name="userId" value={userId} />
        <select name="role" defaultValue={role} aria-label={`Role of ${name}`} className="input w-40 py-1">
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </select>
        <button type="submit" className="btn-quiet py-1" disabled={rolePending}>
          Change
        </button>
      </form>
      <form
        action={removeAction}
        onSubmit={(e) => {
          if (!confirm(`Remove ${name} from the organization? Their sessions end at once.`))
            e.preventDefault();
        }}
      >
        <input type="hidden" name="organizationId" value={organizationId} />
        <input type="hidden" name="userId" value={userId} />
        <button type="submit" className="btn-danger py-1" disabled={removePending}>
          Remove
        </button>
      </form>
      {err.length ? (
        <span role="alert" className="text-xs text-alarm-700">
          {err.join(' ')}
        </span>
      ) : null}
    </div>
  );
}
