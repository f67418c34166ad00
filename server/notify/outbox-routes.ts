/**
 * `GET /api/admin/outbox` (admin): the messages the local mail catcher received, newest first.
 * With `SMTP_URL` set mail goes to that server and there is no local outbox (404 saying so).
 */
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { MailCatcher } from './mail-catcher.js';

export function outboxHandlers(catcher: MailCatcher | null): Pick<RouteHandlers, 'admin.outbox'> {
  return {
    'admin.outbox': (_req, res) => {
      if (!catcher) {
        throw new HttpError(404, 'No local outbox: SMTP_URL is set, so notices go to that mail server; look there');
      }
      res.json({ messages: catcher.messages().map((m) => ({ ...m, receivedAt: new Date(m.receivedAt).toISOString() })) });
    },
  };
}
