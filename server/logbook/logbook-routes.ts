/**
 * The logbook API. `POST /api/logbook/entries` (operator) takes JSON `{ text, tags?, at?, link?,
 * amends? }` or a multipart form with the same fields and files under `file`; every file is
 * checked by its content before anything is stored, then the entry, its files and the audit
 * record go into one transaction → 201 `{ id }`. `GET /api/logbook/entries?q=&from=&to=&tag=`
 * (viewer) searches; `GET /api/logbook/attachments/:id` (viewer) serves a file with the type
 * found from its content, as a download unless it is an image, and never for the browser to run.
 */
import type { RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { MAX_ATTACHMENT_BYTES, MAX_ATTACHMENTS, MAX_ENTRY_CHARS, type LogbookCreated, type LogbookEntriesResponse, type LogbookLink } from '../../shared/logbook/logbook-api.js';
import { actorOf } from '../alarms/alarm-routes.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { checkAttachment, contentDisposition, type CheckedFile } from './attachment-check.js';
import { parseEntryInput } from './entry-input.js';
import { linkProblem, type LinkTargets } from './link-targets.js';
import { entryExists, findAttachment, findEntries, insertEntry } from './logbook-repository.js';
import { textProblem } from '../../shared/validation/edge-rules.js';

const DEFAULT_LIMIT = 200;
const MAX_LIMIT = 1000;

const upload = multer({
  storage: multer.memoryStorage(),
  // One byte over the limit is enough to know a file is too large.
  limits: { fileSize: MAX_ATTACHMENT_BYTES + 1, files: MAX_ATTACHMENTS, fields: 10, fieldSize: MAX_ENTRY_CHARS * 4, parts: MAX_ATTACHMENTS + 10 },
  defParamCharset: 'utf8',
}).array('file', MAX_ATTACHMENTS);

/** Multer for multipart requests, its refusals turned into 400s that say what to fix. */
const multipart: RequestHandler = (req, res, next) => {
  upload(req, res, (error: unknown) => {
    if (!error) return next();
    if (error instanceof multer.MulterError) {
      const why: Record<string, string> = {
        LIMIT_FILE_SIZE: `an attachment is larger than ${MAX_ATTACHMENT_BYTES / (1024 * 1024)} MB`,
        LIMIT_FILE_COUNT: `at most ${MAX_ATTACHMENTS} attachments per entry`,
        LIMIT_UNEXPECTED_FILE: `files go in the form field "file" (got "${error.field ?? ''}"), at most ${MAX_ATTACHMENTS}`,
        LIMIT_FIELD_VALUE: `a form field is too long (text at most ${MAX_ENTRY_CHARS} characters)`,
      };
      return next(new HttpError(400, `Attachments: ${why[error.code] ?? error.message}`));
    }
    next(new HttpError(400, `The form could not be read: ${(error as Error).message}`));
  });
};

const isoTime = (label: string) =>
  z
    .string()
    .refine((v) => /^\d{4}-\d{2}-\d{2}/.test(v) && !Number.isNaN(new Date(v).getTime()), `${label}: must be a date and time such as 2026-12-02T06:00:00Z`)
    .transform((v) => new Date(v))
    .optional();

const ListQuery = z.object({
  q: z
    .string()
    .max(200, 'Search: at most 200 characters')
    .refine((v) => textProblem(v) === null, 'Search: must be plain text')
    .transform((v) => v.trim())
    .optional(),
  from: isoTime('From'),
  to: isoTime('To'),
  tag: z.string().max(40, 'Tag: at most 40 characters').transform((v) => v.trim().toLowerCase()).optional(),
  limit: z.coerce.number().int('Limit: a whole number').min(1, 'Limit: at least 1').max(MAX_LIMIT, `Limit: at most ${MAX_LIMIT}`).default(DEFAULT_LIMIT),
});

export type LogbookRoutes = 'logbook.write' | 'logbook.list' | 'logbook.attachment';

export function logbookHandlers(deps: { db: Db; targets: LinkTargets; now?: () => number }): Pick<RouteHandlers, LogbookRoutes> {
  const { db, targets } = deps;
  const now = deps.now ?? Date.now;
  return {
    'logbook.write': [
      multipart,
      async (req, res) => {
        const input = parseEntryInput(req.body ?? {}, now());
        const files = await checkFiles((req.files as Express.Multer.File[] | undefined) ?? []);
        if (input.amends !== null && !(await entryExists(db, input.amends))) {
          throw new HttpError(400, `Corrects entry: there is no entry ${input.amends}`, 'amends');
        }
        await checkLink(targets, input.link);
        const id = await insertEntry(db, actorOf(req), input, files);
        const body: LogbookCreated = { id };
        res.status(201).json(body);
      },
    ],
    'logbook.list': async (req, res) => {
      const query = parseInput(ListQuery, req.query, 'query');
      const body: LogbookEntriesResponse = { entries: await findEntries(db, { ...query, q: query.q || undefined, tag: query.tag || undefined }) };
      res.json(body);
    },
    'logbook.attachment': async (req, res) => {
      const id = Number(req.params['id']);
      const file = Number.isInteger(id) && id > 0 && id <= 2_147_483_647 ? await findAttachment(db, id) : null;
      if (!file) throw new HttpError(404, `No attachment ${String(req.params['id'])}`);
      res.set({
        'Content-Type': file.contentType === 'text/csv' ? 'text/csv; charset=utf-8' : file.contentType,
        'Content-Disposition': contentDisposition(file.fileName, file.contentType),
        'X-Content-Type-Options': 'nosniff',
        'Content-Security-Policy': "default-src 'none'; sandbox",
        'Cache-Control': 'private, max-age=86400, immutable',
      });
      res.send(Buffer.from(file.data.buffer, file.data.byteOffset, file.data.byteLength));
    },
  };
}

/** Every file checked before any is stored; the first refusal is the 400. */
async function checkFiles(uploads: readonly Express.Multer.File[]): Promise<CheckedFile[]> {
  const checked: CheckedFile[] = [];
  for (const upload of uploads) {
    const verdict = await checkAttachment(upload.originalname, upload.buffer);
    if (!verdict.ok) throw new HttpError(400, `Attachments: ${verdict.problem}`);
    checked.push(verdict.file);
  }
  return checked;
}

async function checkLink(targets: LinkTargets, link: LogbookLink | null): Promise<void> {
  if (link === null) return;
  const problem = await linkProblem(targets, link);
  if (problem) throw new HttpError(400, `Linked to: ${problem}`, 'link');
}
