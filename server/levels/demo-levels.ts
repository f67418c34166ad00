/**
 * The seeded level set of the fictional Lindqvist Hall apparatus (invented values, demo
 * only; a real lab sets its own). The simulator's own hardware trip levels sit beyond these
 * software trip levels, as a hardware interlock should (see simulator/coil-model.ts).
 */
import type { LevelSet } from '../../shared/levels/level-set.js';

export const DEMO_LEVEL_SET: Readonly<LevelSet> = {
  bands: {
    current: { scale: [-25, 25], normal: [-15, 15] },
    voltage: { scale: [-15, 15], normal: [-12, 12] },
    temperature: { scale: [10, 90], normal: [15, 45] },
    flow: { scale: [0, 6], normal: [2, 5] },
    waterSupply: { scale: [5, 35], normal: [14, 22] },
  },
  trips: { currentHighA: 20, temperatureHighC: 65, flowLowLpm: 1 },
  settings: { minOrientingFieldG: 0.5, maxTargetFieldG: 30, maxTargetCollapseRatio: 0.8 },
};
