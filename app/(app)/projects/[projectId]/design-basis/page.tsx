import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { DEFAULT_BASIS_NOTES } from '@/lib/lines/design-basis';
import { catalogueOf } from '@/lib/lines/catalogue';
import { BasisForm } from './basis-form';
import { OwnCatalogue } from './own-catalogue';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Design basis', 'lines.read') };
}

export default async function DesignBasisPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'lines.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Design basis</h1>
        <Denied what="The design basis" />
      </>
    );
  const { basis, revision } = await getDesignBasis({ projectId: project.id });
  const cat = catalogueOf(basis);
  const canEdit = can(role, 'designBasis.edit');
  const label = (id: string, name: string) => (cat.own.has(id) ? `${name} (project)` : name);
  return (
    <>
      <div className="mb-3 flex items-baseline justify-between">
        <h1>Design basis</h1>
        <span className="text-xs text-ink-500" data-testid="basis-revision">
          Revision {revision}
        </span>
      </div>
      <p className="mb-4 max-w-3xl text-sm text-ink-600">
        Each criterion is checked under its own conditions, outdoors and indoors. Changing anything here marks
        every line solved under the previous revision as stale until it is solved again. Defaults are starting
        points; their sources are given beside them.
      </p>
      <BasisForm
        projectId={project.id}
        basis={basis}
        canEdit={canEdit}
        notes={DEFAULT_BASIS_NOTES}
        materials={[...cat.materials.values()].map((m) => ({ id: m.id, name: label(m.id, m.name) }))}
        jackets={[...cat.jackets.values()].map((j) => ({ id: j.id, name: label(j.id, j.name) }))}
      />
      <OwnCatalogue
        projectId={project.id}
        materials={basis.ownMaterials}
        jackets={basis.ownJackets}
        prices={basis.prices.materialPerM3}
        canEdit={canEdit}
        note={DEFAULT_BASIS_NOTES.own}
      />
    </>
  );
}
