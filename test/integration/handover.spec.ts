import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { InterlockResetRefusal, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { Handover, HandoverListResponse, HandoverResponse } from '../../shared/handover/handover-api.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

type Role = 'viewer' | 'operator' | 'lead' | 'admin';
interface Mail {
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

/**
 * A shift on the real stack (simulator → broker → server → PGlite, local mailbox): notes, an
 * interlock trip and its reset, a limit change; then the handover from draft to acceptance,
 * the refusals around it, the mail to the on-call list and open items carried into the next.
 */
describe('shift handover', () => {
  let stack: Stack;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    // A loaded machine can stall the server for a few hundred ms: only the dropout this test
    // injects may trip the staleness condition.
    stack = await startStack({ env: { LOG_LEVEL: 'error', TILTWATCH_STALE_TRIP_MS: '2000' } });
    for (const role of ['viewer', 'operator', 'lead', 'admin'] as const) tokens.set(role, await signIn(stack.server.url, role));
  });
  afterAll(async () => {
    await stack?.close();
  });

  async function api<T>(role: Role, method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const res = await fetch(`${stack.server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens.get(role)}`, 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as T };
  }
  async function sim(method: string, path: string, body?: unknown): Promise<number> {
    const res = await fetch(`${stack.simulator!.controlUrl}${path}`, { method, headers: { 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
    await res.arrayBuffer();
    return res.status;
  }
  const interlock = async () => (await api<InterlockStatus>('viewer', 'GET', '/api/interlock')).body;
  const note = (role: Role, body: object) => api<{ id: number }>(role, 'POST', '/api/logbook/entries', body);
  const handover = (role: Role, method: string, path: string, body?: unknown) => api<HandoverResponse & { error?: string }>(role, method, `/api/handovers${path}`, body);

  /** A trip of the software interlock by a telemetry dropout, then its reset with a reason. */
  async function tripAndReset(reason: string): Promise<string> {
    await waitFor(async () => ((await interlock()).conditions.every((c) => !c.active) ? true : undefined), 'telemetry to flow');
    expect(await sim('POST', '/faults', { kind: 'sensor-dropout', stream: 'all' })).toBe(201);
    const trip = await waitFor(async () => {
      const s = await interlock();
      return s.state === 'tripped' ? s : undefined;
    }, 'the software interlock to trip');
    await sim('DELETE', '/faults');
    await waitFor(async () => ((await api<InterlockResetRefusal>('operator', 'POST', '/api/interlock/reset', { reason })).status === 200 ? true : undefined), 'the reset');
    return trip.trip!.trippedAt;
  }

  let first: Handover;

  it('fills a draft from the shift: apparatus now, the trip with its reset reason, the limit change and the notes', async () => {
    const opening = await note('operator', { text: 'Evening shift: ramping the **x** pair for the tilt scan.', tags: ['shift'] });
    expect(opening.status).toBe(201);
    const trippedAt = await tripAndReset('telemetry back after the network switch restarted');
    expect((await note('operator', { text: 'Dropout came from the network switch in rack 3.', link: `trip:${trippedAt}` })).status).toBe(201);
    expect((await api('lead', 'PUT', '/api/alarm-limits/waterReturn.x.H', { limit: 35, reason: 'new chiller setpoint' })).status).toBe(200);

    const created = await handover('operator', 'POST', '');
    expect(created.status).toBe(201);
    first = created.body.handover;
    expect(first).toMatchObject({ status: 'draft', author: 'operator@tiltwatch.example', submitted: null, accepted: null, openItems: [] });
    const { record } = first;
    expect(record.apparatus).toMatchObject({ controllerOnline: true, interlock: 'ok', hardwareTripped: false });
    expect(record.apparatus.field?.magnitudeG).toEqual(expect.any(Number));
    expect(record.apparatus.currentsA).not.toBeNull();
    expect(record.trips).toEqual([
      expect.objectContaining({ trippedAt, firstOut: expect.stringMatching(/telemetry/i), reset: expect.objectContaining({ by: 'operator@tiltwatch.example', reason: 'telemetry back after the network switch restarted' }) }),
    ]);
    expect(record.changes).toContainEqual(expect.objectContaining({ action: 'alarm-limit.update', subject: 'alarm-limit:waterReturn.x.H', actor: 'lead@tiltwatch.example', reason: 'new chiller setpoint' }));
    expect(record.changes.map((c) => c.action)).not.toContain('logbook.write');
    expect(record.logbook.map((e) => e.text)).toEqual([expect.stringMatching(/^Evening shift/), expect.stringMatching(/^Dropout came/)]);
    expect(record.logbook[1].link).toEqual({ kind: 'trip', ref: trippedAt });
    // No sequence ran in this shift.
    expect(record.runs).toEqual({ recorded: true, note: null, items: [] });

    // One open handover at a time.
    expect(await handover('lead', 'POST', '')).toMatchObject({ status: 409, body: { error: expect.stringMatching(/still a draft/) } });
  });

  it('lets only the author or a lead edit the draft, and only while it is a draft', async () => {
    expect((await handover('viewer', 'PUT', `/${first.id}`, { summary: 'x' })).status).toBe(403);
    expect((await handover('admin', 'PUT', `/${first.id}`, { summary: 'edited by the admin' })).status).toBe(200);
    const edit = {
      summary: 'Quiet after the dropout. Tilt scan half done.',
      notes: { trips: 'Switch in rack 3 replaced at 22:10.' },
      openItems: [{ text: 'Ask facilities to check the rack 3 switch power supply.' }],
    };
    const edited = await handover('operator', 'PUT', `/${first.id}`, edit);
    expect(edited.status).toBe(200);
    expect(edited.body.handover).toMatchObject({ summary: edit.summary, notes: edit.notes, openItems: [{ id: null, text: edit.openItems[0].text, carried: false, closed: null }] });
    expect((await handover('operator', 'PUT', `/${first.id}`, { openItems: [{ text: '' }] })).status).toBe(400);
    expect((await handover('operator', 'PUT', `/${first.id}`, { notes: { weather: 'fine' } })).status).toBe(400);
    expect((await handover('operator', 'PUT', `/${first.id}`, { summary: 'a\u0000b' })).status).toBe(400);
    expect(await handover('operator', 'PUT', `/${first.id}`, {})).toMatchObject({ status: 400, body: { error: expect.stringMatching(/Nothing to change/) } });
    expect(await handover('lead', 'POST', `/${first.id}/accept`, {})).toMatchObject({ status: 409, body: { error: expect.stringMatching(/still a draft/) } });
  });

  it('refuses acceptance by the person who handed over, accepts it from another, and freezes it', async () => {
    const submitted = await handover('operator', 'POST', `/${first.id}/submit`);
    expect(submitted.status).toBe(200);
    expect(submitted.body.handover).toMatchObject({ status: 'submitted', submitted: { by: 'operator@tiltwatch.example', at: expect.any(String) } });
    expect(submitted.body.handover.openItems).toEqual([expect.objectContaining({ id: expect.any(Number), carried: false })]);
    expect((await handover('operator', 'PUT', `/${first.id}`, { summary: 'late change' })).status).toBe(409);

    expect(await handover('operator', 'POST', `/${first.id}/accept`, {})).toMatchObject({ status: 409, body: { error: expect.stringMatching(/You handed this shift over/) } });
    const t0 = Date.now();
    const accepted = await handover('lead', 'POST', `/${first.id}/accept`, { comment: 'Read through, switch noted.' });
    expect(accepted.status).toBe(200);
    const done = accepted.body.handover;
    expect(done).toMatchObject({
      status: 'accepted',
      submitted: { by: 'operator@tiltwatch.example' },
      accepted: { by: 'lead@tiltwatch.example', comment: 'Read through, switch noted.', at: expect.any(String) },
    });
    expect(Date.parse(done.accepted!.at)).toBeGreaterThanOrEqual(Date.parse(done.submitted!.at));
    expect((await handover('viewer', 'GET', `/${first.id}`)).body.handover).toEqual(done);

    for (const [method, path, body] of [
      ['PUT', `/${first.id}`, { summary: 'rewrite' }],
      ['POST', `/${first.id}/submit`, undefined],
      ['POST', `/${first.id}/accept`, {}],
    ] as const) {
      expect(await handover('admin', method, path, body)).toMatchObject({ status: 409, body: { error: expect.stringMatching(/accepted by lead@tiltwatch.example and cannot change/) } });
    }

    const mail = await waitFor(async () => {
      const { body } = await api<{ messages: Mail[] }>('admin', 'GET', '/api/admin/outbox');
      return body.messages.find((m) => Date.parse(m.receivedAt) >= t0 && /Shift handover/.test(m.subject));
    }, 'the handover mail in the local mailbox');
    expect(mail.to).toEqual(['oncall@lindqvist-hall.example']);
    expect(mail.subject).toMatch(new RegExp(`Shift handover ${first.id} accepted by lead@tiltwatch.example`));
    expect(mail.text).toContain('Handed over by: operator@tiltwatch.example');
    expect(mail.text).toContain('Tilt scan half done.');
    expect(mail.text).toContain('Ask facilities to check the rack 3 switch power supply.');
    expect(mail.text).toMatch(/Interlock trips in the shift: 1/);
    expect(mail.text).toMatch(/supervisory/);
  });

  it('carries open items into every following draft until someone closes them with a note', async () => {
    const second = (await handover('lead', 'POST', '')).body.handover;
    // The next shift starts where the accepted one ended (its submission).
    expect(second.periodFrom).toBe((await handover('viewer', 'GET', `/${first.id}`)).body.handover.periodTo);
    expect(second.record.trips).toEqual([]);
    const [carried] = second.openItems;
    expect(carried).toMatchObject({ id: expect.any(Number), text: 'Ask facilities to check the rack 3 switch power supply.', carried: true, closed: null });
    await handover('lead', 'PUT', `/${second.id}`, { openItems: [{ text: 'Recalibrate the y pair before Monday.' }] });
    expect((await handover('lead', 'POST', `/${second.id}/submit`)).status).toBe(200);
    expect((await handover('operator', 'POST', `/${second.id}/accept`, {})).status).toBe(200);

    const third = (await handover('operator', 'POST', '')).body.handover;
    expect(third.openItems.map((i) => [i.text, i.carried, i.closed])).toEqual([
      ['Ask facilities to check the rack 3 switch power supply.', true, null],
      ['Recalibrate the y pair before Monday.', true, null],
    ]);

    const close = (role: Role, id: number, body: unknown) => api<{ item?: unknown; error?: string }>(role, 'POST', `/api/handover-items/${id}/close`, body);
    expect((await close('operator', carried.id!, {})).status).toBe(400);
    expect((await close('viewer', carried.id!, { note: 'done' })).status).toBe(403);
    expect((await close('operator', carried.id!, { note: 'Facilities replaced the supply.' })).status).toBe(200);
    expect((await close('lead', carried.id!, { note: 'again' })).status).toBe(409);
    const view = (await handover('viewer', 'GET', `/${third.id}`)).body.handover;
    expect(view.openItems[0].closed).toMatchObject({ by: 'operator@tiltwatch.example', note: 'Facilities replaced the supply.' });
    // The accepted handovers keep the items as they stood when accepted.
    expect((await handover('viewer', 'GET', `/${second.id}`)).body.handover.openItems[0].closed).toBeNull();

    expect((await handover('operator', 'POST', `/${third.id}/submit`)).status).toBe(200);
    expect((await handover('admin', 'POST', `/${third.id}/accept`, {})).status).toBe(200);
    const fourth = (await handover('lead', 'POST', '')).body.handover;
    expect(fourth.openItems.map((i) => i.text)).toEqual(['Recalibrate the y pair before Monday.']);

    const list = (await api<HandoverListResponse>('viewer', 'GET', '/api/handovers')).body.handovers;
    expect(list.map((h) => [h.id, h.status])).toEqual([
      [fourth.id, 'draft'],
      [third.id, 'accepted'],
      [second.id, 'accepted'],
      [first.id, 'accepted'],
    ]);
    expect(list[3]).toMatchObject({ submitted: { by: 'operator@tiltwatch.example' }, accepted: { by: 'lead@tiltwatch.example' } });
  });
});
