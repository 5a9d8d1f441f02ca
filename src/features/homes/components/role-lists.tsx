// What each role must do next, as lists on their home: the reviewer's queue, the producer's
// attention list, the motion engineer's held runs and the venue operator's releases.
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import type { HomeRun } from '../../../../shared/schemas/homes';
import type { Release } from '../../../../shared/schemas/release';
import { DownloadLink, OperatorActions } from '../../../components/releases/operator-actions';
import { ReleaseStateBadge } from '../../../components/releases/release-badge';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatVenueTime } from '../../../lib/format';
import { useCreateRelease } from '../../../lib/queries/releases';
import { useVenues } from '../../../lib/queries/venues';
import { useHome } from '../api/get-homes';
import { HomeRunsTable } from './home-runs-table';

function Sub({ children }: { children: string }) {
  return <h3 className="text-sm font-medium text-ink-800">{children}</h3>;
}

/** The reviewer's queue: runs awaiting review or held by budget, worst findings first (server order). */
export function ReviewQueueList({ studioId }: { studioId: string }) {
  const home = useHome(studioId, 'review');
  const venues = useVenues(studioId);
  if (home.isPending) return <Loading what="Loading the review queue" />;
  if (home.isError) return <ErrorNotice error={home.error} retry={() => void home.refetch()} />;
  return home.data.runs.length === 0 ? (
    <Empty>Nothing waits for review.</Empty>
  ) : (
    <HomeRunsTable studioId={studioId} runs={home.data.runs} venues={venues.data} caption="Review queue" />
  );
}

/** The motion engineer's held runs to cue again. */
export function EngineerHeldList({ studioId }: { studioId: string }) {
  const home = useHome(studioId, 'engineer');
  const venues = useVenues(studioId);
  if (home.isPending) return <Loading what="Loading the held runs" />;
  if (home.isError) return <ErrorNotice error={home.error} retry={() => void home.refetch()} />;
  return (
    <>
      <Sub>Held runs to cue again</Sub>
      {home.data.held.length === 0 ? (
        <Empty>No held runs.</Empty>
      ) : (
        <HomeRunsTable
          studioId={studioId}
          runs={home.data.held}
          venues={venues.data}
          caption="Held runs to cue again"
        />
      )}
    </>
  );
}

function ReleaseButton({ studioId, run }: { studioId: string; run: HomeRun }) {
  const release = useCreateRelease(studioId);
  if (release.data) {
    return (
      <Link className="text-sm text-tealdeep-600 underline" to={appPaths.release(studioId, release.data.id)}>
        Building: open the release
      </Link>
    );
  }
  return (
    <div className="flex flex-col items-start gap-1">
      <Button
        size="sm"
        variant="primary"
        busy={release.isPending}
        aria-label={`Release ${run.trackTitle}, take ${run.takeNumber}, to ${run.venueName}`}
        onClick={() => release.mutate(run.id)}
      >
        Release
      </Button>
      {release.isError ? <span className="text-xs text-stop-700">{release.error.message}</span> : null}
    </div>
  );
}

function ReleaseRows({
  studioId,
  releases,
  caption,
  zoneOf,
  problemOf,
}: {
  studioId: string;
  releases: readonly Release[];
  caption: string;
  zoneOf: (venueId: string) => string | undefined;
  problemOf?: (index: number) => { text: string; by: string; at: string } | undefined;
}) {
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Release</Th>
          <Th>Venue</Th>
          <Th>State</Th>
          <Th>{problemOf ? 'Problem' : 'Released'}</Th>
        </tr>
      </thead>
      <tbody>
        {releases.map((release, index) => {
          const problem = problemOf?.(index);
          return (
            <tr key={`${release.id}-${index}`}>
              <Td>
                <Link className="text-tealdeep-600 underline" to={appPaths.release(studioId, release.id)}>
                  {release.trackTitle}, take {release.takeNumber}
                </Link>
              </Td>
              <Td>{release.venueName}</Td>
              <Td>
                <ReleaseStateBadge state={release.state} />
                {release.failureReason ? (
                  <span className="block text-xs text-stop-700">{release.failureReason}</span>
                ) : null}
              </Td>
              <Td className="text-xs">
                {problem ? (
                  <>
                    <span className="block whitespace-pre-wrap text-ink-800">{problem.text}</span>
                    <span className="text-ink-600">
                      {problem.by}, {formatVenueTime(problem.at, zoneOf(release.venueId))}
                    </span>
                  </>
                ) : (
                  <>
                    {formatVenueTime(release.releasedAt, zoneOf(release.venueId))}
                    {release.releasedBy ? ` by ${release.releasedBy.name}` : ''}
                  </>
                )}
              </Td>
            </tr>
          );
        })}
      </tbody>
    </Table>
  );
}

