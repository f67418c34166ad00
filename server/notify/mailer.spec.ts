import { afterEach, describe, expect, it } from 'vitest';
import net from 'node:net';
import { pino } from 'pino';
import { Mailer, type MailTransport } from './mailer.js';
import { LocalMailbox } from './local-mailbox.js';
import { composeTripNotice, SUPERVISORY_CAUTION } from './compose-notice.js';
import { Interlock } from '../interlock/interlock.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);
const FROM = 'tiltwatch@lindqvist-hall.example';
const ON_CALL = ['oncall@lindqvist-hall.example', 'ines.aalto@lindqvist-hall.example'];

/** A real pino logger whose lines land in `lines`. */
function capturedLog() {
  const lines: { level: number; msg: string; [key: string]: unknown }[] = [];
  const log = pino({ level: 'info' }, { write: (line: string) => void lines.push(JSON.parse(line)) });
  return { log, lines };
}

/** A TCP port that was free a moment ago and has nothing listening now. */
async function deadPort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

function tripNotice() {
  const interlock = new Interlock();
  const trip = interlock.evaluate(
    { values: { 'temperature.z': 66.2, 'flow.z': 2.9 }, lastFrameAtMs: T0 - 20, controllerOnline: true, hardwareTripped: false },
    T0,
  )!;
  return composeTripNotice(trip, { onCall: ON_CALL, site: 'Lindqvist Hall dipolar lab', timeZone: 'Europe/Stockholm' });
}

const owned: { close(): Promise<void> }[] = [];
afterEach(async () => {
  while (owned.length) await owned.pop()!.close();
});

describe('Mailer with the local mailbox', () => {
  it('delivers a trip notice over real SMTP to the mailbox', async () => {
    const mailbox = await LocalMailbox.start();
    owned.push(mailbox);
    const { log } = capturedLog();
    const mailer = new Mailer({ transport: mailbox.url, from: FROM, log });
    owned.push(mailer);

    const notice = tripNotice();
    mailer.send(notice);
    await mailer.idle();

    const [received] = mailbox.messages();
    expect(received).toMatchObject({ from: FROM, to: ON_CALL, subject: notice.subject });
    expect(received.text).toContain('First out:  Coil temperature z: 66.2 °C (trips above 65.0 °C)');
    expect(received.text).toContain(SUPERVISORY_CAUTION);
    expect(mailer.stats()).toEqual({ sent: 1, failed: 0, dropped: 0, queued: 0 });
  });

  it('keeps only the newest messages up to its capacity, newest first', async () => {
    const mailbox = await LocalMailbox.start({ capacity: 2 });
    owned.push(mailbox);
    const mailer = new Mailer({ transport: mailbox.url, from: FROM, log: capturedLog().log });
    owned.push(mailer);
    for (const n of [1, 2, 3]) mailer.send({ to: ON_CALL, subject: `notice ${n}`, text: 'test' });
    await mailer.idle();
    expect(mailbox.messages().map((m) => m.subject)).toEqual(['notice 3', 'notice 2']);
  });

  it('listens on loopback only', async () => {
    const mailbox = await LocalMailbox.start();
    owned.push(mailbox);
    expect(mailbox.url).toBe(`smtp://127.0.0.1:${mailbox.port}`);
    expect(mailbox.port).toBeGreaterThan(0);
  });
});

describe('Mailer failures', () => {
  it('retries a send to a port with nothing listening, logs each failure and never throws', async () => {
    const { log, lines } = capturedLog();
    const mailer = new Mailer({ transport: `smtp://127.0.0.1:${await deadPort()}`, from: FROM, log, attempts: 3, backoffMs: 5 });
    owned.push(mailer);

    expect(() => mailer.send(tripNotice())).not.toThrow();
    await mailer.idle();

    expect(mailer.stats()).toEqual({ sent: 0, failed: 1, dropped: 0, queued: 0 });
    const failures = lines.filter((l) => l.level >= 40);
    expect(failures.map((l) => [l.level, l.attempt])).toEqual([
      [40, 1],
      [40, 2],
      [50, 3],
    ]);
    expect(failures[2].msg).toBe('mail given up after 3 attempt(s)');
    expect(failures[0].retryInMs).toBe(5);
    expect(failures[1].retryInMs).toBe(10);
  });

  it('returns from send before the transport has answered', async () => {
    let release: () => void = () => undefined;
    const transport: MailTransport = {
      sendMail: () => new Promise((resolve) => (release = () => resolve({}))),
      close: () => undefined,
    };
    const mailer = new Mailer({ transport, from: FROM, log: capturedLog().log });
    owned.push(mailer);
    mailer.send(tripNotice());
    expect(mailer.stats()).toMatchObject({ sent: 0, queued: 0 });
    release();
    await mailer.idle();
    expect(mailer.stats().sent).toBe(1);
  });

  it('drops the oldest waiting message when the queue is full and logs it', async () => {
    const pending: (() => void)[] = [];
    const subjects: string[] = [];
    const transport: MailTransport = {
      sendMail: (m) => {
        subjects.push(m.subject);
        return new Promise((resolve) => pending.push(() => resolve({})));
      },
      close: () => undefined,
    };
    const { log, lines } = capturedLog();
    const mailer = new Mailer({ transport, from: FROM, log, maxQueue: 2 });
    owned.push(mailer);
    for (const n of [1, 2, 3, 4]) mailer.send({ to: ON_CALL, subject: `notice ${n}`, text: '' });
    while (pending.length) {
      pending.shift()!();
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
    await mailer.idle();
    expect(subjects).toEqual(['notice 1', 'notice 3', 'notice 4']);
    expect(mailer.stats()).toMatchObject({ sent: 3, dropped: 1 });
    expect(lines.some((l) => l.msg === 'mail dropped: the outgoing queue is full' && l.subject === 'notice 2')).toBe(true);
  });

  it('stops waiting for a retry when closed', async () => {
    const { log, lines } = capturedLog();
    const mailer = new Mailer({ transport: `smtp://127.0.0.1:${await deadPort()}`, from: FROM, log, backoffMs: 3_600_000 });
    mailer.send(tripNotice());
    while (!lines.some((l) => l.msg === 'mail send failed; will retry')) await new Promise<void>((resolve) => setImmediate(resolve));
    await mailer.close();
    expect(mailer.stats()).toMatchObject({ sent: 0, failed: 1 });
  });

  it('does not queue a message without recipients and says to configure the on-call list', () => {
    const { log, lines } = capturedLog();
    const mailer = new Mailer({ transport: { sendMail: async () => ({}), close: () => undefined }, from: FROM, log });
    owned.push(mailer);
    mailer.send({ to: [], subject: 'nobody', text: '' });
    expect(mailer.stats().queued).toBe(0);
    expect(lines.at(-1)?.msg).toMatch(/configure the on-call list/);
  });
});
