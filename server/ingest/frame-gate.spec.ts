import { describe, expect, it } from 'vitest';
import { MAX_PAYLOAD_BYTES } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { fastFrame, slowFrame } from '../testing/frames.js';
import { FrameGate, MAX_CLOCK_SKEW_MS, MAX_FUTURE_MS, MAX_SEQ_STEP, RESYNC_AFTER } from './frame-gate.js';

const NOW = Date.UTC(2026, 0, 15, 12, 0, 0);
const bytes = (value: unknown) => Buffer.from(typeof value === 'string' ? value : JSON.stringify(value));
const status = (online: boolean) => ({
  online,
  tMs: NOW,
  hardwareTripped: false,
  hardwareTripCause: null,
  hardwareTripAxis: null,
  softwareHold: false,
  mode: 'demo',
});

function gateAt(now = NOW): FrameGate {
  return new FrameGate(() => now);
}

describe('FrameGate', () => {
  it('admits a valid fast, slow and status message', () => {
    const gate = gateAt();
    expect(gate.admit(TOPICS.fast, bytes(fastFrame(0, NOW)))?.kind).toBe('fast');
    expect(gate.admit(TOPICS.slow, bytes(slowFrame(0, NOW)))?.kind).toBe('slow');
    expect(gate.admit(TOPICS.status, bytes(status(true)))?.kind).toBe('status');
    expect(gate.counters()).toMatchObject({ accepted: 3, rejected: 0, acceptedByKind: { fast: 1, slow: 1, status: 1 } });
  });

  it.each([
    ['oversized', () => Buffer.alloc(MAX_PAYLOAD_BYTES + 1, 0x20)],
    ['malformed-json', () => bytes('{"seq": 1, "t0Ms": ')],
    ['non-finite', () => bytes(JSON.stringify(fastFrame(0, NOW)).replace('"rateHz":1000', '"rateHz":1e999'))],
    ['schema', () => bytes({ ...fastFrame(0, NOW), rateHz: 'fast' })],
    ['schema', () => bytes({ ...fastFrame(0, NOW), extra: true })],
    ['length-mismatch', () => bytes({ ...fastFrame(0, NOW), voltageV: { ...fastFrame(0, NOW).voltageV, z: [1, 2, 3] } })],
    ['clock-skew', () => bytes(fastFrame(0, NOW + MAX_FUTURE_MS + 1))],
    ['clock-skew', () => bytes(fastFrame(0, NOW - MAX_CLOCK_SKEW_MS - 1))],
  ] as const)('refuses and counts a %s fast frame', (reason, payload) => {
    const gate = gateAt();
    expect(gate.admit(TOPICS.fast, payload())).toBeNull();
    const counters = gate.counters();
    expect(counters.rejected).toBe(1);
    expect(counters.rejectedByReason[reason]).toBe(1);
    expect(counters.accepted).toBe(0);
  });

  it('classifies a non-finite number inside a sample array as non-finite', () => {
    const gate = gateAt();
    const text = JSON.stringify(fastFrame(0, NOW, { x: 7, y: 2, z: 3 })).replace('"x":[7,', '"x":[-1e999,');
    expect(gate.admit(TOPICS.fast, bytes(text))).toBeNull();
    expect(gate.counters().rejectedByReason['non-finite']).toBe(1);
  });

  it('refuses duplicate and earlier sequence numbers as out-of-order', () => {
    const gate = gateAt();
    gate.admit(TOPICS.fast, bytes(fastFrame(5, NOW)));
    expect(gate.admit(TOPICS.fast, bytes(fastFrame(5, NOW)))).toBeNull();
    expect(gate.admit(TOPICS.fast, bytes(fastFrame(4, NOW)))).toBeNull();
    gate.admit(TOPICS.slow, bytes(slowFrame(9, NOW)));
    expect(gate.admit(TOPICS.slow, bytes(slowFrame(9, NOW)))).toBeNull();
    expect(gate.counters().rejectedByReason['out-of-order']).toBe(3);
  });

  it('counts the frames missing from a sequence gap as lost', () => {
    const gate = gateAt();
    gate.admit(TOPICS.fast, bytes(fastFrame(1, NOW)));
    gate.admit(TOPICS.fast, bytes(fastFrame(2, NOW)));
    gate.admit(TOPICS.fast, bytes(fastFrame(6, NOW)));
    expect(gate.counters().lost).toBe(3);
  });

  it('accepts a restarted controller counting from zero once its status turned offline and online', () => {
    const gate = gateAt();
    gate.admit(TOPICS.status, bytes(status(true)));
    gate.admit(TOPICS.fast, bytes(fastFrame(500, NOW)));
    gate.admit(TOPICS.status, bytes(status(false)));
    gate.admit(TOPICS.status, bytes(status(true)));
    expect(gate.admit(TOPICS.fast, bytes(fastFrame(0, NOW)))?.kind).toBe('fast');
    expect(gate.counters()).toMatchObject({ rejected: 0, lost: 0 });
  });

  it('accepts an old retained status message without a clock check', () => {
    const gate = gateAt();
    expect(gate.admit(TOPICS.status, bytes({ ...status(false), tMs: NOW - 30 * 86_400_000 }))?.kind).toBe('status');
  });

  it('refuses messages on topics it does not handle', () => {
    const gate = gateAt();
    expect(gate.admit('tiltwatch/v1/controller/other', bytes({}))).toBeNull();
    expect(gate.counters().rejectedByReason['unknown-topic']).toBe(1);
  });

  describe('crafted frames: each is refused and intake goes on', () => {
    /** A gate that has admitted frames 0…9 of a healthy stream. */
    function running(): FrameGate {
      const gate = gateAt();
      for (let seq = 0; seq < 10; seq++) expect(gate.admit(TOPICS.fast, bytes(fastFrame(seq, NOW + seq * 20)))).not.toBeNull();
      return gate;
    }
    const nextIsAdmitted = (gate: FrameGate, seq = 10) => expect(gate.admit(TOPICS.fast, bytes(fastFrame(seq, NOW + seq * 20)))?.kind).toBe('fast');

    it.each([
      ['rateHz 1e-300', { rateHz: 1e-300 }],
      ['rateHz just under the lowest rate', { rateHz: 9.99 }],
      ['rateHz 0.001', { rateHz: 0.001 }],
    ])('refuses %s as out-of-range', (_name, patch) => {
      const gate = running();
      expect(gate.admit(TOPICS.fast, bytes({ ...fastFrame(10, NOW + 200), ...patch }))).toBeNull();
      expect(gate.counters().rejectedByReason['out-of-range']).toBe(1);
      nextIsAdmitted(gate);
      expect(gate.counters().lost).toBe(0);
    });

    it('refuses a frame whose last sample lies far in the future although its first does not', () => {
      const gate = running();
      // 1000 samples at 10 Hz span 100 s: the first sample is now, the last 99.9 s ahead.
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(10, NOW, undefined, 1000, 10)))).toBeNull();
      expect(gate.counters().rejectedByReason['clock-skew']).toBe(1);
      nextIsAdmitted(gate);
    });

    it('refuses a frame an hour in the future, so it cannot pin the live time', () => {
      const gate = running();
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(10, NOW + 3600_000)))).toBeNull();
      expect(gate.counters().rejectedByReason['clock-skew']).toBe(1);
      nextIsAdmitted(gate);
    });

    it('refuses a sequence number of 2^53 − 1 as a jump, and real frames go on', () => {
      const gate = running();
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(Number.MAX_SAFE_INTEGER, NOW + 200)))).toBeNull();
      expect(gate.counters().rejectedByReason['sequence-jump']).toBe(1);
      nextIsAdmitted(gate);
      expect(gate.counters()).toMatchObject({ lost: 0, resyncs: 0 });
    });

    it('counts a forward step up to the bound as lost frames', () => {
      const gate = running();
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(9 + MAX_SEQ_STEP, NOW + 200)))?.kind).toBe('fast');
      expect(gate.counters().lost).toBe(MAX_SEQ_STEP - 1);
    });

    it('recovers sequence tracking after a bounded run of refusals when 2^53 − 1 came first', () => {
      const gate = gateAt();
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(Number.MAX_SAFE_INTEGER, NOW)))?.kind).toBe('fast');
      for (let seq = 0; seq < RESYNC_AFTER; seq++) expect(gate.admit(TOPICS.fast, bytes(fastFrame(seq, NOW + seq * 20)))).toBeNull();
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(RESYNC_AFTER, NOW + RESYNC_AFTER * 20)))?.kind).toBe('fast');
      expect(gate.admit(TOPICS.fast, bytes(fastFrame(RESYNC_AFTER + 1, NOW + (RESYNC_AFTER + 1) * 20)))?.kind).toBe('fast');
      expect(gate.counters()).toMatchObject({ resyncs: 1, lost: 0, rejected: RESYNC_AFTER });
    });

    it.each([
      ['a current of 1e300 A', (f: ReturnType<typeof fastFrame>) => ({ ...f, currentA: { ...f.currentA, y: [...f.currentA.y.slice(1), 1e300] } })],
      ['a current just beyond the converter range', (f: ReturnType<typeof fastFrame>) => ({ ...f, currentA: { ...f.currentA, x: [25.001, ...f.currentA.x.slice(1)] } })],
      ['a voltage of -4e38 V (beyond a float4 column)', (f: ReturnType<typeof fastFrame>) => ({ ...f, voltageV: { ...f.voltageV, z: [-4e38, ...f.voltageV.z.slice(1)] } })],
      ['a setpoint of 1e308 A', (f: ReturnType<typeof fastFrame>) => ({ ...f, setpointA: { ...f.setpointA, x: 1e308 } })],
    ])('refuses a fast frame with %s as out-of-range', (_name, craft) => {
      const gate = running();
      expect(gate.admit(TOPICS.fast, bytes(craft(fastFrame(10, NOW + 200))))).toBeNull();
      expect(gate.counters().rejectedByReason['out-of-range']).toBe(1);
      nextIsAdmitted(gate);
    });

    it.each([
      ['a coil temperature of 3.5e38 °C', { coilTempC: { x: 3.5e38, y: 22, z: 23 } }],
      ['a flow of -5 L/min', { flowLpm: { x: 3.1, y: -5, z: 3.3 } }],
      ['a water supply of 1e300 °C', { waterSupplyC: 1e300 }],
    ])('refuses a slow frame with %s as out-of-range', (_name, patch) => {
      const gate = gateAt();
      expect(gate.admit(TOPICS.slow, bytes({ ...slowFrame(0, NOW), ...patch }))).toBeNull();
      expect(gate.counters().rejectedByReason['out-of-range']).toBe(1);
      expect(gate.admit(TOPICS.slow, bytes(slowFrame(1, NOW)))?.kind).toBe('slow');
    });

    it('records when and why it last refused a message', () => {
      const gate = running();
      expect(gate.counters()).toMatchObject({ lastRejectedAt: null, lastRejectReason: null });
      gate.admit(TOPICS.fast, bytes({ ...fastFrame(10, NOW + 200), rateHz: 1e-300 }));
      expect(gate.counters()).toMatchObject({ lastRejectedAt: new Date(NOW).toISOString(), lastRejectReason: 'out-of-range' });
      expect(gate.lastRejectedAtMs()).toBe(NOW);
    });
  });
});
