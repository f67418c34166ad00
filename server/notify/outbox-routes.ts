/**
 * `GET /api/admin/outbox` (admin): the messages the local mailbox received, newest first.
 * With `SMTP_URL` set mail goes to that server and there is no local outbox (404 saying so).
 */
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LocalMailbox } from './local-mailbox.js';

export function outboxHandlers(mailbox: LocalMailbox | null): Pick<RouteHandlers, 'admin.outbox'> {
  return {
    'admin.outbox': (_req, res) => {
      if (!mailbox) {
        throw new HttpError(404, 'No local outbox: SMTP_URL is set, so notices go to that mail server; look there');
      }
      res.json({ messages: mailbox.messages().map((m) => ({ ...m, receivedAt: new Date(m.receivedAt).toISOString() })) });
    },
  };
}
