/**
 * `npm start` runs this before it builds the web app, so a second start, a port in use or a
 * bad variable is reported at once instead of after the build: loads the configuration, checks
 * that the data folder is free (without taking it) and that every port the start will listen on
 * is free. Exit code 2 with a message naming the variable to change; 0 when the start can go on.
 */
import { ConfigError, loadConfig } from '../config.js';
import { dataFolderInUse } from '../data-folder/data-folder-lock.js';
import { checkListenSlots, listenSlots } from './listen-check.js';
import { demoConflicts, simulatorControlPort } from './demo-options.js';

const demo = process.argv.includes('--demo');
try {
  const config = loadConfig();
  demoConflicts(config, demo);
  const inUse = dataFolderInUse(config.dataDir);
  if (inUse) throw new ConfigError([inUse]);
  await checkListenSlots(listenSlots(config, demo ? simulatorControlPort(process.env) : null), { portsToo: true });
} catch (error) {
  if (!(error instanceof ConfigError)) throw error;
  console.error(`tiltwatch: ${error.message}`);
  process.exit(2);
}
