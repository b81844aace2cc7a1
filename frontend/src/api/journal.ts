// The build journal (docs/api.md, "Build journal"): stages with dates, notes and photos. Photo uploads
// send one file per request through XMLHttpRequest so each shows its progress, as sheet photos do.
import { http, UPLOAD_TIMEOUT_MS } from './http';
import { reportUnreachable } from './connection';
import { ApiError, apiErrorFromBody } from './errors';
import { fetchCsrfToken } from './photos';
import type { CreateJournalEntryInput, JournalEntryWire, JournalPhotoWire, JournalWire, UpdateJournalEntryBody } from '@contracts/journal';

export type { JournalEntryWire as JournalEntry, JournalPhotoWire as JournalPhoto, JournalStage, JournalWire as Journal } from '@contracts/journal';
export { JOURNAL_LIMITS, JOURNAL_STAGE_LABELS, journalDateProblem } from '@contracts/journal';

const id = encodeURIComponent;

export function getJournal(sheetId: string): Promise<JournalWire> {
  return http.get<JournalWire>(`/build-sheets/${id(sheetId)}/journal`);
}

export async function recordStage(sheetId: string, body: CreateJournalEntryInput): Promise<JournalEntryWire> {
  return (await http.post<{ entry: JournalEntryWire }>(`/build-sheets/${id(sheetId)}/journal`, body)).entry;
}

export async function updateStage(entryId: string, body: UpdateJournalEntryBody): Promise<JournalEntryWire> {
  return (await http.patch<{ entry: JournalEntryWire }>(`/journal-entries/${id(entryId)}`, body)).entry;
}

export function removeStage(entryId: string): Promise<void> {
  return http.delete(`/journal-entries/${id(entryId)}`);
}

export function removeJournalPhoto(photoId: string): Promise<void> {
  return http.delete(`/journal-photos/${id(photoId)}`);
}

/** Sends one photo with its caption; `onProgress` gets the fraction sent (0–1). */
export function uploadJournalPhoto(entryId: string, file: File, caption: string, onProgress: (fraction: number) => void): Promise<JournalPhotoWire> {
  return fetchCsrfToken().then(
    (csrf) =>
      new Promise<JournalPhotoWire>((resolve, reject) => {
        const xhr = new XMLHttpRequest();
        const form = new FormData();
        form.append('photos', file, file.name);
        form.append('captions', caption);
        xhr.open('POST', `/api/journal-entries/${id(entryId)}/photos`);
        xhr.setRequestHeader('X-CSRF-Token', csrf);
        xhr.setRequestHeader('Accept', 'application/json');
        xhr.withCredentials = true;
        xhr.upload.onprogress = (e) => e.lengthComputable && e.total > 0 && onProgress(e.loaded / e.total);
        xhr.onload = () => {
          let body: unknown;
          try {
            body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
          } catch {
            body = undefined;
          }
          const photo = (body as { photos?: JournalPhotoWire[] } | undefined)?.photos?.[0];
          if (xhr.status >= 200 && xhr.status < 300 && photo) resolve(photo);
          else if (xhr.status >= 200 && xhr.status < 300) reject(new ApiError(xhr.status, 'unexpected_response', 'The server sent an unreadable answer.'));
          else reject(apiErrorFromBody(xhr.status, body));
        };
        // Uploads are never tried again by themselves; a dead connection ends after UPLOAD_TIMEOUT_MS.
        xhr.timeout = UPLOAD_TIMEOUT_MS;
        xhr.ontimeout = () => (reportUnreachable(), reject(new ApiError(0, 'timeout', 'The upload took too long. Check the connection and try again.')));
        xhr.onerror = () => (reportUnreachable(), reject(new ApiError(0, 'network_error', 'Cannot reach the server. Check the connection and try again.')));
        xhr.send(form);
      }),
  );
}
