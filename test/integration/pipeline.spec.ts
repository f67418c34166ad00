import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LiveState, ServerMessage } from '../../shared/live/live-state.js';
import { openLiveSocket } from '../support/live-socket.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

/**
 * The whole chain with real parts: simulated controller → embedded aedes broker → server
 * (ingest, field, storage, fan-out) → a WebSocket client signed in as a viewer.
 */
describe('pipeline from the controller to a signed-in client', () => {
  let stack: Stack;
  let token: string;

  beforeAll(async () => {
    stack = await startStack();
    token = await signIn(stack.server.url, 'viewer');
  });
  afterAll(async () => {
    await stack?.close();
  });

  async function live(): Promise<LiveState> {
    const res = await fetch(`${stack.server.url}/api/live`, { headers: { authorization: `Bearer ${token}` } });
    expect(res.status).toBe(200);
    return (await res.json()) as LiveState;
  }

  it('delivers field updates over the WebSocket to a viewer', async () => {
    const socket = openLiveSocket(stack.server.url, token);
    try {
      const update = await waitFor(
        () => socket.messages.find((m): m is Extract<ServerMessage, { type: 'live' }> => m.type === 'live' && m.live.field !== null),
        'a live message with a field',
      );
      expect(socket.messages[0]?.type).toBe('hello');
      expect(update.live.field!.magnitude).toBeGreaterThan(0);
      expect(update.series.t.length).toBe(update.series.bMagG.length);
    } finally {
      socket.close();
    }
  });

  it('reports a live state that changes over time', async () => {
    const first = await waitFor(async () => {
      const state = await live();
      return state.time !== null && state.field !== null ? state : undefined;
    }, 'the first live state');
    const later = await waitFor(async () => {
      const state = await live();
      return state.time !== first.time ? state : undefined;
    }, 'a newer live state');
    expect(Date.parse(later.time!)).toBeGreaterThan(Date.parse(first.time!));
    expect(later.controller.online).toBe(true);
    for (const axis of ['x', 'y', 'z'] as const) {
      expect(Number.isFinite(later.currents![axis])).toBe(true);
      expect(Number.isFinite(later.temperatureC![axis])).toBe(true);
    }
  });

  it('counts accepted frames in the health report without signing in', async () => {
    const health = (await (await fetch(`${stack.server.url}/api/health`)).json()) as {
      status: string;
      frames: { accepted: number; rejected: number };
    };
    expect(health.status).toBe('ok');
    expect(health.frames.accepted).toBeGreaterThan(0);
    expect(health.frames.rejected).toBe(0);
  });

  it('closes a WebSocket that never signs in with code 4401', async () => {
    const socket = openLiveSocket(stack.server.url, 'not-a-token');
    const { code } = await socket.closed;
    expect(code).toBe(4401);
  });

  it('sees the controller go offline when it stops', async () => {
    await stack.simulator!.close();
    await waitFor(async () => ((await live()).controller.online ? undefined : true), 'the controller to be seen offline');
    stack.simulator = null;
  });
});
