/**
 * Best-effort outgoing mail. `send()` only queues: delivery runs in the background, one
 * message at a time, with retries and exponential backoff; failures are logged and counted,
 * never thrown, so alarm and interlock handling never waits for a mail server.
 */
import { createTransport } from 'nodemailer';

export interface MailMessage {
  to: readonly string[];
  subject: string;
  text: string;
}

/** The part of a nodemailer transporter the mailer uses. */
export interface MailTransport {
  sendMail(message: { from: string; to: string[]; subject: string; text: string }): Promise<unknown>;
  close(): void;
}

/** A pino logger fits. */
export interface MailLog {
  info(details: object, message: string): void;
  warn(details: object, message: string): void;
  error(details: object, message: string): void;
}

export interface MailerOptions {
  /** SMTP URL (e.g. the mailbox's `smtp://127.0.0.1:PORT`, or `SMTP_URL`) or a transport. */
  transport: string | MailTransport;
  /** Sender address, e.g. `tiltwatch@lindqvist-hall.example`. */
  from: string;
  log: MailLog;
  /** Tries per message, first one included (default 3). */
  attempts?: number;
  /** Wait before the first retry, ms; doubles for each further retry (default 2000). */
  backoffMs?: number;
  /** Messages waiting beyond this are dropped oldest first and logged (default 200). */
  maxQueue?: number;
}

export interface MailerStats {
  sent: number;
  failed: number;
  dropped: number;
  queued: number;
}

/** Connection limits so a dead mail server costs seconds, not minutes, per attempt. */
const SMTP_TIMEOUTS = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };

export class Mailer {
  private readonly transport: MailTransport;
  private readonly attempts: number;
  private readonly backoffMs: number;
  private readonly maxQueue: number;
  private readonly queue: MailMessage[] = [];
  private readonly counts = { sent: 0, failed: 0, dropped: 0 };
  private draining: Promise<void> | null = null;
  private backoff: { timer: NodeJS.Timeout; wake: () => void } | null = null;
  private closed = false;

  constructor(private readonly options: MailerOptions) {
    this.transport =
      typeof options.transport === 'string' ? createTransport({ url: options.transport, ...SMTP_TIMEOUTS }) : options.transport;
    this.attempts = options.attempts ?? 3;
    this.backoffMs = options.backoffMs ?? 2000;
    this.maxQueue = options.maxQueue ?? 200;
    if (!Number.isInteger(this.attempts) || this.attempts < 1) throw new Error(`attempts must be a whole number of 1 or more, got ${this.attempts}`);
    if (!(this.backoffMs >= 0)) throw new Error(`backoffMs must be 0 or more, got ${this.backoffMs}`);
    if (!Number.isInteger(this.maxQueue) || this.maxQueue < 1) throw new Error(`maxQueue must be a whole number of 1 or more, got ${this.maxQueue}`);
  }

  /** Queues `message` and returns at once. Never throws. */
  send(message: MailMessage): void {
    if (this.closed) {
      this.options.log.warn({ subject: message.subject }, 'mail not sent: the mailer is closed');
      return;
    }
    if (message.to.length === 0) {
      this.options.log.warn({ subject: message.subject }, 'mail not sent: no recipients (configure the on-call list)');
      return;
    }
    this.queue.push(message);
    if (this.queue.length > this.maxQueue) {
      const dropped = this.queue.shift();
      this.counts.dropped++;
      this.options.log.error({ subject: dropped?.subject }, 'mail dropped: the outgoing queue is full');
    }
    this.draining ??= this.drain().finally(() => (this.draining = null));
  }

  /** Resolves once every queued message was delivered or given up. */
  async idle(): Promise<void> {
    while (this.draining) await this.draining;
  }

  stats(): MailerStats {
    return { ...this.counts, queued: this.queue.length };
  }

  /** Stops retrying, drops what is still queued (logged), waits for a send in flight, closes the transport. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    if (this.backoff) {
      clearTimeout(this.backoff.timer);
      this.backoff.wake();
    }
    await this.idle();
    this.transport.close();
  }

  private async drain(): Promise<void> {
    while (this.queue.length > 0 && !this.closed) {
      const message = this.queue.shift() as MailMessage;
      await this.deliver(message);
    }
    if (this.queue.length > 0) {
      this.counts.dropped += this.queue.length;
      this.options.log.warn({ count: this.queue.length }, 'mail dropped at shutdown');
      this.queue.length = 0;
    }
  }

  private async deliver(message: MailMessage): Promise<void> {
    const details = { to: message.to, subject: message.subject };
    for (let attempt = 1; attempt <= this.attempts; attempt++) {
      try {
        await this.transport.sendMail({ from: this.options.from, to: [...message.to], subject: message.subject, text: message.text });
        this.counts.sent++;
        this.options.log.info({ ...details, attempt }, 'mail sent');
        return;
      } catch (err) {
        const error = err instanceof Error ? err.message : String(err);
        if (attempt === this.attempts) {
          this.counts.failed++;
          this.options.log.error({ ...details, attempt, error }, `mail given up after ${attempt} attempt(s)`);
          return;
        }
        const waitMs = this.backoffMs * 2 ** (attempt - 1);
        this.options.log.warn({ ...details, attempt, error, retryInMs: waitMs }, 'mail send failed; will retry');
        await this.sleep(waitMs);
        if (this.closed) {
          this.counts.failed++;
          this.options.log.error({ ...details, attempt, error }, 'mail given up: the mailer closed while waiting to retry');
          return;
        }
      }
    }
  }

  /** A wait that `close()` can cut short. */
  private sleep(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const wake = () => {
        this.backoff = null;
        resolve();
      };
      this.backoff = { timer: setTimeout(wake, ms), wake };
    });
  }
}
