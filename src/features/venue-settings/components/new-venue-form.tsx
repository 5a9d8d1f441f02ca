import { useId, useState } from 'react';
import { Link } from 'react-router-dom';
import type { FormEvent } from 'react';
import { demoHexapodBase, demoHexapodInput, demoPlanar3Base } from '../../../../shared/schemas/motion-base';
import { createVenueBody } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { TextField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { appPaths } from '../../../../shared/app-paths';
import { ApiRequestError } from '../../../lib/api-client';
import { useCreateVenue } from '../api/create-venue';
import { BaseJsonField, locateBaseIssues, readBaseJson } from './base-json-field';
import type { BaseIssue } from './base-json-field';

const EXAMPLES = {
  hexapodParametric: { label: 'Hexapod (parametric)', base: demoHexapodInput },
  hexapodJoints: { label: 'Hexapod (joints)', base: demoHexapodBase },
  planar3: { label: 'Planar stage', base: demoPlanar3Base },
} as const;
type ExampleKey = keyof typeof EXAMPLES;

const exampleText = (key: ExampleKey) => JSON.stringify(EXAMPLES[key].base, null, 2);
const VENUE_FIELDS = ['name', 'site', 'timeZone'] as const;
const venueFieldsBody = createVenueBody.omit({ base: true });

/**
 * Creates a venue (studio admins): name, site, IANA time zone and a starting motion base (an example,
 * or JSON pasted in, m and deg); the base is then fitted in the form on the venue's page.
 */
export function NewVenueForm({ studioId }: { studioId: string }) {
  const exampleId = useId();
  const [name, setName] = useState('');
  const [site, setSite] = useState('');
  const [timeZone, setTimeZone] = useState('UTC');
  const [example, setExample] = useState<ExampleKey>('hexapodParametric');
  const [text, setText] = useState(() => exampleText('hexapodParametric'));
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const [clientBaseIssue, setClientBaseIssue] = useState<BaseIssue | null>(null);
  const [sent, setSent] = useState<{ text: string; baseHasName: boolean }>({ text: '', baseHasName: false });
  const [created, setCreated] = useState<{ id: string; name: string } | null>(null);
  const [jsonOpen, setJsonOpen] = useState(false);
  const create = useCreateVenue(studioId);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setCreated(null);
    // The same schema the server applies to the venue fields, so those mistakes show before a round trip.
    const fields = venueFieldsBody.safeParse({ name, site, timeZone });
    const read = readBaseJson(text);
    setClientErrors(
      fields.success
        ? {}
        : issuesByField(fields.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }))),
    );
    setClientBaseIssue(read.ok ? null : read.issue);
    if (!fields.success || !read.ok) {
      create.reset();
      return;
    }
    const base = read.base;
    setSent({ text, baseHasName: typeof base === 'object' && base !== null && 'name' in base });
    create.mutate(
      { studioId, ...fields.data, base },
      {
        onSuccess: (venue) => {
          setCreated({ id: venue.id, name: venue.name });
          setName('');
          setSite('');
        },
      },
    );
  };

  // Venue field issues go beside their field; the rest name a path inside the base. A base may carry
  // its own "name", so that path stays with the base whenever the sent base had one.
  const fieldIssues: Record<string, string> = {};
  const baseIssues: BaseIssue[] = [];
  if (create.error instanceof ApiRequestError) {
    const rest: { path: string; message: string }[] = [];
    for (const issue of create.error.issues) {
      const top = issue.path.split(/[.[]/)[0] ?? '';
      const isField =
        (VENUE_FIELDS as readonly string[]).includes(top) && !(top === 'name' && sent.baseHasName);
      if (isField)
        fieldIssues[top] = fieldIssues[top] ? `${fieldIssues[top]}; ${issue.message}` : issue.message;
      else rest.push(issue);
    }
    baseIssues.push(...locateBaseIssues(sent.text, rest));
  }
  const errors = { ...fieldIssues, ...clientErrors };

  return (
    <form onSubmit={submit} noValidate aria-label="New venue" className="flex flex-col gap-3">
      {created ? (
        <div className="flex flex-col gap-1">
          <Notice>Venue {created.name} created.</Notice>
          <p className="text-sm">
            <Link to={appPaths.venue(studioId, created.id)} className="text-tealdeep-600 underline">
              Fit {created.name}&apos;s motion base in the form on its page
            </Link>{' '}
            <span className="text-xs text-ink-600">
              (layout or joints, leg limits, seats, payload, with the 3-D view and the workspace).
            </span>
          </p>
        </div>
      ) : null}
      {create.error ? <ErrorNotice error={create.error} /> : null}
      <div className="flex flex-wrap gap-3">
        <TextField
          label="Name"
          value={name}
          error={errors.name}
          onChange={(event) => setName(event.target.value)}
          className="min-w-64"
        />
        <TextField
          label="Site"
          value={site}
          error={errors.site}
          onChange={(event) => setSite(event.target.value)}
          className="min-w-64"
        />
        <TextField
          label="Time zone"
          value={timeZone}
          error={errors.timeZone}
          hint="IANA name, e.g. Europe/Lisbon"
          onChange={(event) => setTimeZone(event.target.value)}
          className="min-w-48"
        />
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor={exampleId} className="text-xs font-medium text-ink-600">
          Start from an example
        </label>
        <select
          id={exampleId}
          value={example}
          onChange={(event) => {
            const key = event.target.value as ExampleKey;
            setExample(key);
            setText(exampleText(key));
            setClientBaseIssue(null);
          }}
          className="max-w-xs rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
        >
          {(Object.keys(EXAMPLES) as ExampleKey[]).map((key) => (
            <option key={key} value={key}>
              {EXAMPLES[key].label}
            </option>
          ))}
        </select>
      </div>
      <p className="text-xs text-ink-600">
        The venue starts with the chosen example base; after creating it, fit the base to the machine in the
        form on the venue&apos;s page. A base written elsewhere can be pasted as JSON here instead.
      </p>
      <details
        className="rounded border border-ink-200 bg-white px-3 py-2"
        open={jsonOpen || clientBaseIssue !== null || baseIssues.length > 0}
        onToggle={(event) => setJsonOpen(event.currentTarget.open)}
      >
        <summary className="cursor-pointer text-sm font-medium text-ink-800">
          Motion base as JSON (import): {EXAMPLES[example].label}
          {text !== exampleText(example) ? ', edited' : ''}
        </summary>
        <div className="pt-2">
          <BaseJsonField
            label="Motion base (JSON)"
            value={text}
            onChange={setText}
            issues={clientBaseIssue ? [clientBaseIssue] : baseIssues}
          />
        </div>
      </details>
      <div>
        <Button type="submit" variant="primary" busy={create.isPending}>
          Create
        </Button>
      </div>
      <p className="text-xs text-ink-400">
        The examples are fictional demo bases; enter the geometry and limits from the ride manufacturer.
        Legwork supports, and never replaces, the manufacturer&apos;s engineering, the applicable codes and a
        qualified person&apos;s sign-off.
      </p>
    </form>
  );
}
