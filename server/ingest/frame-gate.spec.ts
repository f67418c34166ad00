import { describe, expect, it } from 'vitest';
import { MAX_PAYLOAD_BYTES } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { fastFrame, slowFrame } from '../testing/frames.js';
import { FrameGate, MAX_CLOCK_SKEW_MS } from './frame-gate.js';

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
    ['clock-skew', () => bytes(fastFrame(0, NOW + MAX_CLOCK_SKEW_MS + 1))],
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
});
