import { loadProject } from '@/lib/server/page';
import { EmptyState } from '@/components/empty-state';
import { Denied } from '@/components/denied';

export const metadata = { title: 'Line list' };

export default async function Page({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { allowed } = await loadProject(projectId, 'lines.read');
  return (
    <>
      <h1 className="mb-4">Line list</h1>
      {allowed ? (
        <EmptyState title="No lines yet" next="spreadsheet upload with column mapping, a solved thickness per line and the criterion that governs it.">Every hot and cold line and vessel of the project, solved for the thickness each needs. Until the spreadsheet upload arrives, engineers can already check single cases through the calculation API (POST /api/v1/calc).</EmptyState>
      ) : <Denied what="Line list" />}
    </>
  );
}
