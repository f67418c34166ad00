import { createServer, type Server } from 'node:http';
import path from 'node:path';
import type { Logger } from 'pino';
import { startBroker, type RunningBroker } from '../broker/broker.js';
import { listenProblem } from '../shared/net/listen-problem.js';
import type { MqttProtocolLevel } from '../shared/telemetry/mqtt-protocol.js';
import { loadOrCreateCredentials, type BrokerCredentials } from '../broker/credentials.js';
import { AccessControl } from './auth/access-control.js';
import { authHandlers } from './auth/auth-routes.js';
import { loadOrCreateJwtSecret } from './auth/jwt-secret.js';
import { LoginUseCase } from './auth/login.js';
import { TokenIssuer } from './auth/tokens.js';
import { SecurityLog } from './auth/security-log.js';
import { DEFAULT_THROTTLE_RULES, SignInThrottle } from './auth/sign-in-throttle.js';
import { SignInThrottleStore } from './auth/sign-in-throttle-store.js';
import { hasEnabledAdmin, seedDemoAccounts } from './auth/users-repository.js';
import { calibrationHandlers } from './calibration/calibration-routes.js';
import { shotHandlers } from './shots/shot-routes.js';
import { seedDemoCalibration } from './calibration/calibration-repository.js';
import type { ServerConfig } from './config.js';
import { lockDataFolder } from './data-folder/data-folder-lock.js';
import { checkListenSlots, listenSlots } from './start-checks/listen-check.js';
import { openDatabase, type OpenDatabase } from './db/database.js';
import { LiveFanout, type FanoutOptions } from './fanout/live-fanout.js';
import { CalibrationCache } from './field/calibration-cache.js';
import { EventLoopWatch } from './health/event-loop-watch.js';
import { healthHandlers, healthProblems, type HealthReport } from './health/health-route.js';
import { createApp } from './http/app.js';
import { FrameGate, type AdmittedMessage } from './ingest/frame-gate.js';
import { startSupervision } from './interlock/start-supervision.js';
import { startIngest } from './ingest/mqtt-ingest.js';
import { LiveStore } from './live/live-store.js';
import { liveHandlers } from './live/live-routes.js';
import { createLogger } from './logging/logger.js';
import { logbookHandlers } from './logbook/logbook-routes.js';
import { handoverHandlers } from './handover/handover-routes.js';
import { HandoverWorkflow } from './handover/handover-workflow.js';
import { TelemetryPipeline } from './pipeline/telemetry-pipeline.js';
import { LevelStore } from './levels/level-store.js';
import { LivePredictionFeed } from './prediction/live-prediction-feed.js';
import { CriticalCache } from './prediction/critical-cache.js';
import { PredictionEngine } from './prediction/prediction-engine.js';
import { PredictionHistoryRing } from './prediction/prediction-history.js';
import { PredictionStatusLog } from './prediction/prediction-status-log.js';
import { predictionHandlers } from './prediction/prediction-routes.js';
import { ActiveProfileLoader } from './profiles/active-profile.js';
import { seedDemoProfile } from './profiles/profile-repository.js';
import { profileHandlers } from './profiles/profile-routes.js';
import { projectRoot } from './project-root.js';
import { seriesHandlers } from './series/series-routes.js';
import { historyHandlers } from './history/history-routes.js';
import { RollupAccumulator } from './storage/rollup-accumulator.js';
import { startSteering } from './steering/start-steering.js';
import { TelemetryWriter } from './storage/telemetry-writer.js';
import { listenForAccountChanges } from './users/account-change-listener.js';
import { AccountEvents } from './users/account-events.js';
import { UserAccounts } from './users/user-accounts.js';
import { userHandlers } from './users/user-routes.js';

export interface StartOptions {
  /** Log destination; default a pino logger at `config.logLevel` on stdout. */
  log?: Logger;
  /**
   * `--demo`: create the demo accounts on a database without any account, and let them sign
   * in. Default false: demo accounts (`<role>@tiltwatch.example`) cannot sign in, their tokens
   * are refused and the Users page does not list them, as if they did not exist.
   */
  demoAccounts?: boolean;
  /** WebSocket pacing and limits (defaults: 5 s to sign in, ≥ 33 ms between messages, 1 MB buffer). */
  fanout?: FanoutOptions;
  /**
   * A database the caller opened (and closes) instead of the one of `config`; tests use it to
   * reach the same database, e.g. to make writes fail.
   */
  database?: OpenDatabase;
}

