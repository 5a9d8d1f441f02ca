import { useState } from 'react';
import type { FormEvent } from 'react';
import { createTokenBody } from '../../../../shared/schemas/pipeline';
import type { ApiToken } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/form';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useCreateToken } from '../api/create-token';
import type { CreatedToken } from '../api/create-token';
import { useTokens } from '../api/get-tokens';
import { useRevokeToken } from '../api/revoke-token';

/** The curl line a render farm runs to push a take with the token. */
export function curlExample(origin: string, studioId: string, token: string): string {
  return `curl -H "Authorization: Bearer ${token}" --data-binary @take.csv "${origin}/api/studios/${studioId}/tracks/<trackId>/takes?fileName=take.csv"`;
}

function CreatedTokenNotice({ studioId, created }: { studioId: string; created: CreatedToken }) {
  const origin = typeof window === 'undefined' ? '' : window.location.origin;
  return (
    <div
      role="status"
      className="flex flex-col gap-2 rounded border border-tealdeep-500 bg-white px-3 py-2 text-sm"
    >
      <p className="text-tealdeep-700">
        Token “{created.name}” created. Copy it now: Legwork keeps only its hash and will not show it again.
      </p>
      <code
        className="rounded bg-ink-50 px-2 py-1 font-mono text-xs break-all text-ink-900"
        aria-label="New API token"
      >
        {created.token}
      </code>
      <p className="text-xs text-ink-600">
        Push a take from a pipeline (replace &lt;trackId&gt; with the track’s id from its address):
      </p>
      <pre className="rounded bg-ink-900 px-2 py-1.5 font-mono text-xs break-all whitespace-pre-wrap text-ink-100">
        {curlExample(origin, studioId, created.token)}
      </pre>
    </div>
  );
}

function TokenRow({ studioId, token }: { studioId: string; token: ApiToken }) {
  const revoke = useRevokeToken(studioId);
  const [confirming, setConfirming] = useState(false);
  return (
    <tr>
      <Td className="font-medium">{token.name}</Td>
      <Td className="font-mono text-xs">{token.prefix}…</Td>
      <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(token.createdAt)}</Td>
      <Td className="text-xs whitespace-nowrap text-ink-600">
        {token.lastUsedAt ? formatDateTime(token.lastUsedAt) : 'never'}
      </Td>
      <Td className="text-right whitespace-nowrap">
        {token.revokedAt ? (
          <span className="text-xs text-ink-400">revoked {formatDateTime(token.revokedAt)}</span>
        ) : confirming ? (
          <span className="inline-flex gap-1">
            <Button
              size="sm"
              variant="danger"
              busy={revoke.isPending}
              onClick={() => revoke.mutate({ studioId, tokenId: token.id })}
            >
              Confirm revoke
            </Button>
            <Button size="sm" variant="quiet" onClick={() => setConfirming(false)}>
              Keep
            </Button>
          </span>
        ) : (
          <Button
            size="sm"
            variant="danger"
            onClick={() => setConfirming(true)}
            aria-label={`Revoke ${token.name}`}
          >
            Revoke
          </Button>
        )}
        {revoke.error ? <ErrorNotice error={revoke.error} /> : null}
      </Td>
    </tr>
  );
}

/** Create, list and revoke the studio's API tokens; a new token is shown once with a curl example. */
export function TokensPanel({ studioId }: { studioId: string }) {
  const tokens = useTokens(studioId);
  const create = useCreateToken(studioId);
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string | undefined>();
  const [created, setCreated] = useState<CreatedToken | null>(null);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = createTokenBody.safeParse({ name });
    if (!parsed.success) {
      setNameError(parsed.error.issues[0]?.message ?? 'required');
      return;
    }
    setNameError(undefined);
    setCreated(null);
    create.mutate(
      { studioId, name: parsed.data.name },
      {
        onSuccess: (token) => {
          setCreated(token);
          setName('');
        },
      },
    );
  };

  return (
    <div className="flex flex-col gap-4">
      <form
        onSubmit={submit}
        noValidate
        aria-label="Create an API token"
        className="flex flex-wrap items-start gap-3"
      >
        <TextField
          label="Token name (e.g. the render farm it is for)"
          value={name}
          error={nameError}
          onChange={(event) => setName(event.target.value)}
          className="w-80"
        />
        <Button type="submit" variant="primary" busy={create.isPending} className="mt-5">
          Create token
        </Button>
      </form>
      {create.error ? <ErrorNotice error={create.error} /> : null}
      {created ? <CreatedTokenNotice studioId={studioId} created={created} /> : null}
      {tokens.isPending ? <Loading what="Loading tokens" /> : null}
      {tokens.isError ? <ErrorNotice error={tokens.error} retry={() => void tokens.refetch()} /> : null}
      {tokens.data && tokens.data.length === 0 ? <Empty>No API tokens yet.</Empty> : null}
      {tokens.data && tokens.data.length > 0 ? (
        <Table caption="API tokens">
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>Starts with</Th>
              <Th>Created</Th>
              <Th>Last used</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {tokens.data.map((token) => (
              <TokenRow key={token.id} studioId={studioId} token={token} />
            ))}
          </tbody>
        </Table>
      ) : null}
    </div>
  );
}
