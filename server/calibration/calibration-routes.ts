import type { Request } from 'express';
import { z } from 'zod';
import type { CalibrationFitResponse } from '../../shared/field/calibration-record.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { labelled } from '../http/field-labels.js';
import { queryNumber, reasonText } from '../http/fields.js';
import { receiveSingleFile, safeFileName } from '../http/single-file-upload.js';
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
      receiveSingleFile('Calibration file', MAX_CALIBRATION_FILE_BYTES),
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
        const detail = await saveDraft(db, { fit, sourceName: safeFileName(file.originalname), mhzPerGauss: mhzPerGauss ?? null, actor: actor(req) });
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

function actor(req: Request): string {
  if (!req.user) throw new Error('calibration routes must sit behind requireRole');
  return req.user.email;
}
