import { useState } from 'react';
import { DEMO_BUDGET } from '../../../../shared/schemas/budget';
import { DEFAULT_CUEING_PROFILE } from '../../../../shared/schemas/cueing-profile';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useProfiles } from '../../../lib/queries/profiles';
import { BudgetEditor } from './budget-editor';
import { CueingProfileEditor } from './cueing-profile-editor';

const KIND_TEXT = {
  cueing: {
    defaults: 'Classical washout defaults: common practice for ride bases of this size, not a standard.',
    starter: DEFAULT_CUEING_PROFILE as unknown,
  },
  budget: {
    defaults:
      "Demo budget: invented numbers for trying Legwork, not from any standard or code. A venue's budget comes from its safety engineering and the code that applies.",
    starter: DEMO_BUDGET as unknown,
  },
} as const;

function latestParams(profile: Profile): unknown {
  const latest = [...profile.versions].sort((a, b) => b.version - a.version)[0];
  return latest?.params ?? null;
}

function ProfileBlock({
  studioId,
  profile,
  canWrite,
}: {
  studioId: string;
  profile: Profile;
  canWrite: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const versions = [...profile.versions].sort((a, b) => b.version - a.version);
  return (
    <div className="flex flex-col gap-2">
      <div className="flex items-center justify-between gap-3">
        <h3 className="text-sm font-medium text-ink-900">{profile.name}</h3>
        {canWrite && !editing ? (
          <Button size="sm" onClick={() => setEditing(true)} aria-label={`New version of ${profile.name}`}>
            New version
          </Button>
        ) : null}
      </div>
      <Table caption={`Versions of ${profile.name}`}>
        <thead>
          <tr>
            <Th className="text-right">Version</Th>
            <Th>Note</Th>
            <Th>Used by a run</Th>
            <Th>Created</Th>
          </tr>
        </thead>
        <tbody>
          {versions.map((version) => (
            <tr key={version.id}>
              <Td className="text-right font-mono">v{version.version}</Td>
              <Td className="text-ink-800">{version.note || <span className="text-ink-400">—</span>}</Td>
              <Td className="text-xs">
                {version.used ? (
                  <span title="A run used this version, so it can no longer change">yes (frozen)</span>
                ) : (
                  <span className="text-ink-400">not yet</span>
                )}
              </Td>
              <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(version.createdAt)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {editing ? (
        <div className="rounded border border-ink-200 bg-ink-50 p-3">
          <p className="mb-2 text-xs text-ink-600">
            Prefilled from v{versions[0]?.version ?? '—'}. Saving always makes a new version; runs keep the
            versions they used.
          </p>
          {profile.kind === 'budget' ? (
            <BudgetEditor
              studioId={studioId}
              profile={profile}
              initialParams={latestParams(profile)}
              onDone={() => setEditing(false)}
            />
          ) : (
            <CueingProfileEditor
              studioId={studioId}
              profile={profile}
              initialParams={latestParams(profile)}
              onDone={() => setEditing(false)}
            />
          )}
        </div>
      ) : null}
    </div>
  );
}

/** The studio's profiles of one kind with their versions; writers get "new version" and "new profile" forms. */
export function ProfilesList({
  studioId,
  kind,
  canWrite,
}: {
  studioId: string;
  kind: Profile['kind'];
  canWrite: boolean;
}) {
  const profiles = useProfiles(studioId, kind);
  const [creating, setCreating] = useState(false);
  return (
    <div className="flex flex-col gap-4">
      <p className="text-xs text-ink-600">{KIND_TEXT[kind].defaults}</p>
      {profiles.isPending ? <Loading what="Loading profiles" /> : null}
      {profiles.isError ? <ErrorNotice error={profiles.error} retry={() => void profiles.refetch()} /> : null}
      {profiles.data && profiles.data.length === 0 ? <Empty>No {kind} profiles yet.</Empty> : null}
      {profiles.data?.map((profile) => (
        <ProfileBlock key={profile.id} studioId={studioId} profile={profile} canWrite={canWrite} />
      ))}
      {canWrite ? (
        creating ? (
          <div className="rounded border border-ink-200 bg-ink-50 p-3">
            {kind === 'budget' ? (
              <BudgetEditor
                studioId={studioId}
                initialParams={KIND_TEXT.budget.starter}
                onDone={() => setCreating(false)}
              />
            ) : (
              <CueingProfileEditor
                studioId={studioId}
                initialParams={KIND_TEXT.cueing.starter}
                onDone={() => setCreating(false)}
              />
            )}
          </div>
        ) : (
          <div>
            <Button size="sm" onClick={() => setCreating(true)}>
              New {kind} profile
            </Button>
          </div>
        )
      ) : (
        <p className="text-xs text-ink-400">
          {kind === 'cueing' ? 'Motion engineers' : 'Safety reviewers'} edit these profiles.
        </p>
      )}
    </div>
  );
}