/** A started server; its owner must call `close()`. */
export interface RunningServer {
  /** HTTP and WebSocket port actually bound. */
  port: number;
  /** Address to open, e.g. `http://127.0.0.1:4280`. */
  url: string;
  /** The MQTT broker the server subscribes to (embedded or external). */
  mqttUrl: string;
  /** Accounts of the embedded broker; null with an external broker. */
  brokerCredentials: BrokerCredentials | null;
  /** True when the demo accounts were created by this start (first start on this database). */
  seededDemoAccounts: boolean;
  /** False when no enabled admin account exists (create the first admin with `npm run users`). */
  hasAdmin: boolean;
  /** The same report as `GET /api/health`. */
  counters(): HealthReport;
  /**
   * Ends supervision (alarms and the software interlock stop evaluating) while everything else
   * runs on: call it before stopping the controller on a clean stop, so the stop neither trips
   * nor mails on-call. `close()` does it first as well.
   */
  endSupervision(): void;
  /** Stops everything in reverse order of start; resolves when nothing is left running. */
  close(): Promise<void>;
}

/** Built Angular app served at `/`. */
export const WEB_ROOT = path.join(projectRoot(), 'dist', 'tiltwatch', 'browser');

/**
 * Starts Tiltwatch's server: takes the data folder, opens and migrates the database, seeds the
 * demo calibration and sample profile on first start (and the demo accounts with `demoAccounts`), starts the embedded broker
 * (unless MQTT_URL names an external one) and the prediction worker, subscribes to telemetry,
 * and serves the API, the WebSocket and the web app. `config.port` 0 picks a free port. If any
 * step fails, what was started is closed.
 */