/** The producer's attention list: held runs, cleared runs to release, problems, releases in progress. */
export function ProducerAttention({ studioId }: { studioId: string }) {
  const home = useHome(studioId, 'producer');
  const venues = useVenues(studioId);
  if (home.isPending) return <Loading what="Loading what needs your attention" />;
  if (home.isError) return <ErrorNotice error={home.error} retry={() => void home.refetch()} />;
  const zoneOf = (id: string) => venues.data?.find((v) => v.id === id)?.timeZone;
  const { held, clearedNotReleased, problems, releasesInProgress } = home.data;
  return (
    <>
      <Sub>Cleared, not yet released</Sub>
      {clearedNotReleased.length === 0 ? (
        <Empty>No cleared run waits for release.</Empty>
      ) : (
        <HomeRunsTable
          studioId={studioId}
          runs={clearedNotReleased}
          venues={venues.data}
          caption="Cleared runs not yet released"
          action={(run) => <ReleaseButton studioId={studioId} run={run} />}
        />
      )}
      <Sub>Problems reported by venues</Sub>
      {problems.length === 0 ? (
        <Empty>No problems reported.</Empty>
      ) : (
        <ReleaseRows
          studioId={studioId}
          releases={problems.map((p) => p.release)}
          caption="Problems reported by venues"
          zoneOf={zoneOf}
          problemOf={(i) => {
            const p = problems[i]?.problem;
            return p ? { text: p.text, by: p.by.name, at: p.at } : undefined;
          }}
        />
      )}
      <Sub>Held runs</Sub>
      {held.length === 0 ? (
        <Empty>No held runs.</Empty>
      ) : (
        <HomeRunsTable studioId={studioId} runs={held} venues={venues.data} caption="Held runs" />
      )}
      <Sub>Packages building or failed</Sub>
      {releasesInProgress.length === 0 ? (
        <Empty>No package is building and none failed.</Empty>
      ) : (
        <ReleaseRows
          studioId={studioId}
          releases={releasesInProgress}
          caption="Packages building or failed"
          zoneOf={zoneOf}
        />
      )}
    </>
  );
}

function OperatorReleaseList({
  studioId,
  releases,
  caption,
  zoneOf,
  actions,
}: {
  studioId: string;
  releases: readonly Release[];
  caption: string;
  zoneOf: (venueId: string) => string | undefined;
  actions: boolean;
}) {
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Release</Th>
          <Th>Venue</Th>
          <Th>State</Th>
          <Th>Released</Th>
          {actions ? <Th>Package</Th> : <Th>Why</Th>}
        </tr>
      </thead>
      <tbody>
        {releases.map((release) => (
          <tr key={release.id}>
            <Td>
              <Link className="text-tealdeep-600 underline" to={appPaths.release(studioId, release.id)}>
                {release.trackTitle}, take {release.takeNumber}
              </Link>
            </Td>
            <Td>{release.venueName}</Td>
            <Td>
              <ReleaseStateBadge state={release.state} />
            </Td>
            <Td className="text-xs whitespace-nowrap">
              {formatVenueTime(release.releasedAt, zoneOf(release.venueId))}
            </Td>
            {actions ? (
              <Td>
                <div className="flex flex-col items-start gap-2">
                  <DownloadLink studioId={studioId} release={release} />
                  <OperatorActions studioId={studioId} release={release} />
                </div>
              </Td>
            ) : (
              <Td className="text-xs">
                {release.withdrawReason ?? ''}
                {release.withdrawnAt ? (
                  <span className="block text-ink-600">
                    {formatVenueTime(release.withdrawnAt, zoneOf(release.venueId))}
                  </span>
                ) : null}
              </Td>
            )}
          </tr>
        ))}
      </tbody>
    </Table>
  );
}

/** The venue operator's releases: new ones to load, installed ones, withdrawn ones. */
export function OperatorReleases({ studioId }: { studioId: string }) {
  const home = useHome(studioId, 'operator');
  const venues = useVenues(studioId);
  if (home.isPending) return <Loading what="Loading your venues' releases" />;
  if (home.isError) return <ErrorNotice error={home.error} retry={() => void home.refetch()} />;
  const zoneOf = (id: string) => venues.data?.find((v) => v.id === id)?.timeZone;
  return (
    <>
      <Sub>New releases</Sub>
      {home.data.new.length === 0 ? (
        <Empty>No new release for your venues.</Empty>
      ) : (
        <OperatorReleaseList
          studioId={studioId}
          releases={home.data.new}
          caption="New releases"
          zoneOf={zoneOf}
          actions
        />
      )}
      <Sub>Installed</Sub>
      {home.data.installed.length === 0 ? (
        <Empty>Nothing marked as installed yet.</Empty>
      ) : (
        <OperatorReleaseList
          studioId={studioId}
          releases={home.data.installed}
          caption="Installed releases"
          zoneOf={zoneOf}
          actions
        />
      )}
      <Sub>Withdrawn</Sub>
      {home.data.withdrawn.length === 0 ? (
        <Empty>No release of your venues was withdrawn.</Empty>
      ) : (
        <OperatorReleaseList
          studioId={studioId}
          releases={home.data.withdrawn}
          caption="Withdrawn releases"
          zoneOf={zoneOf}
          actions={false}
        />
      )}
    </>
  );
}
