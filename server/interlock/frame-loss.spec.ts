import { describe, expect, it } from 'vitest';
import { FrameLossWindow } from './frame-loss.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);

describe('FrameLossWindow', () => {
  it('counts the frames missing between sequence numbers', () => {
    const w = new FrameLossWindow(1000);
    w.observe(10, T0);
    w.observe(11, T0 + 20);
    w.observe(15, T0 + 100);
    expect(w.lostWithin(T0 + 100)).toBe(3);
  });

  it('forgets losses older than the window', () => {
    const w = new FrameLossWindow(1000);
    w.observe(10, T0);
    w.observe(14, T0 + 100);
    expect(w.lostWithin(T0 + 1099)).toBe(3);
    expect(w.lostWithin(T0 + 1100)).toBe(0);
  });

  it('treats a lower sequence number as a controller restart, not a loss', () => {
    const w = new FrameLossWindow(1000);
    w.observe(5000, T0);
    w.observe(0, T0 + 100);
    w.observe(1, T0 + 120);
    expect(w.lostWithin(T0 + 120)).toBe(0);
  });

  it('counts nothing for the first frame or a repeated one', () => {
    const w = new FrameLossWindow(1000);
    w.observe(42, T0);
    w.observe(42, T0 + 20);
    expect(w.lostWithin(T0 + 20)).toBe(0);
  });
});
