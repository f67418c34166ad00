/**
 * The server process of the pipeline benchmark: a real server (embedded broker, PGlite with
 * the storage worker) in the data folder given as the first argument. Prints one JSON line
 * `{ url, mqttUrl, controller, pid }` once it listens; closes cleanly (the writer drains) on SIGTERM.
 */
import { startTestServer } from '../../../server/testing/test-server.js';

const dataDir = process.argv[2];
if (!dataDir) throw new Error('usage: bench-server.ts DATA_DIR');
const server = await startTestServer(dataDir, undefined, { LOG_LEVEL: 'error' });
const controller = server.brokerCredentials?.controller;
if (!controller) throw new Error('the embedded broker gave no controller account');
console.log(JSON.stringify({ url: server.url, mqttUrl: server.mqttUrl, controller, pid: process.pid }));
process.on('SIGTERM', () => {
  void server.close().then(() => process.exit(0));
});
