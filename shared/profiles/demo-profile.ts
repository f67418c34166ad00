import type { SampleProfile } from './sample-profile.js';

/**
 * Demo sample of the fictional Lindqvist Hall apparatus (invented data, demo only): a
 * spin-polarised 167Er Fermi gas in a crossed dipole trap, imaged along the trap's y axis
 * after 20 ms of flight. The trap axes are turned by 15° about the coil z axis, the same
 * rotation as the demo calibration's coilToTrap, so displayed field angles and the
 * prediction's angles agree in the demo.
 */
export const DEMO_PROFILE: SampleProfile = {
  name: 'Lindqvist Hall 167Er, crossed trap',
  species: '167Er',
  atomNumber: 5e4,
  trapHz: [350, 80, 400],
  trapToCoilEulerDeg: [15, 0, 0],
  tofMs: [20],
  imaging: 'y',
};
