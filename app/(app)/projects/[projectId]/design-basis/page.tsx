import { loadProject } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { getDesignBasis } from '@/lib/lines/store';
import { DEFAULT_BASIS_NOTES } from '@/lib/lines/design-basis';
import { JACKETS, MATERIALS } from '@/lib/thermal/materials';
import { BasisForm } from './basis-form';

export const metadata = { title: 'Design basis' };

export default async function DesignBasisPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'lines.read');
  if (!allowed) return <><h1 className="mb-4">Design basis</h1><Denied what="The design basis" /></>;
  const { basis, revision } = await getDesignBasis({ projectId: project.id });
  return (
    <>
      <div className="mb-3 flex items-baseline justify-between"><h1>Design basis</h1><span className="text-xs text-ink-500" data-testid="basis-revision">Revision {revision}</span></div>
      <p className="mb-4 max-w-3xl text-sm text-ink-600">Each criterion is checked under its own conditions, outdoors and indoors. Changing anything here marks every line solved under the previous revision as stale until it is solved again. Defaults are starting points; their sources are given beside them.</p>
      <BasisForm projectId={project.id} basis={basis} canEdit={can(role, 'designBasis.edit')} notes={DEFAULT_BASIS_NOTES}
        materials={MATERIALS.map((m) => ({ id: m.id, name: m.name }))} jackets={JACKETS.map((j) => ({ id: j.id, name: j.name }))} />
    </>
  );
}
