import { describe, expect, it } from 'vitest';
import { PlaybackClock, SPEEDS } from './playback-clock';

const FROM = 1_000_000;
const TO = FROM + 600_000; // a 10-minute window

describe('PlaybackClock', () => {
  it('stands at the window start until played, then runs at real time', () => {
    const clock = new PlaybackClock(FROM, TO);
    expect(clock.timeAt(50)).toBe(FROM);
    clock.play(100);
    expect(clock.timeAt(1100)).toBe(FROM + 1000);
    expect(clock.playing).toBe(true);
  });

  it('runs at each offered speed', () => {
    expect(SPEEDS).toEqual([0.5, 1, 2, 5, 10, 20]);
    for (const speed of SPEEDS) {
      const clock = new PlaybackClock(FROM, TO);
      clock.setSpeed(speed, 0);
      clock.play(0);
      expect(clock.timeAt(2000)).toBeCloseTo(FROM + 2000 * speed, 6);
    }
  });

  it('changes speed without a jump in recorded time', () => {
    const clock = new PlaybackClock(FROM, TO);
    clock.play(0);
    clock.setSpeed(10, 1000); // 1 s of recorded time at 1×
    expect(clock.timeAt(1000)).toBe(FROM + 1000);
    expect(clock.timeAt(2000)).toBe(FROM + 1000 + 10_000);
  });

  it('holds still while paused and resumes from there', () => {
    const clock = new PlaybackClock(FROM, TO);
    clock.play(0);
    clock.pause(3000);
    expect(clock.timeAt(60_000)).toBe(FROM + 3000);
    clock.play(60_000);
    expect(clock.timeAt(61_000)).toBe(FROM + 4000);
  });

  it('seeks within the window, clamping outside it, and keeps playing', () => {
    const clock = new PlaybackClock(FROM, TO);
    clock.seek(FROM + 120_000, 0);
    expect(clock.timeAt(500)).toBe(FROM + 120_000);
    clock.play(500);
    clock.seek(FROM + 300_000, 1000);
    expect(clock.timeAt(1500)).toBe(FROM + 300_500);
    clock.seek(TO + 1, 2000);
    expect(clock.timeAt(2000)).toBe(TO);
    clock.seek(FROM - 1, 3000);
    expect(clock.timeAt(3000)).toBe(FROM);
  });

  it('stops at the end of the window and plays again from the start', () => {
    const clock = new PlaybackClock(FROM, TO);
    clock.setSpeed(20, 0);
    clock.play(0);
    expect(clock.timeAt(60_000)).toBe(TO); // 20 min of recorded time asked, 10 min there
    expect(clock.playing).toBe(false);
    clock.play(61_000);
    expect(clock.timeAt(61_000)).toBe(FROM);
  });

  it('refuses a speed that is not positive', () => {
    expect(() => new PlaybackClock(FROM, TO).setSpeed(0, 0)).toThrow(/positive/);
  });
});
