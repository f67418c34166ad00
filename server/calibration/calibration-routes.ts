import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import type { CalibrationFitResponse } from '../../shared/field/calibration-record.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { labelled } from '../http/field-labels.js';
import { queryNumber, reasonText } from '../http/fields.js';
import { parseInput } from '../http/validate.js';
import { approveCalibration, findActiveCalibration, findCalibrationDetail, listCalibrations, saveDraft } from './calibration-repository.js';
import { parseCalibrationCsv } from './fit/calibration-csv.js';
import { fitCalibration } from './fit/calibration-fit.js';
import { CalibrationInputError } from './fit/fit-input-error.js';

/** Largest calibration file accepted, bytes (100 000 lines of a few numbers). */
export const MAX_CALIBRATION_FILE_BYTES = 4 * 1024 * 1024;

/** Labels as the Calibration page's approval form shows them. */
export const ApproveRequest = z.strictObject({ reason: labelled(reasonText(), 'Reason for approving') });
const CalibrationId = z.object({ id: queryNumber({ min: 1, max: 2 ** 31 - 1, integer: true }) });

/**
 * The Zeeman coefficient from the upload form (text), labelled as on the Calibration screen;
 * undefined when left empty. Whether it is needed and positive is the file reader's check.
 */
function formCoefficient(body: unknown): number | undefined {
  const fields = (body ?? {}) as Record<string, unknown>;
  const unknown = Object.keys(fields).find((key) => key !== 'mhzPerGauss');
  if (unknown !== undefined) throw new HttpError(400, `Invalid request body: ${JSON.stringify(unknown).slice(0, 60)} is not a field of the calibration upload (file, mhzPerGauss)`);
  const raw = fields['mhzPerGauss'];
  if (raw === undefined || (typeof raw === 'string' && raw.trim() === '')) return undefined;
  const text = typeof raw === 'string' ? raw.trim() : '';
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text) || !Number.isFinite(Number(text))) {
    throw new HttpError(400, 'MHz per G: must be a number, e.g. 1.4 (the transition\'s linear Zeeman coefficient)');
  }
  return Number(text);
}

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_CALIBRATION_FILE_BYTES, files: 1, fields: 4, fieldSize: 1000, parts: 6 } });

/** multer for the one `file` field, its refusals turned into 400s that say what to fix. */
const receiveFile: RequestHandler = (req, res, next) => {
  upload.single('file')(req, res, (error: unknown) => {
    if (!error) return next();
    if (error instanceof multer.MulterError) {
      const message =
        error.code === 'LIMIT_FILE_SIZE'
          ? `Calibration file: larger than ${MAX_CALIBRATION_FILE_BYTES / 1024 / 1024} MB`
          : error.code === 'LIMIT_UNEXPECTED_FILE'
            ? `Calibration file: send one file in the form field "file" (got "${error.field ?? ''}")`
            : `Calibration upload refused: ${error.message}`;
      return next(new HttpError(400, message));
    }
    return next(new HttpError(400, `Calibration upload is not a readable multipart form: ${(error as Error).message}`));
  });
};

/**
 * Calibration routes: list (`{ calibrations }`, oldest first), active, one version with its
 * residuals, a fit upload (lead; multipart `file`, optional `mhzPerGauss`) stored as a draft,
 * and approval (lead; `{ reason }`), after which `activated` makes the live pipeline use the
 * new version before the answer goes out.
 */
export function calibrationHandlers(
  db: Db,
  activated: () => Promise<void>,
): Pick<RouteHandlers, 'calibrations.list' | 'calibrations.active' | 'calibrations.get' | 'calibrations.fit' | 'calibrations.approve'> {
  return {
    'calibrations.list': async (_req, res) => {
      res.json({ calibrations: await listCalibrations(db) });
    },
    'calibrations.active': async (_req, res) => {
      const active = await findActiveCalibration(db);
      if (!active) throw new HttpError(404, 'No calibration is active');
      res.json(active);
    },
    'calibrations.get': async (req, res) => {
      const { id } = parseInput(CalibrationId, req.params, 'path');
      const detail = await findCalibrationDetail(db, id);
      if (!detail) throw new HttpError(404, `No calibration version with id ${id}: see GET /api/calibrations`);
      res.json(detail);
    },
    'calibrations.fit': [
      receiveFile,
      async (req, res) => {
        const mhzPerGauss = formCoefficient(req.body);
        const file = req.file;
        if (!file || file.size === 0) throw new HttpError(400, 'Calibration file: choose a CSV file (form field "file")');
        const active = await findActiveCalibration(db);
        let fit;
        try {
          fit = fitCalibration(
            parseCalibrationCsv(file.buffer.toString('utf8'), { mhzPerGauss }),
            active ? { version: active.version, gaussPerAmp: active.gaussPerAmp, coilToTrap: active.coilToTrap } : undefined,
          );
        } catch (error) {
          if (error instanceof CalibrationInputError) throw new HttpError(400, `Calibration file: ${error.message}`);
          throw error;
        }
        const detail = await saveDraft(db, { fit, sourceName: safeName(file.originalname), mhzPerGauss: mhzPerGauss ?? null, actor: actor(req) });
        const body: CalibrationFitResponse = { id: detail.id, state: 'draft', fit: fit.report, calibration: detail };
        res.status(201).json(body);
      },
    ],
    'calibrations.approve': async (req, res) => {
      const { id } = parseInput(CalibrationId, req.params, 'path');
      const body = parseInput(ApproveRequest, req.body, 'body');
      const outcome = await approveCalibration(db, { id, reason: body.reason, actor: actor(req) });
      if (!outcome.ok) throw new HttpError(outcome.status, outcome.message);
      // Recorded and committed; now the live pipeline switches before the answer goes out.
      await activated();
      res.json(outcome.record);
    },
  };
}

/** The uploaded file's name as stored: printable, at most 120 characters. */
function safeName(name: string): string {
  const clean = name.replace(/[\u0000-\u001f\u007f]|[\ud800-\udfff]/g, '').trim();
  return (clean || 'upload.csv').slice(0, 120);
}

function actor(req: Request): string {
  if (!req.user) throw new Error('calibration routes must sit behind requireRole');
  return req.user.email;
}
