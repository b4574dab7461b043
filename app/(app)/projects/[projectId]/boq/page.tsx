import { loadProject } from '@/lib/server/page';
import { EmptyState } from '@/components/empty-state';
import { Denied } from '@/components/denied';

export const metadata = { title: 'Bill of quantities' };

export default async function Page({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { allowed } = await loadProject(projectId, 'boq.read');
  return (
    <>
      <h1 className="mb-4">Bill of quantities</h1>
      {allowed ? (
        <EmptyState title="No bill issued yet" next="issued revisions as spreadsheets, with the change from the previous issue.">The contractor's bill lists lengths, areas and volumes per material, size and thickness. Nothing has been issued for this project yet.</EmptyState>
      ) : <Denied what="Bill of quantities" />}
    </>
  );
}
