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
  // Closing waits for the broker when it can; never for longer than this (the broker may be gone).
  setTimeout(() => {
    log('stopped without a clean MQTT goodbye', { signal });
    process.exit(1);
  }, 5000).unref();
  simulator.close().then(
    () => process.exit(0),
    (error: Error) => {
      console.error(`simulator: ${(error as Error).message}`);
      process.exit(1);
    },
  );
};
process.on('SIGINT', () => stop('SIGINT'));
// Started by the server (`--demo`): stop when the server is gone, however it ended.
const parentPid = Number(process.env.SIM_PARENT_PID);
if (Number.isInteger(parentPid) && parentPid > 0) {
  setInterval(() => {
    if (process.ppid !== parentPid) stop('server exited');
  }, 500).unref();
}
process.on('SIGTERM', () => stop('SIGTERM'));