export async function startServer(config: ServerConfig, opts: StartOptions = {}): Promise<RunningServer> {
  const log = opts.log ?? createLogger(config.logLevel);
  const startedAt = performance.now();
  const closers: (() => unknown)[] = [];
  let closing: Promise<void> | undefined;
  const close = () => {
    closing ??= (async () => {
      for (const closer of closers.reverse()) {
        try {
          await closer();
        } catch (error) {
          log.error({ err: error }, 'error while shutting down');
        }
      }
    })();
    return closing;
  };

  try {
    // A bad HOST or MQTT_HOST is refused before anything starts.
    await checkListenSlots(listenSlots(config), { portsToo: false });
    const lock = lockDataFolder(config.dataDir);
    closers.push(() => lock.release());
    const tokens = new TokenIssuer(loadOrCreateJwtSecret(config.dataDir));

    const database =
      opts.database ??
      (await openDatabase({
        dataDir: config.dataDir,
        databaseUrl: config.databaseUrl,
        onRetry: (reason, delayMs) => log.warn(`PostgreSQL at DATABASE_URL cannot be reached (${reason}); trying again in ${delayMs / 1000} s`),
        onHealthChange: (db) =>
          db.state === 'up'
            ? log.info({ outageSince: db.since }, 'PostgreSQL reachable again; storage resumes')
            : log.error(`PostgreSQL at DATABASE_URL cannot be reached (${db.lastError}); supervision goes on from memory`),
      }));
    if (!opts.database) closers.push(() => database.close());
    const { db } = database;
    await seedDemoCalibration(db);
    await seedDemoProfile(db);
    const seededDemoAccounts = opts.demoAccounts === true && (await seedDemoAccounts(db, config.demoPassword));
    const demo = opts.demoAccounts === true;
    const hasAdmin = await hasEnabledAdmin(db, demo);
    const calibrations = new CalibrationCache(db);
    await calibrations.reload();

    const rollups = new RollupAccumulator();
    // Telemetry lives in the storage worker thread (its own database connection, retention included).
    const writer = new TelemetryWriter(config, rollups, {
      onError: (error) => log.error({ err: error }, 'storing telemetry failed'),
      onOutageChange: (outage, error) =>
        outage ? log.error({ err: error }, 'the database does not take telemetry writes; queuing them') : log.info('the database takes telemetry writes again'),
    });
    closers.push(() => writer.close());
    await writer.ready();

    let broker: RunningBroker | null = null;
    let brokerCredentials: BrokerCredentials | null = null;
    let mqtt: { url: string; username: string | null; password: string | null; protocolVersion: MqttProtocolLevel };
    if (config.mqtt.mode === 'embedded') {
      brokerCredentials = await loadOrCreateCredentials(config.dataDir);
      const started = await startBroker({
        port: config.mqtt.port,
        host: config.mqtt.host,
        credentials: brokerCredentials,
        log: (msg, fields) => log.debug(fields ?? {}, msg),
      });
      broker = started;
      closers.push(() => started.close());
      mqtt = { url: started.url, ...brokerCredentials.server, protocolVersion: 4 };
    } else {
      mqtt = config.mqtt;
    }

    const access = new AccessControl(db, tokens, demo);
    const accountEvents = new AccountEvents();
    if (config.databaseUrl !== null) {
      // Changes by the `users` command in another process are heard at once (the minute's re-check stays as fallback).
      const listener = listenForAccountChanges(config.databaseUrl, accountEvents, log);
      closers.push(() => listener.close());
      await listener.ready;
    }
    const accounts = new UserAccounts(db, accountEvents, demo);
    const security = new SecurityLog(db, log);
    closers.push(() => security.drain());
    const throttleRules = { ...DEFAULT_THROTTLE_RULES, addressFailures: config.loginAttemptsPerMinute };
    const throttleStore = new SignInThrottleStore(db, log);
    closers.push(() => throttleStore.drain());
    const throttle = new SignInThrottle(
      throttleRules,
      (event) => {
        const { kind, ...detail } = event;
        security.record({ kind, email: 'email' in event ? event.email : null, address: event.address, detail });
      },
      Date.now,
      (change) => throttleStore.save(change),
    );
    throttle.restore(await throttleStore.load(throttleRules, Date.now()));
    const live = new LiveStore();
    const httpServer = createServer();
    const fanout = new LiveFanout(httpServer, access, live, log, opts.fanout, accountEvents);
    closers.push(() => fanout.close());
    // Closed after ingest stops and before the fan-out it publishes to.
    const criticalCache = new CriticalCache();
    const engine = new PredictionEngine({ log, criticalCache });
    closers.push(() => engine.close());
    const history = new PredictionHistoryRing();
    // One source of the lead-set levels: the interlock's trip levels, the bands, and the least
    // field that orients the dipoles, below which the prediction is shown as not applying.
    const levels = await LevelStore.load(db);
    const minOrientingField = () => levels.inForce().levels.settings.minOrientingFieldG;
    const statusLog = new PredictionStatusLog({ db, retentionDays: config.retention.rollupDays, onError: (error) => log.error({ err: error }, 'storing a prediction status change failed') });
    closers.push(() => statusLog.close());
    const prediction = new LivePredictionFeed({ engine, live, history, store: writer, statusLog, fanout, staleMs: config.staleTripMs, minOrientingFieldG: minOrientingField() });
    closers.push(() => prediction.close());
    levels.onChange(() => prediction.setMinOrientingField(minOrientingField()));
    const profiles = new ActiveProfileLoader(db, prediction);
    await profiles.reload();
    const pipeline = new TelemetryPipeline({ calibrations, live, rollups, writer, fanout, prediction });
    const gate = new FrameGate();
    const steering = await startSteering({ db, live, calibrations, prediction, criticalCache, log });
    closers.push(() => steering.close());
    // Alarms and the software interlock evaluate what the pipeline made of each message.
    const supervision = await startSupervision({
      db,
      live,
      sink: fanout,
      config,
      log,
      levels,
      databaseOutageS: database.health ? () => database.health!.outageSeconds() : undefined,
      steering: steering.context,
    });
    closers.push(() => supervision.close());
    const deliver = (message: AdmittedMessage) => supervision.supervisor.observe(pipeline.handle(message));
    const ingest = await startIngest({ ...mqtt, gate, deliver, log });
    closers.push(() => ingest.close());
    supervision.supervisor.attach(ingest);
    supervision.supervisor.start();
    steering.connect({ link: ingest, interlock: supervision.interlock, alarmLimits: () => supervision.book.limits(), levels: () => supervision.levels.inForce() });
    const endSupervision = () => supervision.supervisor.close();
    // Closers run in reverse: supervision ends before ingest and the controller link go away.
    closers.push(endSupervision);

    const eventLoop = new EventLoopWatch();
    closers.push(() => eventLoop.close());
    const report = (): HealthReport => {
      const fanoutCounters = fanout.counters();
      const frames = { ...gate.counters(), deliveryErrors: ingest.deliveryErrors() };
      const storage = writer.counters();
      const databaseHealth = database.health?.report() ?? null;
      const records = supervision.records();
      const problems = healthProblems({
        nowMs: Date.now(),
        frames,
        lastRejectedAtMs: gate.lastRejectedAtMs(),
        lastDeliveryErrorAtMs: ingest.lastDeliveryErrorAtMs(),
        storage,
        supervision: records,
        database: databaseHealth,
      });
      return {
        status: problems.length === 0 ? 'ok' : 'degraded',
        problems,
        uptimeS: Math.round((performance.now() - startedAt) / 1000),
        frames,
        clients: fanoutCounters.clients,
        broker: broker?.counters() ?? null,
        db: database.kind,
        database: databaseHealth,
        mqttConnected: ingest.connected(),
        fanout: fanoutCounters,
        storage,
        supervision: records,
        eventLoop: eventLoop.report(),
      };
    };
    const app = createApp({
      handlers: {
        ...healthHandlers(report),
        ...authHandlers({ login: new LoginUseCase(db, tokens, throttle, security, demo), accounts, tokens }),
        ...userHandlers({ db, accounts, throttle, security }),
        ...liveHandlers(live),
        ...seriesHandlers(calibrations, writer),
        ...historyHandlers({ db, writer, statusLog, calibrations, levels, retention: config.retention }),
        ...calibrationHandlers(db, async () => void (await calibrations.reload())),
        ...profileHandlers(db, () => profiles.reload()),
        ...predictionHandlers(history),
        ...supervision.handlers,
        ...steering.handlers,
        ...shotHandlers({ db }),
        ...logbookHandlers({ db, targets: { db, alarmIds: () => supervision.book.limits().map((l) => l.id) } }),
        ...handoverHandlers({
          workflow: new HandoverWorkflow({ db, live, book: supervision.book, interlock: supervision.interlock, flush: () => supervision.flushRecords() }),
          mailer: supervision.mailer,
          notice: supervision.notice,
        }),
      },
      access,
      webRoot: WEB_ROOT,
      log,
    });
    httpServer.on('request', app);
    await listen(httpServer, config.port, config.host);
    closers.push(() => stopHttp(httpServer, fanout));

    const address = httpServer.address();
    const port = typeof address === 'object' && address !== null ? address.port : config.port;
    const url = `http://${displayHost(config.host)}:${port}`;
    log.info({ url, mqtt: mqtt.url, db: database.kind, dataDir: config.dataDir }, 'Tiltwatch server started');
    return { port, url, mqttUrl: mqtt.url, brokerCredentials, seededDemoAccounts, hasAdmin, counters: report, endSupervision, close };
  } catch (error) {
    await close();
    throw error;
  }
}

function listen(server: Server, port: number, host: string): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', (error) => reject(new Error(listenProblem('The web server', { port: 'PORT', host: 'HOST' }, host, port, error))));
    server.listen(port, host, () => resolve());
  });
}

/** Stops accepting, ends open HTTP connections and WebSockets, and waits until all are gone. */
async function stopHttp(server: Server, fanout: LiveFanout): Promise<void> {
  const closed = new Promise<void>((resolve) => server.close(() => resolve()));
  server.closeAllConnections();
  await fanout.close();
  await closed;
}

/** A host to print in an address a person can open. */
function displayHost(host: string): string {
  if (host === '0.0.0.0' || host === '::' || host === '') return 'localhost';
  return host.includes(':') ? `[${host}]` : host;
}
