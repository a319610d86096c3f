/**
 * The Studio workbench for one scenario: loads the scenario and the version to
 * open (the latest unless another is chosen), then hands them to the editor.
 */
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api, describeError } from '../../../lib/client/api';
import type { Scenario, ScenarioFault } from '../../../lib/scenario';
import type { VersionSummary } from '../../../lib/studio/library';
import { FormMessage } from '../../ui/Field';
import { withQueryClient } from '../../ui/QueryRoot';
import { Editor } from './Editor';

export type ScenarioInfo = { id: string; title: string; ownerName: string; archived: boolean; updatedAt: string; canEdit: boolean };
export type Detail = { scenario: ScenarioInfo; versions: VersionSummary[] };
export type VersionView = { version: VersionSummary; latest: boolean; document: Scenario; faults: ScenarioFault[]; ladderDraft: unknown };

function WorkbenchIsland({ scenarioId }: { scenarioId: string }) {
  const queries = useQueryClient();
  const [opened, setOpened] = useState<string | null>(null);
  const detail = useQuery({ queryKey: ['scenario', scenarioId], queryFn: () => api<Detail>(`/api/scenarios/${scenarioId}`) });
  const versionId = opened ?? detail.data?.versions[0]?.id ?? null;
  const view = useQuery({
    queryKey: ['version', versionId],
    queryFn: () => api<VersionView>(`/api/scenarios/${scenarioId}/versions/${versionId}`),
    enabled: versionId !== null,
    staleTime: Infinity,
  });
  const error = detail.error ?? view.error;
  if (error) return <FormMessage tone="error">{describeError(error)}</FormMessage>;
  if (!detail.data || !view.data) {
    return (
      <p className="text-sm text-ink-600" role="status">
        Opening the scenario…
      </p>
    );
  }
  return (
    <Editor
      key={view.data.version.id}
      scenarioId={scenarioId}
      detail={detail.data}
      view={view.data}
      openVersion={(id) => {
        void queries.invalidateQueries({ queryKey: ['version', id] });
        setOpened(id);
      }}
      refreshDetail={() => void queries.invalidateQueries({ queryKey: ['scenario', scenarioId] })}
    />
  );
}

export default withQueryClient(WorkbenchIsland);
