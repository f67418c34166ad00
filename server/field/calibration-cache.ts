import { assertRotation, type Calibration } from '../../shared/field/calibration.js';
import { findActiveCalibration, findCalibration } from '../calibration/calibration-repository.js';
import type { Db } from '../db/database.js';

/**
 * The calibrations the hot path needs without a database round trip: the active one (read
 * once per frame) and any version referenced by stored batches. Versions are immutable, so
 * only the choice of the active one can change; call `reload()` after switching it.
 */
export class CalibrationCache {
  private activeCalibration: Calibration | null = null;
  private readonly versions = new Map<number, Calibration>();

  constructor(private readonly db: Db) {}

  /** Reads the active calibration from the database. Throws when none is active. */
  async reload(): Promise<Calibration> {
    const record = await findActiveCalibration(this.db);
    if (!record) throw new Error('no active calibration in the database: activate one before starting ingest');
    const calibration = strip(record);
    // A frame rotation that is not a rotation would silently distort every field angle.
    try {
      assertRotation(calibration.coilToTrap);
    } catch (error) {
      throw new Error(`active calibration v${calibration.version} is unusable: ${(error as Error).message}`);
    }
    this.versions.set(calibration.id, calibration);
    this.activeCalibration = calibration;
    return calibration;
  }

  /** The active calibration; `reload()` must have succeeded once. */
  active(): Calibration {
    if (!this.activeCalibration) throw new Error('CalibrationCache.active() called before reload()');
    return this.activeCalibration;
  }

  /** A calibration by id, from the cache or the database; null when it does not exist. */
  async byId(id: number): Promise<Calibration | null> {
    const cached = this.versions.get(id);
    if (cached) return cached;
    const record = await findCalibration(this.db, id);
    if (!record) return null;
    const calibration = strip(record);
    this.versions.set(id, calibration);
    return calibration;
  }
}

function strip(c: Calibration): Calibration {
  return { id: c.id, version: c.version, label: c.label, gaussPerAmp: c.gaussPerAmp, offsetGauss: c.offsetGauss, coilToTrap: c.coilToTrap, covariance: c.covariance ?? null };
}
