/**
 * `npm run serve`: the Tiltwatch server, configured by environment variables (README).
 * `--demo` (used by `npm start`) also runs the simulated controller as a child process
 * against the embedded broker, and stops it on exit — after supervision has ended, so a clean
 * stop neither trips the interlock nor mails on-call.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { ConfigError, loadConfig } from './config.js';
import { DataFolderLockedError } from './data-folder/data-folder-lock.js';
import { projectRoot } from './project-root.js';
import { startServer, type RunningServer } from './server.js';
import { DEMO_ACCOUNTS } from './auth/users-repository.js';
import { demoConflicts } from './start-checks/demo-options.js';

const USAGE = 'usage: node --import tsx server/main.ts [--demo]';

const args = process.argv.slice(2);
const unknown = args.filter((a) => a !== '--demo');
if (unknown.length > 0) {
  console.error(`tiltwatch: unknown argument ${unknown.join(' ')}\n${USAGE}`);
  process.exit(2);
}
const demo = args.includes('--demo');

let stopping = false;
let server: RunningServer;
let simulator: ChildProcess | null = null;
try {
  const config = loadConfig();
  demoConflicts(config, demo);
  server = await startServer(config, { demoAccounts: demo });
  if (demo && server.brokerCredentials) {
    simulator = spawn(process.execPath, ['--import', 'tsx', path.join('simulator', 'main.ts')], {
      cwd: projectRoot(),
      stdio: 'inherit',
      // Its own process group: Ctrl-C in the terminal reaches only the server, which ends
      // supervision before it stops the simulator (a controller vanishing under supervision trips).
      detached: true,
      env: {
        ...process.env,
        MQTT_URL: server.mqttUrl,
        MQTT_USERNAME: server.brokerCredentials.controller.username,
        MQTT_PASSWORD: server.brokerCredentials.controller.password,
        SIM_DEMO: 'on',
        // The simulator stops when this process is gone, even after kill -9, instead of living
        // on as an orphan that holds SIM_CONTROL_PORT (simulator/main.ts).
        SIM_PARENT_PID: String(process.pid),
      },
    });
    simulator.on('exit', (code, signal) => {
      if (!stopping) console.error(`tiltwatch: the simulator stopped (${signal ?? `exit code ${code}`}); the server keeps running`);
      simulator = null;
    });
  }
  const accounts = DEMO_ACCOUNTS.map((a) => a.email).join(', ');
  const accountNote = !server.hasAdmin
    ? 'No enabled admin account: create the first admin with  npm run users -- add EMAIL --role admin  (stop the server first when it uses the data folder)'
    : server.seededDemoAccounts
      ? `Demo accounts created (demo only): ${accounts} — password from TILTWATCH_DEMO_PASSWORD (default tiltwatch-demo)`
      : '';
  console.log(
    `\nTiltwatch is running: open ${server.url}\n` +
      `${accountNote}${demo ? '\nSimulated controller: running the demo program' : ''}\n`,
  );
} catch (error) {
  if (error instanceof ConfigError || error instanceof DataFolderLockedError) {
    console.error(`tiltwatch: ${error.message}`);
    process.exit(2);
  }
  console.error(`tiltwatch: cannot start: ${(error as Error).message}`);
  process.exit(1);
}

async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`tiltwatch: ${signal} received, shutting down`);
  server.endSupervision();
  const child = simulator;
  if (child) {
    const exited = new Promise((resolve) => child.once('exit', resolve));
    child.kill('SIGTERM');
    await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 5000).unref())]);
  }
  await server.close();
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('SIGHUP', () => void stop('SIGHUP'));
