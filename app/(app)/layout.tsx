import Link from 'next/link';
import { requireUser } from '@/lib/auth/session';
import { listProjectsForUser } from '@/db/queries/projects';
import { LogoMark } from '@/components/logo';
import { ProjectSwitcher } from '@/components/project-switcher';
import { signOutAction } from '../(auth)/actions';
import { CurrentProject } from './current-project';
import { Providers } from '@/components/providers';

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const { user } = await requireUser();
  const projects = await listProjectsForUser({ userId: user.id });
  return (
    <div className="min-h-screen">
      <header className="flex h-12 items-center gap-4 bg-ink-900 px-4 text-ink-100">
        <Link href="/projects" className="flex items-center gap-2 text-ink-50 no-underline hover:text-white">
          <LogoMark size={22} />
          <span className="font-semibold">Lagwise</span>
        </Link>
        <CurrentProject>
          <ProjectSwitcher projects={projects} />
        </CurrentProject>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <span className="text-ink-300" data-testid="user-email">
            {user.email}
          </span>
          <Link href="/account" className="text-ink-200 hover:text-white">
            Account
          </Link>
          <form action={signOutAction}>
            <button
              type="submit"
              className="rounded border border-ink-600 px-2 py-0.5 text-ink-100 hover:bg-ink-800"
            >
              Sign out
            </button>
          </form>
        </div>
      </header>
      <Providers>{children}</Providers>
    </div>
  );
}
