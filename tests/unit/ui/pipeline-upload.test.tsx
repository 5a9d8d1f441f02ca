// @vitest-environment jsdom
// Take upload against the API contract of POST /api/studios/:id/tracks/:trackId/takes: raw bytes as
// application/octet-stream with the CSRF header, the file name in the query; a refused file answers
// 400 `{ error, issues }` whose `error` names the line and column and is shown word for word.
import '@testing-library/jest-dom/vitest';
import { act, cleanup, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { UploadedTake } from '../../../shared/schemas/pipeline';
import { UploadTakeForm } from '../../../src/features/tracks/components/upload-take-form';
import { fakeApi, renderWithApp } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const TRACK = '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e';

/** Records what the form sends and lets the test play the server's part, event by event. */
class FakeXhr {
  static sent: FakeXhr[] = [];
  method = '';
  url = '';
  headers: Record<string, string> = {};
  withCredentials = false;
  body: unknown = null;
  status = 0;
  responseText = '';
  upload: {
    onprogress: ((event: { lengthComputable: boolean; loaded: number; total: number }) => void) | null;
  } = {
    onprogress: null,
  };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name.toLowerCase()] = value;
  }
  send(body: unknown) {
    this.body = body;
    FakeXhr.sent.push(this);
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ lengthComputable: true, loaded, total });
  }
  respond(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

beforeEach(() => {
  FakeXhr.sent = [];
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function chooseFile(name: string, text: string): File {
  const file = new File([text], name, { type: 'text/csv' });
  fireEvent.change(screen.getByLabelText('Take file (.csv or .csv.gz)'), { target: { files: [file] } });
  return file;
}

async function sentRequest(): Promise<FakeXhr> {
  await waitFor(() => expect(FakeXhr.sent).toHaveLength(1));
  return FakeXhr.sent[0]!;
}

function storedTake(overrides: Partial<UploadedTake> = {}): UploadedTake {
  return {
    id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
    trackId: TRACK,
    number: 1,
    kind: 'vehicle',
    layout: 'vehicle',
    fileName: 'gentle surge.csv',
    sizeBytes: 2048,
    sha256: 'a'.repeat(64),
    samples: 2001,
    duration_s: 20,
    uploadedVia: 'browser',
    filmSync: null,
    createdAt: '2026-12-01T10:00:00.000Z',
    duplicateOf: null,
    ...overrides,
  };
}

describe('take upload form', () => {
  it("shows the server's 400 message verbatim, with the line and column it names", async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('shaky.csv', 'time_s,fx_mps2\n0,abc\n');
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();

    const message = 'shaky.csv line 12, column 3 (fz_mps2): not a number: "abc"';
    act(() =>
      xhr.respond(400, {
        error: message,
        issues: [{ path: 'line 12, column 3', message: 'not a number: "abc"' }],
      }),
    );
    expect(await screen.findByRole('alert')).toHaveTextContent(message);
    expect(screen.getByRole('alert').textContent).toBe(message);
  });

  it('sends the raw file with the CSRF header and the file name, and shows the bytes sent as progress', async () => {
    const { csrfIssued } = fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    const file = chooseFile(
      'gentle surge.csv',
      'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps\n',
    );
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();

    expect(xhr.method).toBe('POST');
    const url = new URL(xhr.url, 'http://legwork.test');
    expect(url.pathname).toBe(`/api/studios/${STUDIO}/tracks/${TRACK}/takes`);
    expect(url.searchParams.get('fileName')).toBe('gentle surge.csv');
    expect(xhr.headers['content-type']).toBe('application/octet-stream');
    expect(xhr.headers['x-csrf-token']).toBe(csrfIssued.at(-1));
    expect(xhr.body).toBe(file);

    act(() => xhr.progress(512, 2048));
    expect(screen.getByRole('progressbar', { name: 'Upload progress' })).toHaveAttribute(
      'aria-valuenow',
      '25',
    );
    act(() => xhr.progress(2048, 2048));
    expect(screen.getByRole('progressbar', { name: 'Upload progress' })).toHaveAttribute(
      'aria-valuenow',
      '100',
    );
    expect(screen.getByText('Checking the file on the server…')).toBeInTheDocument();

    const take = storedTake();
    act(() => xhr.respond(201, take));
    expect(await screen.findByText('Take 1 stored: gentle surge.csv, 2001 samples.')).toBeInTheDocument();
    expect(screen.queryByText(/identical to take/)).toBeNull();
  });

  it('warns when the stored file is identical to an earlier take, and keeps the new take', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('gentle surge.csv', 'time_s');
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();
    const take = storedTake({
      id: '3c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
      number: 2,
      createdAt: '2026-12-01T10:05:00.000Z',
      duplicateOf: { id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', number: 1 },
    });
    act(() => xhr.respond(201, take));
    expect(await screen.findByText('Take 2 stored: gentle surge.csv, 2001 samples.')).toBeInTheDocument();
    expect(screen.getByText(/identical to take 1 \(same SHA-256\)/)).toBeInTheDocument();
  });

  it('names the size limit on a 413 without a JSON body', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('huge.csv.gz', 'x');
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();
    act(() => {
      xhr.status = 413;
      xhr.responseText = '<html>Payload Too Large</html>';
      xhr.onload?.();
    });
    expect(await screen.findByRole('alert')).toHaveTextContent(
      'huge.csv.gz is larger than the server accepts.',
    );
  });

  it('asks for a file before sending anything', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    expect(await screen.findByText('Choose a take file first.')).toBeInTheDocument();
    expect(FakeXhr.sent).toHaveLength(0);
  });
});

describe('film sync fields of the upload', () => {
  it('refuses a drop-frame label that does not exist before sending anything, naming the field', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('glide.csv', 'time_s,fx_mps2\n');
    fireEvent.change(screen.getByLabelText('Film frame rate'), { target: { value: '29.97df' } });
    // SMPTE ST 12-1 drop-frame: labels ;00 and ;01 are skipped at the start of minute 1.
    fireEvent.change(screen.getByLabelText('Start timecode'), { target: { value: '00:01:00;00' } });
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    expect(
      await screen.findByText(/Start timecode: .*skipped at the start of minute 01/),
    ).toBeInTheDocument();
    expect(screen.getByLabelText('Start timecode')).toHaveAttribute('aria-invalid', 'true');
    expect(FakeXhr.sent).toHaveLength(0);
  });

  it('sends the frame rate, start timecode and offset in the query', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('glide.csv', 'time_s,fx_mps2\n');
    fireEvent.change(screen.getByLabelText('Film frame rate'), { target: { value: '29.97df' } });
    fireEvent.change(screen.getByLabelText('Start timecode'), { target: { value: '01:00:00;00' } });
    fireEvent.change(screen.getByLabelText('Motion offset (frames)'), { target: { value: '-3' } });
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();
    const url = new URL(xhr.url, 'http://legwork.test');
    expect(url.searchParams.get('frameRate')).toBe('29.97df');
    expect(url.searchParams.get('startTimecode')).toBe('01:00:00;00');
    expect(url.searchParams.get('offset_frames')).toBe('-3');
  });

  it('sends no film sync fields when no frame rate is chosen', async () => {
    fakeApi({});
    renderWithApp(<UploadTakeForm studioId={STUDIO} trackId={TRACK} />);
    chooseFile('glide.csv', 'time_s,fx_mps2\n');
    fireEvent.click(screen.getByRole('button', { name: 'Upload take' }));
    const xhr = await sentRequest();
    const url = new URL(xhr.url, 'http://legwork.test');
    expect([...url.searchParams.keys()]).toEqual(['fileName']);
  });
});
