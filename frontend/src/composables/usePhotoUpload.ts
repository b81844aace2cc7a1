// Uploading several photos at once: each file is checked here first (kind, size, how many the sheet
// may hold), then sent on its own with a progress bar of its own; a refusal from the server stays
// beside the file it concerns while the others carry on.
import { computed, reactive, ref, type Ref } from 'vue';
import { fetchCsrfToken, PHOTO_LIMITS, uploadPhoto, type Photo, type PhotoMeta, type UploadHandle } from '@/api/photos';
import { errorMessage } from '@/api/errors';

export const ACCEPTED_TYPES = ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif', 'image/tiff'] as const;
const ACCEPTED_EXTENSIONS = /\.(jpe?g|png|webp|heic|heif|tiff?)$/i;

export type UploadStatus = 'waiting' | 'uploading' | 'done' | 'failed' | 'refused';

export interface UploadItem {
  key: number;
  name: string;
  sizeBytes: number;
  /** 0–1 of the bytes sent. */
  progress: number;
  status: UploadStatus;
  error: string | null;
}

export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
  return `${Math.max(1, Math.round(bytes / 1024))} kB`;
}

/** Why a file cannot be sent, or null. Browsers leave `type` empty for some HEIC files, hence the name check. */
export function fileProblem(file: Pick<File, 'name' | 'size' | 'type'>): string | null {
  const typeOk = (ACCEPTED_TYPES as readonly string[]).includes(file.type) || (!file.type && ACCEPTED_EXTENSIONS.test(file.name));
  if (!typeOk) return 'Not a photo Cagewright accepts: use JPEG, PNG, WebP, HEIC or TIFF.';
  if (file.size === 0) return 'The file is empty.';
  if (file.size > PHOTO_LIMITS.bytesPerFile)
    return `Too large (${formatBytes(file.size)}); the limit is ${formatBytes(PHOTO_LIMITS.bytesPerFile)} per photo.`;
  return null;
}

export function usePhotoUpload(sheetId: Ref<string>, photoCount: Ref<number>, onUploaded: (photo: Photo) => void) {
  const items = ref<UploadItem[]>([]);
  const notice = ref<string | null>(null);
  const handles = new Map<number, UploadHandle>();
  let nextKey = 1;

  const busy = computed(() => items.value.some((i) => i.status === 'uploading' || i.status === 'waiting'));

  /** Checks every chosen file, then uploads the acceptable ones one after another. */
  async function add(files: readonly File[], meta: PhotoMeta): Promise<void> {
    notice.value = null;
    const room = PHOTO_LIMITS.photosPerSheet - photoCount.value - items.value.filter((i) => i.status === 'waiting' || i.status === 'uploading').length;
    const queue: { item: UploadItem; file: File }[] = [];
    let overLimit = 0;
    for (const file of files) {
      const item = reactive<UploadItem>({ key: nextKey++, name: file.name, sizeBytes: file.size, progress: 0, status: 'waiting', error: null });
      const problem = fileProblem(file) ?? (queue.length >= room ? `This sheet already holds the most photos it can (${PHOTO_LIMITS.photosPerSheet}).` : null);
      if (problem) {
        if (queue.length >= room) overLimit += 1;
        item.status = 'refused';
        item.error = problem;
      } else queue.push({ item, file });
      items.value.push(item);
    }
    if (overLimit > 0) notice.value = `${overLimit} photo${overLimit === 1 ? '' : 's'} not sent: a sheet holds at most ${PHOTO_LIMITS.photosPerSheet}.`;
    if (queue.length === 0) return;
    // One token for the batch; the server binds it to the session.
    const token = fetchCsrfToken();
    token.catch(() => undefined);
    for (const { item, file } of queue) await send(item, file, meta, token);
  }

  async function send(item: UploadItem, file: File, meta: PhotoMeta, token: Promise<string>): Promise<void> {
    item.status = 'uploading';
    const handle = uploadPhoto(sheetId.value, file, meta, (f) => (item.progress = f), token);
    handles.set(item.key, handle);
    try {
      const photo = await handle.done;
      item.status = 'done';
      item.progress = 1;
      onUploaded(photo);
    } catch (error) {
      item.status = 'failed';
      item.error = errorMessage(error);
    } finally {
      handles.delete(item.key);
    }
  }

  function cancel(key: number): void {
    handles.get(key)?.abort();
  }

  /** Clears finished and refused rows; rows still sending stay. */
  function clearFinished(): void {
    items.value = items.value.filter((i) => i.status === 'uploading' || i.status === 'waiting');
    notice.value = null;
  }

  return { items, notice, busy, add, cancel, clearFinished };
}
