import { loadProject } from '@/lib/server/page';
import { EmptyState } from '@/components/empty-state';
import { Denied } from '@/components/denied';

export const metadata = { title: 'Design basis' };

export default async function Page({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { allowed } = await loadProject(projectId, 'lines.read');
  return (
    <>
      <h1 className="mb-4">Design basis</h1>
      {allowed ? (
        <EmptyState title="Defaults in force" next="condition sets per criterion, material systems per temperature band, thickness series and economics.">The project uses common-practice defaults for now: 60 °C touch limit for personnel protection, a 2 K dew-point margin for cold service, still air for the touch check. Editing them per project comes with the line list.</EmptyState>
      ) : <Denied what="Design basis" />}
    </>
  );
}
