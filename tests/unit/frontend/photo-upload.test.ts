// Uploading photos: files are checked before anything is sent, each file goes up on its own request
// with the CSRF header and reports its own progress, and a refusal from the server stays with its file.
import { beforeEach, describe, expect, test, vi } from 'vitest';
import { ref } from 'vue';
import { http } from '@/api/http';
import { PHOTO_FIELD, PHOTO_LIMITS } from '@/api/photos';
import { fileProblem, usePhotoUpload } from '@/composables/usePhotoUpload';
import { createFetchMock, csrfToken } from './fetch-mock';

interface Sent {
  method: string;
  url: string;
  headers: Record<string, string>;
  body: FormData;
  xhr: FakeXhr;
}
const sent: Sent[] = [];

/** Enough of XMLHttpRequest for the client: open, headers, send, upload progress, load and error. */
class FakeXhr {
  status = 0;
  responseText = '';
  withCredentials = false;
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  private method = '';
  private url = '';
  private headers: Record<string, string> = {};
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name.toLowerCase()] = value;
  }
  send(body: FormData) {
    sent.push({ method: this.method, url: this.url, headers: this.headers, body, xhr: this });
  }
  abort() {
    this.onabort?.();
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ lengthComputable: true, loaded, total });
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

const photo = (id: string) => ({ id, buildSheetId: 's', memberId: null, area: 'general', caption: '', widthPx: 4, heightPx: 3, byteSize: 10, createdAt: '', imageUrl: `/i/${id}`, thumbnailUrl: `/t/${id}` });
const jpeg = (name: string, size = 2048) => new File([new Uint8Array(size)], name, { type: 'image/jpeg' });
const flush = async () => {
  for (let i = 0; i < 10; i += 1) await new Promise((r) => setTimeout(r, 0));
};

beforeEach(() => {
  sent.length = 0;
  http.resetCsrfToken();
  const mock = createFetchMock();
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-photo'));
  vi.stubGlobal('fetch', mock.fetch);
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
});

describe('before sending', () => {
  test.each<[Pick<File, 'name' | 'size' | 'type'>, string | null]>([
    [{ name: 'foot.jpg', size: 1000, type: 'image/jpeg' }, null],
    [{ name: 'weld.HEIC', size: 1000, type: '' }, null],
    [{ name: 'notes.pdf', size: 1000, type: 'application/pdf' }, 'Not a photo Cagewright accepts: use JPEG, PNG, WebP, HEIC or TIFF.'],
    [{ name: 'empty.png', size: 0, type: 'image/png' }, 'The file is empty.'],
    [{ name: 'huge.jpg', size: PHOTO_LIMITS.bytesPerFile + 1, type: 'image/jpeg' }, 'Too large (15.0 MB); the limit is 15.0 MB per photo.'],
  ])('%j → %j', (file, problem) => {
    expect(fileProblem(file)).toBe(problem);
  });

  test('files over the sheet limit are refused by name, the rest are sent', async () => {
    const uploaded: string[] = [];
    const { items, notice, add } = usePhotoUpload(ref('sheet-1'), ref(PHOTO_LIMITS.photosPerSheet - 1), (p) => uploaded.push(p.id));
    const running = add([jpeg('a.jpg'), jpeg('b.jpg')], { caption: '', memberId: null, area: 'general' });
    await flush();
    sent[0].xhr.answer(201, { photo: photo('p-a') });
    await running;

    expect(sent).toHaveLength(1);
    expect(items.value.map((i) => [i.name, i.status])).toEqual([['a.jpg', 'done'], ['b.jpg', 'refused']]);
    expect(items.value[1].error).toContain(`most photos it can (${PHOTO_LIMITS.photosPerSheet})`);
    expect(notice.value).toBe(`1 photo not sent: a sheet holds at most ${PHOTO_LIMITS.photosPerSheet}.`);
    expect(uploaded).toEqual(['p-a']);
  });
});

describe('sending', () => {
  test('each file has its own request, CSRF header, form fields and progress', async () => {
    const { items, add, busy } = usePhotoUpload(ref('sheet-1'), ref(0), () => undefined);
    const running = add([jpeg('foot.jpg', 4000), jpeg('weld.jpg', 8000)], { caption: 'Left foot', memberId: 'mh', area: 'members' });
    await flush();

    expect(sent).toHaveLength(1); // one after another, so each bar means one file
    const first = sent[0];
    expect(first.method).toBe('POST');
    expect(first.url).toBe('/api/build-sheets/sheet-1/photos');
    expect(first.headers['x-csrf-token']).toBe('csrf-photo');
    expect((first.body.get(PHOTO_FIELD) as File).name).toBe('foot.jpg');
    expect(first.body.get('captions')).toBe('Left foot');
    expect(first.body.get('memberIds')).toBe('mh');
    expect(first.body.get('areas')).toBe('members');
    expect(busy.value).toBe(true);

    first.xhr.progress(1000, 4000);
    expect(items.value[0].progress).toBe(0.25);
    expect(items.value[0].status).toBe('uploading');
    expect(items.value[1].status).toBe('waiting');
    first.xhr.progress(4000, 4000);
    first.xhr.answer(201, { photo: photo('p1') });
    await flush();

    expect(items.value[0]).toMatchObject({ status: 'done', progress: 1 });
    expect(sent).toHaveLength(2);
    sent[1].xhr.progress(4000, 8000);
    expect(items.value[1].progress).toBe(0.5);
    sent[1].xhr.answer(201, { photo: photo('p2') });
    await running;
    expect(busy.value).toBe(false);
  });

  test("the server's refusal stays with its file and the next file still goes", async () => {
    const { items, add } = usePhotoUpload(ref('sheet-1'), ref(0), () => undefined);
    const running = add([jpeg('bad.jpg'), jpeg('good.jpg')], { caption: '', memberId: null, area: 'general' });
    await flush();
    sent[0].xhr.answer(400, {
      error: { code: 'validation_failed', message: 'Images of type gif are not accepted; use JPEG, PNG, WebP, HEIC or TIFF.' },
    });
    await flush();
    sent[1].xhr.answer(201, { photo: photo('p2') });
    await running;

    expect(items.value.map((i) => [i.name, i.status, i.error])).toEqual([
      ['bad.jpg', 'failed', 'Images of type gif are not accepted; use JPEG, PNG, WebP, HEIC or TIFF.'],
      ['good.jpg', 'done', null],
    ]);
  });

  test('a dropped connection is said in plain words', async () => {
    const { items, add } = usePhotoUpload(ref('sheet-1'), ref(0), () => undefined);
    const running = add([jpeg('a.jpg')], { caption: '', memberId: null, area: null });
    await flush();
    sent[0].xhr.onerror?.();
    await running;
    expect(items.value[0].error).toBe('Cannot reach the server. Check the connection and try again.');
  });
});
