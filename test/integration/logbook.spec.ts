import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/auth/roles.js';
import type { LogbookEntriesResponse, LogbookEntry } from '../../shared/logbook/logbook-api.js';
import type { RunningServer } from '../../server/server.js';
import { callApi, makeDataDir, removeDataDir, signIn, startTestServer } from '../../server/testing/test-server.js';
import { csvBytes, htmlBytes, pdfBytes, pngBytes, svgBytes } from '../support/sample-files.js';

/**
 * The logbook on a real server with a real PGlite: writing (JSON and multipart), attachment
 * checks by content and size, serving files safely, amendments, search and filters, roles.
 */
describe('logbook API', () => {
  let dir: string;
  let server: RunningServer;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(server, role));
  });
  afterAll(async () => {
    await server?.close();
    if (dir) removeDataDir(dir);
  });

  const write = (body: unknown, role: Role = 'operator') => callApi<{ id?: number; error?: string }>(server, tokens.get(role), 'POST', '/api/logbook/entries', body);
  const list = async (query = ''): Promise<LogbookEntry[]> => {
    const res = await callApi<LogbookEntriesResponse>(server, tokens.get('viewer'), 'GET', `/api/logbook/entries${query}`);
    expect(res.status).toBe(200);
    return res.body.entries;
  };
  const upload = async (fields: Record<string, string>, files: { name: string; bytes: Buffer; type?: string }[]) => {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.append(k, v);
    for (const f of files) form.append('file', new Blob([new Uint8Array(f.bytes)], { type: f.type ?? 'application/octet-stream' }), f.name);
    const res = await fetch(`${server.url}/api/logbook/entries`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('operator')}` }, body: form });
    return { status: res.status, body: (await res.json()) as { id?: number; error?: string } };
  };

  it('stores a JSON entry with tags and the time it refers to, and lists it with its author', async () => {
    const at = new Date(Date.now() - 3_600_000).toISOString();
    const res = await write({ text: 'Chiller **restarted** by facilities after the water supply alarm.', tags: ['Cooling', 'facilities'], at });
    expect(res.status).toBe(201);
    expect(res.body.id).toEqual(expect.any(Number));
    const [entry] = (await list('?tag=cooling')).filter((e) => e.id === res.body.id);
    expect(entry).toMatchObject({ author: 'operator@tiltwatch.example', tags: ['cooling', 'facilities'], at, link: null, amends: null, amendedBy: [], attachments: [] });
    expect(entry.text).toContain('**restarted**');
  });

  it('refuses empty text, hostile text and malformed fields with a 400 naming the field', async () => {
    expect(await write({ text: '   ' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Entry: .*cannot be empty/) } });
    expect(await write({})).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Entry:/) } });
    expect(await write({ text: 'a\u0000b' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Entry: must not contain a NUL/) } });
    expect(await write({ text: 'half \uD800 pair' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Entry: .*lone surrogate/) } });
    // Form fields are not JSON: the logbook checks them itself.
    expect(await upload({ text: 'a\u0000b' }, [])).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Entry: .*NUL/) } });
    expect(await upload({ text: 'ok', link: 'alarm:x\u0007' }, [])).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Linked to:/) } });
    expect(await write({ text: 'x', tags: ['two words'] })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Tags:/) } });
    expect(await write({ text: 'x', at: 'yesterday' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Refers to:/) } });
    expect(await write({ text: 'x', at: new Date(Date.now() + 86_400_000).toISOString() })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/future/) } });
    expect(await write({ text: 'x', link: 'alarm:no.such.alarm' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Linked to: there is no alarm/), field: 'link' } });
    expect(await write({ text: 'x', link: 'trip:2020-01-01T00:00:00Z' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Linked to: there is no interlock trip/) } });
    expect(await write({ text: 'x', link: 'run:999' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Linked to: there is no run number 999/) } });
    expect(await write({ text: 'x', link: 'shot:none-such' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Linked to: there is no shot/) } });
    expect(await write({ text: 'x', amends: 999_999 })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Corrects entry: .*no entry 999999/) } });
    expect(await write({ text: 'x', colour: 'red' })).toMatchObject({ status: 400, body: { error: expect.stringMatching(/Unknown field/) } });
    expect(await write({ text: 123 })).toMatchObject({ status: 400 });
  });

  it('lets operators write and viewers read, nobody else', async () => {
    expect((await write({ text: 'from a viewer' }, 'viewer')).status).toBe(403);
    expect((await callApi(server, undefined, 'GET', '/api/logbook/entries')).status).toBe(401);
  });

  it('links an entry to an alarm', async () => {
    const res = await write({ text: 'Flow alarm on x was the valve, now open.', link: 'alarm:flow.x.LL' });
    expect(res.status).toBe(201);
    expect((await list()).find((e) => e.id === res.body.id)?.link).toEqual({ kind: 'alarm', ref: 'flow.x.LL' });
  });

  it('takes images, PDF and CSV as multipart and serves each with its type, never for the browser to run', async () => {
    const res = await upload({ text: 'Camera frame and the current trace of the ramp.', tags: 'ramp, camera' }, [
      { name: 'frame.png', bytes: pngBytes(), type: 'image/png' },
      { name: 'ramp trace.csv', bytes: csvBytes(), type: 'text/csv' },
      { name: 'Prüfbericht.pdf', bytes: pdfBytes(), type: 'application/pdf' },
    ]);
    expect(res.status).toBe(201);
    const entry = (await list()).find((e) => e.id === res.body.id)!;
    expect(entry.tags).toEqual(['ramp', 'camera']);
    expect(entry.attachments.map((a) => [a.fileName, a.contentType])).toEqual([
      ['frame.png', 'image/png'],
      ['ramp trace.csv', 'text/csv'],
      ['Prüfbericht.pdf', 'application/pdf'],
    ]);
    const fetchFile = (url: string) => fetch(`${server.url}${url}`, { headers: { authorization: `Bearer ${tokens.get('viewer')}` } });
    const png = await fetchFile(entry.attachments[0].url);
    expect(png.status).toBe(200);
    expect(png.headers.get('content-type')).toBe('image/png');
    expect(png.headers.get('x-content-type-options')).toBe('nosniff');
    expect(png.headers.get('content-disposition')).toMatch(/^inline; filename="frame.png"/);
    expect(png.headers.get('content-security-policy')).toMatch(/sandbox/);
    expect(Buffer.from(await png.arrayBuffer()).equals(pngBytes())).toBe(true);
    const csv = await fetchFile(entry.attachments[1].url);
    expect(csv.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(csv.headers.get('content-disposition')).toMatch(/^attachment; filename="ramp trace.csv"/);
    const pdf = await fetchFile(entry.attachments[2].url);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
    expect(pdf.headers.get('content-disposition')).toBe(`attachment; filename="Pr_fbericht.pdf"; filename*=UTF-8''${encodeURIComponent('Prüfbericht.pdf')}`);
    expect((await fetch(`${server.url}${entry.attachments[0].url}`)).status).toBe(401);
  });

  it('checks attachments by content: disguised HTML, SVG, binary "CSV" and oversized files are refused and nothing is stored', async () => {
    const before = (await list()).length;
    const cases: [string, Buffer, RegExp][] = [
      ['photo.png', htmlBytes(), /"photo.png" is not one of the accepted types/],
      ['drawing.png', svgBytes(), /"drawing.png" is not one of the accepted types/],
      ['data.csv', Buffer.from([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00, 0x04, 0x00]), /"data.csv"/],
      ['empty.pdf', Buffer.alloc(0), /"empty.pdf" is empty/],
      ['huge.png', Buffer.concat([pngBytes(), Buffer.alloc(10 * 1024 * 1024)]), /larger than 10 MB/],
    ];
    for (const [name, bytes, message] of cases) {
      const res = await upload({ text: `with ${name}` }, [{ name: 'fine.png', bytes: pngBytes() }, { name, bytes }]);
      expect(res, name).toMatchObject({ status: 400, body: { error: expect.stringMatching(/^Attachments: /) } });
      expect(res.body.error, name).toMatch(message);
    }
    // A file exactly at the limit is fine.
    const atLimit = Buffer.concat([pngBytes(), Buffer.alloc(10 * 1024 * 1024 - pngBytes().length)]);
    expect((await upload({ text: 'at the limit' }, [{ name: 'limit.png', bytes: atLimit }])).status).toBe(201);
    expect((await list()).length).toBe(before + 1);
    expect((await upload({ text: 'a form without files' }, [])).status).toBe(201);
    const form = new FormData();
    form.append('text', 'files under another name');
    form.append('upload', new Blob([new Uint8Array(pngBytes())]), 'a.png');
    const res = await fetch(`${server.url}/api/logbook/entries`, { method: 'POST', headers: { authorization: `Bearer ${tokens.get('operator')}` }, body: form });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: string }).error).toMatch(/form field "file"/);
  }, 180_000);

  it('keeps a corrected entry and shows the correction beside it (append-only)', async () => {
    const original = await write({ text: 'Trap depth set to 12 kHz for the evening runs.', tags: ['trap'] });
    const correction = await write({ text: 'Correction: the trap frequency was 1.2 kHz, not 12 kHz.', tags: ['trap'], amends: original.body.id }, 'lead');
    expect(correction.status).toBe(201);
    const entries = await list('?tag=trap');
    expect(entries.find((e) => e.id === original.body.id)).toMatchObject({ text: expect.stringContaining('12 kHz'), amendedBy: [correction.body.id] });
    expect(entries.find((e) => e.id === correction.body.id)).toMatchObject({ amends: original.body.id, author: 'lead@tiltwatch.example' });
  });

  it('searches the text with PostgreSQL text search (stemmed words, phrases, exclusions) and filters by tag and time', async () => {
    const early = new Date(Date.now() - 5 * 3_600_000).toISOString();
    const a = await write({ text: 'The chillers were serviced; coolant flows back to normal.', tags: ['maintenance'], at: early });
    const b = await write({ text: 'Quiet night, no chiller trouble.', tags: ['night'] });
    const ids = async (query: string) => (await list(query)).map((e) => e.id);
    expect(await ids('?q=chiller')).toEqual(expect.arrayContaining([a.body.id, b.body.id]));
    expect(await ids('?q=chiller -quiet')).not.toContain(b.body.id);
    expect(await ids(`?q=${encodeURIComponent('"coolant flows"')}`)).toContain(a.body.id);
    expect(await ids('?q=superconducting')).toEqual([]);
    expect(await ids('?q=chiller&tag=night')).toEqual([b.body.id]);
    const toEarly = encodeURIComponent(new Date(Date.parse(early) + 1000).toISOString());
    const mine = async (query: string) => (await ids(query)).filter((id) => id === a.body.id || id === b.body.id);
    expect(await mine(`?q=chiller&to=${toEarly}`)).toEqual([a.body.id]);
    expect(await mine(`?q=chiller&from=${toEarly}`)).toEqual([b.body.id]);
    expect((await callApi(server, tokens.get('viewer'), 'GET', '/api/logbook/entries?from=soon')).status).toBe(400);
    expect((await callApi(server, tokens.get('viewer'), 'GET', `/api/logbook/entries?q=${encodeURIComponent('a\u0000b')}`)).status).toBe(400);
    // Search syntax a person might type by mistake is still a search, never an error.
    expect((await callApi(server, tokens.get('viewer'), 'GET', `/api/logbook/entries?q=${encodeURIComponent('chiller & | !( "')}`)).status).toBe(200);
  });
});
