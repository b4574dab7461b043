import { loadProject } from '@/lib/server/page';
import { EmptyState } from '@/components/empty-state';
import { Denied } from '@/components/denied';

export const metadata = { title: 'Safety review' };

export default async function Page({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { allowed } = await loadProject(projectId, 'review.read');
  return (
    <>
      <h1 className="mb-4">Safety review</h1>
      {allowed ? (
        <EmptyState title="Nothing to review yet" next="flags with the numbers behind them, dispositions, sign-off rounds and a printable report.">Surfaces that stay over the touch limit or sweat below the dew point will be listed here for the safety reviewer, once lines are solved.</EmptyState>
      ) : <Denied what="Safety review" />}
    </>
  );
}
