export { startSimulator, type RunningSimulator, type SimulatorOptions } from './controller.js';
export { DEMO_PARAMETERS, type ControllerParameters } from '../shared/apparatus/coil-data.js';
export { FaultSpec, type FaultKind } from './faults.js';
