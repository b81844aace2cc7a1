// Photos of a build sheet. Uploads go through XMLHttpRequest, one file per request, because fetch
// reports no upload progress; the CSRF header and the one error shape are handled here as http.ts does.
import { http, UPLOAD_TIMEOUT_MS } from './http';
import { reportUnreachable } from './connection';
import { ApiError, apiErrorFromBody } from './errors';
import type { PhotoArea, PhotoWire, UpdatePhotoBody } from '@contracts/garage';

export type { PhotoArea, PhotoWire as Photo } from '@contracts/garage';
export { PHOTO_AREAS, PHOTO_LIMITS } from '@contracts/garage';

const sheetPhotos = (sheetId: string) => `/build-sheets/${encodeURIComponent(sheetId)}/photos`;
const photoPath = (photoId: string) => `/photos/${encodeURIComponent(photoId)}`;

/** The multipart field the server reads the file from. */
export const PHOTO_FIELD = 'photos';

export async function listPhotos(sheetId: string): Promise<PhotoWire[]> {
  return (await http.get<{ photos: PhotoWire[] }>(sheetPhotos(sheetId))).photos;
}

export async function updatePhoto(photoId: string, body: UpdatePhotoBody): Promise<PhotoWire> {
  return (await http.patch<{ photo: PhotoWire }>(photoPath(photoId), body)).photo;
}

export function deletePhoto(photoId: string): Promise<void> {
  return http.delete(photoPath(photoId));
}

export interface PhotoMeta {
  caption: string;
  memberId: string | null;
  area: PhotoArea | null;
}

export interface UploadHandle {
  done: Promise<PhotoWire>;
  abort(): void;
}

async function csrfToken(): Promise<string> {
  return (await http.get<{ token: string }>('/auth/csrf')).token;
}

function parse(text: string): unknown {
  try {
    return text ? (JSON.parse(text) as unknown) : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Sends one file with its caption and place; `onProgress` gets the fraction sent (0–1). Rejects with
 * an ApiError carrying the server's message, so each file can show its own refusal.
 */
export function uploadPhoto(
  sheetId: string,
  file: File,
  meta: PhotoMeta,
  onProgress: (fraction: number) => void,
  token: Promise<string> = csrfToken(),
): UploadHandle {
  const xhr = new XMLHttpRequest();
  const done = token.then(
    (csrf) =>
      new Promise<PhotoWire>((resolve, reject) => {
        const form = new FormData();
        form.append(PHOTO_FIELD, file, file.name);
        // The server takes several files with one caption/member/area each, in file order; one file here.
        form.append('captions', meta.caption);
        form.append('memberIds', meta.memberId ?? '');
        form.append('areas', meta.area ?? '');
        xhr.open('POST', `/api${sheetPhotos(sheetId)}`);
        xhr.setRequestHeader('X-CSRF-Token', csrf);
        xhr.setRequestHeader('Accept', 'application/json');
        xhr.withCredentials = true;
        xhr.upload.onprogress = (e) => {
          if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
        };
        xhr.onload = () => {
          const body = parse(xhr.responseText);
          if (xhr.status >= 200 && xhr.status < 300) {
            onProgress(1);
            const photo = (body as { photo?: PhotoWire; photos?: PhotoWire[] } | undefined);
            const one = photo?.photo ?? photo?.photos?.[0];
            if (one) resolve(one);
            else reject(new ApiError(xhr.status, 'unexpected_response', 'The server sent an unreadable answer.'));
          } else reject(apiErrorFromBody(xhr.status, body));
        };
        // Uploads are never tried again by themselves; a dead connection ends after UPLOAD_TIMEOUT_MS.
        xhr.timeout = UPLOAD_TIMEOUT_MS;
        xhr.ontimeout = () => (reportUnreachable(), reject(new ApiError(0, 'timeout', 'The upload took too long. Check the connection and try again.')));
        xhr.onerror = () =>
          (reportUnreachable(), reject(new ApiError(0, 'network_error', 'Cannot reach the server. Check the connection and try again.')));
        xhr.onabort = () => reject(new ApiError(0, 'aborted', 'Upload cancelled.'));
        xhr.send(form);
      }),
  );
  return { done, abort: () => xhr.abort() };
}

export { csrfToken as fetchCsrfToken };
