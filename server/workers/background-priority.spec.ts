import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import { PredictionEngine } from '../prediction/prediction-engine.js';
import { BACKGROUND_NICE } from './background-priority.js';

/** Nice value of each thread of this process (field 19 of its stat line, `man 5 proc`), by thread id. */
function threadNices(): Map<number, number> {
  const out = new Map<number, number>();
  for (const tid of readdirSync('/proc/self/task')) {
    try {
      out.set(Number(tid), Number(readFileSync(`/proc/self/task/${tid}/stat`, 'utf8').split(') ')[1].split(' ')[16]));
    } catch {
      // the thread ended while we looked
    }
  }
  return out;
}

describe.runIf(process.platform === 'linux')('background thread priority', () => {
  it('runs the prediction worker thread at the background nice value and leaves the event loop thread alone', async () => {
    const before = threadNices();
    const mainNice = before.get(process.pid);
    const engine = new PredictionEngine();
    try {
      engine.setProfile(1, DEMO_PROFILE);
      engine.updateDirection({ thetaDeg: 0, phiDeg: 0 }, 0);
      await new Promise((resolve) => engine.onPrediction(resolve));
      const lowered = [...threadNices()].filter(([tid, nice]) => !before.has(tid) && nice === BACKGROUND_NICE);
      expect(lowered.length).toBeGreaterThanOrEqual(1);
      expect(threadNices().get(process.pid)).toBe(mainNice);
    } finally {
      await engine.close();
    }
  });
});
