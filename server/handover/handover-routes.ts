/**
 * The handover API: list and read (viewer); start a draft, edit it, submit it, accept it, and
 * close an open item with a note (operator; the workflow checks who may do which). The
 * acceptance mail goes to the on-call list once the acceptance is stored.
 */
import type { Request } from 'express';
import { z } from 'zod';
import {
  HANDOVER_SECTIONS,
  MAX_ITEM_CHARS,
  MAX_NEW_ITEMS,
  MAX_NOTE_CHARS,
  MAX_SUMMARY_CHARS,
  type HandoverListResponse,
  type HandoverResponse,
} from '../../shared/handover/handover-api.js';
import { HttpError } from '../http/http-error.js';
import { safeText } from '../http/fields.js';
import type { RouteHandlers } from '../http/route-table.js';
import { labelled } from '../http/field-labels.js';
import { parseInput } from '../http/validate.js';
import type { NoticeOptions } from '../notify/compose-notice.js';
import type { MailQueue } from '../notify/on-call-notifier.js';
import { composeHandoverNotice } from './handover-notice.js';
import type { HandoverWorkflow, Person } from './handover-workflow.js';

/** Labels as the handover sheet shows them. */
export const EditBody = z
  .object({
    summary: labelled(safeText({ max: MAX_SUMMARY_CHARS, min: 0 }), 'Summary').optional(),
    notes: labelled(z.partialRecord(z.enum(HANDOVER_SECTIONS), labelled(safeText({ max: MAX_NOTE_CHARS, min: 0 }), 'Your notes on this')), 'Your notes on this').optional(),
    openItems: labelled(
      z
        .array(z.object({ text: labelled(safeText({ max: MAX_ITEM_CHARS, hint: 'say what is left to do' }), 'New open item') }).strict(), { error: 'must be a list of { text }' })
        .max(MAX_NEW_ITEMS, `at most ${MAX_NEW_ITEMS} new items`),
      'New open item',
    ).optional(),
  })
  .strict();
export const AcceptBody = z.object({ comment: labelled(safeText({ max: MAX_NOTE_CHARS, min: 0 }), 'Comment').optional() }).strict();
export const CloseBody = z.object({ note: labelled(safeText({ max: MAX_ITEM_CHARS, hint: 'say how it was settled' }), 'How was it settled?') }).strict();

export type HandoverRoutes = 'handovers.list' | 'handovers.create' | 'handovers.get' | 'handovers.update' | 'handovers.submit' | 'handovers.accept' | 'handover-items.close';

export function handoverHandlers(deps: { workflow: HandoverWorkflow; mailer: MailQueue; notice: NoticeOptions }): Pick<RouteHandlers, HandoverRoutes> {
  const { workflow } = deps;
  const respond = (res: { json(body: HandoverResponse): void }, handover: HandoverResponse['handover']) => res.json({ handover });
  return {
    'handovers.list': async (_req, res) => {
      const body: HandoverListResponse = { handovers: await workflow.list() };
      res.json(body);
    },
    'handovers.create': async (req, res) => {
      res.status(201);
      respond(res, await workflow.createDraft(personOf(req)));
    },
    'handovers.get': async (req, res) => respond(res, await workflow.get(idOf(req))),
    'handovers.update': async (req, res) => {
      const id = idOf(req);
      const edit = parseInput(EditBody, req.body, 'body');
      respond(res, await workflow.edit(id, personOf(req), edit));
    },
    'handovers.submit': async (req, res) => respond(res, await workflow.submit(idOf(req), personOf(req))),
    'handovers.accept': async (req, res) => {
      const id = idOf(req);
      const { comment } = parseInput(AcceptBody, req.body, 'body');
      const handover = await workflow.accept(id, personOf(req), comment ? comment : null);
      deps.mailer.send(composeHandoverNotice(handover, deps.notice));
      respond(res, handover);
    },
    'handover-items.close': async (req, res) => {
      const { note } = parseInput(CloseBody, req.body, 'body');
      res.json({ item: await workflow.closeItem(idOf(req), personOf(req), note) });
    },
  };
}

function personOf(req: Request): Person {
  if (!req.user) throw new HttpError(401, 'Sign in first');
  return { email: req.user.email, role: req.user.role };
}

function idOf(req: Request): number {
  const raw = String(req.params['id']);
  if (!/^\d{1,9}$/.test(raw)) throw new HttpError(404, `No such item: "${raw.slice(0, 20)}" is not a number`);
  return Number(raw);
}
