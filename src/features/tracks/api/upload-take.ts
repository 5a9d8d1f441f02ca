// Take upload streams the raw file bytes in one request. XMLHttpRequest is used instead of fetch
// because only its upload events report how many bytes have left the browser.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiErrorSchema } from '../../../../shared/schemas/api';
import { uploadedTakeSchema } from '../../../../shared/schemas/pipeline';
import type { UploadedTake } from '../../../../shared/schemas/pipeline';
import { ApiRequestError, refreshCsrfToken } from '../../../lib/api-client';
import { tracksQueryKey } from './get-tracks';

export interface UploadTakeInput {
  studioId: string;
  trackId: string;
  file: File;
  /** Film sync fields as typed (frame rate id, start timecode, offset in frames); empty ones are left out. */
  filmSync?: { frameRate: string; startTimecode: string; offset_frames: string };
  /** Called with the fraction of the file sent so far, 0 to 1. */
  onProgress?: (fraction: number) => void;
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

/** Sends a take file (.csv or .csv.gz) to the track; the server checks it and names any bad line and column. */
export async function uploadTake({
  studioId,
  trackId,
  file,
  filmSync,
  onProgress,
}: UploadTakeInput): Promise<UploadedTake> {
  const query = new URLSearchParams({ fileName: file.name });
  if (filmSync?.frameRate) {
    query.set('frameRate', filmSync.frameRate);
    if (filmSync.startTimecode.trim()) query.set('startTimecode', filmSync.startTimecode.trim());
    if (filmSync.offset_frames.trim()) query.set('offset_frames', filmSync.offset_frames.trim());
  }
  const path =
    `/api/studios/${encodeURIComponent(studioId)}/tracks/${encodeURIComponent(trackId)}/takes` +
    `?${query.toString()}`;
  // The session's token, fetched through the shared client so later JSON calls reuse it.
  const csrfToken = await refreshCsrfToken();
  return new Promise<UploadedTake>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader('content-type', 'application/octet-stream');
    xhr.setRequestHeader('accept', 'application/json');
    xhr.setRequestHeader('x-csrf-token', csrfToken);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress?.(event.loaded / event.total);
    };
    xhr.onerror = () =>
      reject(new ApiRequestError(0, `Could not reach the Legwork server while sending ${file.name}.`));
    xhr.onabort = () => reject(new ApiRequestError(0, `The upload of ${file.name} was stopped.`));
    xhr.onload = () => {
      const body = parseJson(xhr.responseText);
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = uploadedTakeSchema.safeParse(body);
        if (parsed.success) resolve(parsed.data);
        else
          reject(
            new ApiRequestError(
              xhr.status,
              `The server's answer to the upload of ${file.name} was not understood.`,
            ),
          );
        return;
      }
      const error = apiErrorSchema.safeParse(body);
      if (error.success) {
        reject(new ApiRequestError(xhr.status, error.data.error, error.data.issues ?? []));
      } else if (xhr.status === 413) {
        reject(new ApiRequestError(413, `${file.name} is larger than the server accepts.`));
      } else {
        reject(
          new ApiRequestError(xhr.status, `The server answered ${xhr.status} to the upload of ${file.name}.`),
        );
      }
    };
    xhr.send(file);
  });
}

export function useUploadTake(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadTake,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tracksQueryKey(studioId) }),
  });
}
