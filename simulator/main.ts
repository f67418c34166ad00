import { startSimulator, type RunningSimulator } from './controller.js';
import { simulatorOptionsFromEnv } from './environment.js';

/** `npm run simulator`: the simulated controller as its own process, configured by environment. */
const log = (msg: string, fields?: object) =>
  console.log(JSON.stringify({ time: new Date().toISOString(), part: 'simulator', msg, ...fields }));

let simulator: RunningSimulator;
try {
  const options = await simulatorOptionsFromEnv(process.env);
  simulator = await startSimulator({ ...options, log });
  log('simulated controller running', { mqttUrl: options.mqttUrl, control: simulator.controlUrl, demo: options.demo });
} catch (error) {
  console.error(`simulator: ${(error as Error).message}`);
  process.exit(2);
}

let stopping = false;
const stop = (signal: string) => {
  if (stopping) return;
  stopping = true;
  log('stopping', { signal });
  simulator.close().then(
    () => process.exit(0),
    (error: Error) => {
      console.error(`simulator: ${(error as Error).message}`);
      process.exit(1);
    },
  );
};
process.on('SIGINT', () => stop('SIGINT'));
process.on('SIGTERM', () => stop('SIGTERM'));
