import 'server-only';
import { and, asc, eq } from 'drizzle-orm';
import { db } from '@/db/client';
import { memberships, organizations, projects, users, type Role } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { can, type Action } from '@/lib/auth/permissions';

export async function listOrganizationsForUser({ userId }: { userId: string }) {
  return db
    .select({ id: organizations.id, name: organizations.name, role: memberships.role })
    .from(memberships)
    .innerJoin(organizations, eq(organizations.id, memberships.organizationId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(organizations.name));
}

export async function listProjectsForUser({ userId }: { userId: string }) {
  return db
    .select({
      id: projects.id,
      code: projects.code,
      name: projects.name,
      site: projects.site,
      organizationId: organizations.id,
      organizationName: organizations.name,
      role: memberships.role,
    })
    .from(projects)
    .innerJoin(
      memberships,
      and(eq(memberships.organizationId, projects.organizationId), eq(memberships.userId, userId)),
    )
    .innerJoin(organizations, eq(organizations.id, projects.organizationId))
    .orderBy(asc(organizations.name), asc(projects.code));
}

export async function getMembershipRole({
  userId,
  organizationId,
}: {
  userId: string;
  organizationId: string;
}): Promise<Role | null> {
  const [m] = await db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.organizationId, organizationId)));
  return m?.role ?? null;
}

/**
 * The project and the user's role in its organization. A project of an organization the user
 * does not belong to is reported as not found, never as forbidden, so ids reveal nothing.
 */
export async function getProjectAccess({
  userId,
  projectId,
  action,
}: {
  userId: string;
  projectId: string;
  action?: Action;
}) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(projectId))
    throw new AppError('not_found');
  const [row] = await db
    .select({ project: projects, role: memberships.role, organizationName: organizations.name })
    .from(projects)
    .innerJoin(
      memberships,
      and(eq(memberships.organizationId, projects.organizationId), eq(memberships.userId, userId)),
    )
    .innerJoin(organizations, eq(organizations.id, projects.organizationId))
    .where(eq(projects.id, projectId));
  if (!row) throw new AppError('not_found');
  if (action && !can(row.role, action)) throw new AppError('forbidden');
  return row;
}

/**
 * The user's role in an organization, for organization pages and actions. Not a member: not found
 * (like foreign projects); a member whose role may not do `action`: forbidden.
 */
export async function getOrganizationAccess({
  userId,
  organizationId,
  action,
}: {
  userId: string;
  organizationId: string;
  action?: Action;
}) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(organizationId))
    throw new AppError('not_found');
  const role = await getMembershipRole({ userId, organizationId });
  if (!role) throw new AppError('not_found');
  if (action && !can(role, action)) throw new AppError('forbidden');
  return { role };
}

export async function createProject({
  organizationId,
  code,
  name,
  site,
}: {
  organizationId: string;
  code: string;
  name: string;
  site: string;
}) {
  const [p] = await db
    .insert(projects)
    .values({ organizationId, code, name, site })
    .returning()
    .catch((e) => {
      if (String(e?.cause?.code ?? e?.code) === '23505')
        throw new AppError('conflict', 'A project with this code exists.', {
          code: ['This code is already used in the organization.'],
        });
      throw e;
    });
  return p;
}

export async function listMembers({ organizationId }: { organizationId: string }) {
  return db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      since: memberships.createdAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.organizationId, organizationId))
    .orderBy(asc(users.name));
}
