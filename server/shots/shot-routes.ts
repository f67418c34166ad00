/**
 * Shots measured against predicted: `GET /api/shots?run=ID` or `?from=ISO&to=ISO` (viewer) lists
 * shots with their prediction and measured TOF image; `POST /api/shots/measurements` (operator;
 * multipart `file`) stores the imaging analysis's CSV, all lines or none.
 */
import { z } from 'zod';
import type { MeasurementUploadResponse, ShotsResponse } from '../../shared/shots/shots-api.js';
import { actorOf } from '../alarms/alarm-routes.js';
import type { Db } from '../db/database.js';
import { isoTime, queryNumber } from '../http/fields.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { receiveSingleFile, safeFileName } from '../http/single-file-upload.js';
import { parseInput } from '../http/validate.js';
import { MeasurementInputError, parseMeasurementCsv } from './measurement-csv.js';
import { listShots, MAX_LISTED_SHOTS, runExists, storeMeasurements, type ShotSelection } from './shot-repository.js';

/** Largest measurement file accepted, bytes (tens of thousands of lines). */
export const MAX_MEASUREMENT_FILE_BYTES = 2 * 1024 * 1024;

const ShotsQuery = z
  .strictObject({ run: queryNumber({ min: 1, max: 2 ** 31 - 1, integer: true }).optional(), from: isoTime().optional(), to: isoTime().optional() })
  .superRefine((q, ctx) => {
    const window = q.from !== undefined || q.to !== undefined;
    if (q.run !== undefined && window) ctx.addIssue({ code: 'custom', path: ['run'], message: 'give either run or from and to, not both' });
    else if (!window && q.run === undefined) ctx.addIssue({ code: 'custom', path: ['run'], message: 'give run=ID, or from and to (ISO 8601)' });
    else if (window && q.from === undefined) ctx.addIssue({ code: 'custom', path: ['from'], message: 'needed together with to' });
    else if (window && q.to === undefined) ctx.addIssue({ code: 'custom', path: ['to'], message: 'needed together with from' });
    else if (q.from instanceof Date && q.to instanceof Date && q.from.getTime() > q.to.getTime()) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must not be before from' });
  });

export type ShotRoutes = 'shots.list' | 'shots.measurements';

export function shotHandlers(deps: { db: Db; now?: () => Date }): Pick<RouteHandlers, ShotRoutes> {
  const { db } = deps;
  const now = deps.now ?? (() => new Date());
  return {
    'shots.list': async (req, res) => {
      const query = parseInput(ShotsQuery, req.query, 'query');
      const selection: ShotSelection = query.run !== undefined ? { runId: query.run } : { from: query.from!, to: query.to! };
      if ('runId' in selection && !(await runExists(db, selection.runId))) throw new HttpError(404, `No run with id ${selection.runId}: see GET /api/runs`);
      const shots = await listShots(db, selection, MAX_LISTED_SHOTS + 1);
      if (shots.length > MAX_LISTED_SHOTS) {
        const where = 'runId' in selection ? `run: run ${selection.runId} took` : 'from, to: the window holds';
        throw new HttpError(400, `Invalid request query: ${where} more than ${MAX_LISTED_SHOTS} shots; ask for shorter windows with from and to`);
      }
      const body: ShotsResponse = { shots };
      res.json(body);
    },
    'shots.measurements': [
      receiveSingleFile('Measurement file', MAX_MEASUREMENT_FILE_BYTES),
      async (req, res) => {
        const fields = Object.keys((req.body ?? {}) as object);
        if (fields.length > 0) throw new HttpError(400, `Invalid request body: ${JSON.stringify(fields[0]).slice(0, 60)} is not a field of the measurement upload (file)`);
        const file = req.file;
        if (!file) throw new HttpError(400, 'Measurement file: choose a CSV file (form field "file")', 'file');
        try {
          const lines = parseMeasurementCsv(file.buffer.toString('utf8'));
          const { stored } = await storeMeasurements(db, lines, { actor: actorOf(req), sourceName: safeFileName(file.originalname), at: now() });
          const body: MeasurementUploadResponse = { stored };
          res.status(201).json(body);
        } catch (error) {
          if (error instanceof MeasurementInputError) throw new HttpError(400, `Measurement file: ${error.message}; nothing was stored`, 'file');
          throw error;
        }
      },
    ],
  };
}
