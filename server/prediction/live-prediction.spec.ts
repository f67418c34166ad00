import type { MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { LivePrediction, LiveState, ServerMessage } from '../../shared/live/live-state.js';
import { predict } from '../../shared/physics/predict.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import type { PredictionHistory, ProfileRecord } from '../../shared/profiles/profile-record.js';
import { sampleParamsOf, type SampleProfile } from '../../shared/profiles/sample-profile.js';
import { profileTrapField } from '../../shared/profiles/trap-orientation.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { openLiveSocket } from '../../test/support/live-socket.js';
import type { RunningServer } from '../server.js';
import { fastFrame } from '../testing/frames.js';
import { connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

/** Coil currents of every published frame, A. */
const CURRENTS = { x: 1, y: 2, z: 3 };
const WAIT = { timeout: 30_000, interval: 50 };

/** The field direction of CURRENTS in the trap frame, through the calibration's own rotation (equal to the demo profile's). */
const trapField = fieldFromCurrents(DEMO_CALIBRATION, CURRENTS);
const direction = { thetaDeg: trapField.thetaDeg as number, phiDeg: trapField.phiDeg as number };

/** The model called directly, as the worker calls it for the profile's first TOF time. */
function direct(profile: SampleProfile, field = direction) {
  return predict(sampleParamsOf(profile), field, { tofMs: [0, profile.tofMs[0]], imaging: profile.imaging });
}

function expectRelativelyClose(actual: number | null, expected: number | null | undefined): void {
  expect(actual).not.toBeNull();
  expect(expected).toEqual(expect.any(Number));
  expect(Math.abs((actual as number) - (expected as number)) / Math.abs(expected as number)).toBeLessThan(1e-9);
}

describe('live prediction in the server', () => {
  let dir: string;
  let server: RunningServer;
  let controller: MqttClient;
  let viewer: string;
  let lead: string;
  let seq = 0;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    controller = await connectController(server);
    viewer = await signIn(server, 'viewer');
    lead = await signIn(server, 'lead');
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  const publishFrame = () => controller.publish(TOPICS.fast, JSON.stringify(fastFrame(++seq, Date.now(), CURRENTS)));
  const get = async <T>(path: string): Promise<T> => {
    const res = await fetch(`${server.url}${path}`, { headers: { authorization: `Bearer ${viewer}` } });
    expect(res.status).toBe(200);
    return (await res.json()) as T;
  };
  /** Publishes frames (unless told not to) until `/api/live` carries a prediction that satisfies `accept`. */
  const livePrediction = (accept: (p: LivePrediction) => boolean, publish = true) =>
    vi.waitFor(async () => {
      if (publish) publishFrame();
      const { prediction } = await get<LiveState>('/api/live');
      expect(prediction !== null && accept(prediction)).toBe(true);
      return prediction as LivePrediction;
    }, WAIT);

  const saveActive = async (profile: SampleProfile, reason: string): Promise<ProfileRecord> => {
    const res = await fetch(`${server.url}/api/profiles`, {
      method: 'POST',
      headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' },
      body: JSON.stringify({ profile, reason }),
    });
    expect(res.status).toBe(201);
    const saved = (await res.json()) as ProfileRecord;
    const activated = await fetch(`${server.url}/api/profiles/${saved.id}/activate`, {
      method: 'POST',
      headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' },
      body: JSON.stringify({ reason }),
    });
    expect(activated.status).toBe(200);
    return (await activated.json()) as ProfileRecord;
  };

  it('publishes in /api/live the prediction a direct model call gives for the measured direction, and keeps it in the history', async () => {
    const { id: demoId } = await get<ProfileRecord>('/api/profiles/active');
    const p = await livePrediction((q) => q.profileId === demoId);
    const expected = direct(DEMO_PROFILE);

    expect(p).toMatchObject({ stable: true, reason: null, profileId: demoId, epsDd: expected.epsDd });
    expect(p.thetaDeg).toBeCloseTo(direction.thetaDeg, 9);
    expect(p.phiDeg).toBeCloseTo(direction.phiDeg, 9);
    expectRelativelyClose(p.fermiSurfaceAspect, expected.fermiSurface?.aspectRatio);
    expectRelativelyClose(p.cloudAspect, expected.cloud?.aspectRatios.r1OverR3);
    expectRelativelyClose(p.tofAspect, expected.tof?.[1].aspectRatio);
    expectRelativelyClose(p.tofMajorAngleDeg, expected.tof?.[1].majorAngleDeg);
    expect(p.camera).not.toBeNull();

    const history = await get<PredictionHistory>('/api/prediction/history?seconds=600');
    const i = history.t.indexOf(Date.parse(p.computedAt));
    expect(i).toBeGreaterThanOrEqual(0);
    expect(history.fermiSurfaceAspect[i]).toBe(p.fermiSurfaceAspect);
    expect(history.tofAspect[i]).toBe(p.tofAspect);
    expect([history.fermiSurfaceAspect, history.tofAspect, history.collapseRatio].map((a) => a.length)).toEqual([history.t.length, history.t.length, history.t.length]);
  });

  it('adds the collapse ratio to the live prediction once ε_dd,crit is known', async () => {
    const p = await livePrediction((q) => q.collapseRatio !== null);
    expect(p.collapseRatio).toBeGreaterThan(0);
    expect(p.collapseRatio).toBeLessThan(1);
    await vi.waitFor(async () => {
      const history = await get<PredictionHistory>('/api/prediction/history?seconds=600');
      expect(history.collapseRatio.at(-1)).toBe(p.collapseRatio);
    }, WAIT);
  });

  it('sends the prediction to a WebSocket viewer in its live messages', async () => {
    const socket = openLiveSocket(server.url, viewer);
    try {
      const update = await vi.waitFor(() => {
        publishFrame();
        const found = socket.messages.find((m): m is Extract<ServerMessage, { type: 'live' }> => m.type === 'live' && m.live.prediction !== null);
        expect(found).toBeDefined();
        return found!;
      }, WAIT);
      expect(update.live.prediction).toMatchObject({ stable: true, fermiSurfaceAspect: expect.any(Number) });
    } finally {
      socket.close();
      await socket.closed;
    }
  });

  it('predicts for a newly activated profile, from its own species and values', async () => {
    const dy: SampleProfile = { ...DEMO_PROFILE, name: 'Lindqvist Hall 161Dy, crossed trap', species: '161Dy' };
    const record = await saveActive(dy, 'dysprosium run');

    const p = await livePrediction((q) => q.profileId === record.id);
    const expected = direct(dy);
    expect(p.epsDd).toBe(expected.epsDd);
    expectRelativelyClose(p.fermiSurfaceAspect, expected.fermiSurface?.aspectRatio);
    expect(p.fermiSurfaceAspect).not.toBeCloseTo(direct(DEMO_PROFILE).fermiSurface?.aspectRatio as number, 3);
  });

  it('turns the field into the trap frame of the profile, not of the calibration, at once on activation', async () => {
    // A trap tilted by 30° about its own y axis: its frame is no longer the calibration's.
    const tilted: SampleProfile = { ...DEMO_PROFILE, name: 'Lindqvist Hall 167Er, tilted trap', trapToCoilEulerDeg: [15, 30, 0] };
    const field = profileTrapField(DEMO_CALIBRATION, tilted, CURRENTS);
    const angles = { thetaDeg: field.thetaDeg as number, phiDeg: field.phiDeg as number };
    expect(Math.abs(angles.thetaDeg - direction.thetaDeg)).toBeGreaterThan(5);

    const record = await saveActive(tilted, 'trap rebuilt with a tilt');
    // No frame after the switch: the last measured currents must already be in the new frame.
    const p = await livePrediction((q) => q.profileId === record.id, false);
    expect(p.thetaDeg).toBeCloseTo(angles.thetaDeg, 9);
    expect(p.phiDeg).toBeCloseTo(angles.phiDeg, 9);
    expectRelativelyClose(p.fermiSurfaceAspect, direct(tilted, angles).fermiSurface?.aspectRatio);
  });
  it('leaves a gap in the prediction history while the field is too weak to orient the dipoles, and resumes after', async () => {
    const status = (currents: typeof CURRENTS, state: string) =>
      vi.waitFor(async () => {
        controller.publish(TOPICS.fast, JSON.stringify(fastFrame(++seq, Date.now(), currents)));
        expect((await get<LiveState>('/api/live')).predictionStatus.state).toBe(state);
      }, WAIT);
    const newest = async () => {
      const history = await get<PredictionHistory>('/api/prediction/history?seconds=600');
      return { t: history.t.at(-1), beta: history.fermiSurfaceAspect.at(-1) };
    };

    await status({ x: 0, y: 0, z: 0 }, 'weak-field');
    const gap = await newest();
    expect(gap.beta).toBeNull();
    await status(CURRENTS, 'applies');
    const resumed = await newest();
    expect(resumed.t).toBeGreaterThan(gap.t!);
    expect(resumed.beta).toEqual(expect.any(Number));
  });
});
