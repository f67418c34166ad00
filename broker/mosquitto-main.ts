/**
 * `npm run mosquitto:config -- FOLDER`: writes a password file, an access list and a
 * configuration for Eclipse Mosquitto 2 into FOLDER, with the two MQTT accounts of the data
 * folder (TILTWATCH_DATA_DIR, default ./data; created on first use as for the embedded broker)
 * and the embedded broker's topic access list. MQTT_PORT / MQTT_HOST choose the listener
 * (default 1883 on 127.0.0.1). Then: `mosquitto -c FOLDER/tiltwatch.conf`, and start Tiltwatch
 * with MQTT_URL, MQTT_USERNAME=server and MQTT_PASSWORD from the data folder's credentials.
 */
import path from 'node:path';
import { credentialsFile, loadOrCreateCredentials } from './credentials.js';
import { writeMosquittoFiles } from './mosquitto-config.js';

const folder = process.argv[2];
if (!folder || process.argv.length > 3) {
  console.error('usage: npm run mosquitto:config -- FOLDER   (TILTWATCH_DATA_DIR, MQTT_PORT, MQTT_HOST as for the broker)');
  process.exit(2);
}
const port = Number(process.env.MQTT_PORT ?? '1883');
if (!Number.isInteger(port) || port < 1 || port > 65535) {
  console.error(`MQTT_PORT must be a port number 1…65535, got ${JSON.stringify(process.env.MQTT_PORT)}`);
  process.exit(2);
}
const host = process.env.MQTT_HOST?.trim() || '127.0.0.1';
const dataDir = path.resolve(process.env.TILTWATCH_DATA_DIR ?? './data');
try {
  const credentials = await loadOrCreateCredentials(dataDir);
  const files = await writeMosquittoFiles(path.resolve(folder), credentials, { port, host });
  console.log(
    [
      `Wrote ${files.passwordFile}, ${files.aclFile} and ${files.configFile}`,
      `(accounts from ${credentialsFile(dataDir)}). Make them readable by the user mosquitto runs as, then:`,
      `  mosquitto -c ${files.configFile}`,
      `  MQTT_URL=mqtt://${host}:${port} MQTT_USERNAME=${credentials.server.username} MQTT_PASSWORD=… npm run serve`,
      'Add MQTT_PROTOCOL_VERSION=5 to use MQTT 5 (mosquitto speaks 3.1.1 and 5).',
    ].join('\n'),
  );
} catch (error) {
  console.error(`mosquitto:config: ${(error as Error).message}`);
  process.exit(1);
}
