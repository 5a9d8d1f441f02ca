import { Link } from 'react-router-dom';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import { RunStateBadge } from '../../../components/charts/run-badges';
import { appPaths } from '../../../../shared/app-paths';
import { runStyle } from '../utils/run-styles';
import { runLetter, touchupWords, verdictWords, versionWords } from '../utils/run-identity';

/** One card per compared run: its letter, colour and dash, and what it was made with. */
export function CompareHeader({ studioId, runs }: { studioId: string; runs: readonly RunDetail[] }) {
  return (
    <ul aria-label="Compared runs" className="grid grid-cols-1 gap-3 md:grid-cols-2 xl:grid-cols-4">
      {runs.map((run, k) => {
        const style = runStyle(k);
        return (
          <li
            key={run.id}
            aria-label={`${runLetter(k)}: take ${run.take.number} at ${run.venueName}`}
            className="flex flex-col gap-1 rounded border border-ink-200 bg-white px-3 py-2 text-xs text-ink-800"
            style={{ borderTop: `4px solid ${style.color}` }}
          >
            <span className="flex items-center gap-2">
              <svg aria-hidden="true" width="28" height="8" className="shrink-0">
                <line
                  x1="0"
                  y1="4"
                  x2="28"
                  y2="4"
                  stroke={style.color}
                  strokeWidth="2.5"
                  strokeDasharray={style.dash.join(' ')}
                />
              </svg>
              <span className="text-sm font-semibold">{runLetter(k)}</span>
              <span className="sr-only">({style.dashName} line)</span>
              <RunStateBadge state={run.state} />
            </span>
            <span>
              Take {run.take.number} at <span className="font-medium">{run.venueName}</span>
            </span>
            <dl className="grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5">
              <dt className="text-ink-600">Cueing</dt>
              <dd>{versionWords(run.cueingVersion)}</dd>
              <dt className="text-ink-600">Budget</dt>
              <dd>
                {versionWords(run.budgetVersion)}
                {run.budgetIsDemo ? <span className="ml-1 font-semibold text-signal-600">DEMO</span> : null}
              </dd>
              {run.params.filmOffset_frames !== undefined ? (
                <>
                  <dt className="text-ink-600">Film offset</dt>
                  <dd>{run.params.filmOffset_frames} frames</dd>
                </>
              ) : null}
              <dt className="text-ink-600">Touch-up</dt>
              <dd>{run.params.touchup ? touchupWords(run.params.touchup) : 'none'}</dd>
              <dt className="text-ink-600">Verdict</dt>
              <dd
                className={
                  run.result
                    ? run.result.within
                      ? 'font-medium text-tealdeep-700'
                      : 'font-medium text-stop-700'
                    : ''
                }
              >
                {verdictWords(run)}
              </dd>
            </dl>
            <Link to={appPaths.run(studioId, run.id)} className="text-tealdeep-600 underline">
              Open {runLetter(k)}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
