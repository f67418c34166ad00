/**
 * Local SMTP mailbox for development and tests: accepts every message on 127.0.0.1 without
 * authentication or TLS and keeps the newest ones in memory for the admin's Outbox page.
 * It never relays anything onwards. `SMTP_URL` replaces it with a real mail server.
 */
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { MailLog } from './mailer.js';

export interface MailboxMessage {
  from: string;
  to: string[];
  subject: string;
  text: string;
  /** Unix epoch ms. */
  receivedAt: number;
}

export interface LocalMailboxOptions {
  /** TCP port; 0 (default) picks a free one. */
  port?: number;
  /** Messages kept; older ones are forgotten (default 500). */
  capacity?: number;
  /** Largest accepted message, bytes (default 1 MiB). */
  maxBytes?: number;
  clock?: () => number;
  /** Where connection errors go (a pino logger fits); they never stop the mailbox. */
  log?: Pick<MailLog, 'warn'>;
}

const HOST = '127.0.0.1';

export class LocalMailbox {
  private readonly kept: MailboxMessage[] = [];

  private constructor(
    private readonly server: SMTPServer,
    readonly port: number,
    private readonly capacity: number,
  ) {}

  /** Starts listening on 127.0.0.1; resolves once the port is bound. */
  static async start(options: LocalMailboxOptions = {}): Promise<LocalMailbox> {
    const capacity = options.capacity ?? 500;
    const maxBytes = options.maxBytes ?? 1024 * 1024;
    const clock = options.clock ?? Date.now;
    if (!Number.isInteger(capacity) || capacity < 1) throw new Error(`capacity must be a whole number of 1 or more, got ${capacity}`);
    let mailbox: LocalMailbox | null = null;
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      size: maxBytes,
      logger: false,
      banner: 'Tiltwatch local mailbox (development only, nothing is relayed)',
      closeTimeout: 1000,
      onData(stream: SMTPServerDataStream, session: SMTPServerSession, callback: (err?: Error | null) => void) {
        simpleParser(stream)
          .then((mail) => {
            if (stream.sizeExceeded) {
              callback(Object.assign(new Error(`message larger than ${maxBytes} bytes`), { responseCode: 552 }));
              return;
            }
            mailbox?.keep({
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : addressText(mail.from),
              to: session.envelope.rcptTo.map((r) => r.address),
              subject: mail.subject ?? '',
              text: mail.text ?? '',
              receivedAt: clock(),
            });
            callback();
          })
          .catch((err: unknown) => callback(err instanceof Error ? err : new Error(String(err))));
      },
    });
    const port = await new Promise<number>((resolve, reject) => {
      server.once('error', reject);
      server.listen(options.port ?? 0, HOST, () => {
        server.off('error', reject);
        // smtp-server reports client-side failures as 'error' events; unhandled, they would end the process.
        server.on('error', (err: Error) => options.log?.warn({ error: err.message }, 'local mailbox connection error'));
        const address = server.server.address();
        resolve(typeof address === 'object' && address ? address.port : 0);
      });
    });
    mailbox = new LocalMailbox(server, port, capacity);
    return mailbox;
  }

  /** SMTP URL for nodemailer (`smtp://127.0.0.1:PORT`). */
  get url(): string {
    return `smtp://${HOST}:${this.port}`;
  }

  /** Received messages, newest first. */
  messages(): MailboxMessage[] {
    return [...this.kept].reverse();
  }

  /** Stops listening and closes open connections. */
  close(): Promise<void> {
    return new Promise((resolve) => this.server.close(() => resolve()));
  }

  private keep(message: MailboxMessage): void {
    this.kept.push(message);
    if (this.kept.length > this.capacity) this.kept.splice(0, this.kept.length - this.capacity);
  }
}

function addressText(from: AddressObject | undefined): string {
  return from?.text ?? '';
}
