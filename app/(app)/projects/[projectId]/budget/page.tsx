import { loadProject } from '@/lib/server/page';
import { EmptyState } from '@/components/empty-state';
import { Denied } from '@/components/denied';

export const metadata = { title: 'Heat-loss budget' };

export default async function Page({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { allowed } = await loadProject(projectId, 'budget.read');
  return (
    <>
      <h1 className="mb-4">Heat-loss budget</h1>
      {allowed ? (
        <EmptyState title="No budget set" next="per-area allocation, bare versus insulated totals and a what-if panel.">The plant's allowed heat loss (kW and MWh per year) by area, compared with the sum of the solved lines.</EmptyState>
      ) : <Denied what="Heat-loss budget" />}
    </>
  );
}
