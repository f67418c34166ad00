export { startSimulator, type RunningSimulator, type SimulatorOptions } from './controller.js';
export { DEMO_PARAMETERS, type ControllerParameters } from './parameters.js';
export { FaultSpec, type FaultKind } from './faults.js';
