import type { SampleProfile } from './sample-profile.js';

/**
 * A stored sample-profile version, as the API returns it. Saving an edit never changes a
 * stored version: it adds version n + 1 under the same name. Exactly one version is active.
 */
export interface ProfileRecord {
  id: number;
  name: string;
  version: number;
  profile: SampleProfile;
  active: boolean;
  createdBy: string;
  /** ISO 8601 UTC. */
  createdAt: string;
  /** Why this version was written (required from the lead). */
  reason: string;
}

/**
 * Body of `POST /api/profiles` (lead): a new version, or the first of a new name. Saving never
 * activates it; `POST /api/profiles/:id/activate` with a reason does.
 */
export interface ProfileSaveRequest {
  profile: SampleProfile;
  reason: string;
}

/** Body of `GET /api/prediction/history?seconds=N`: the live prediction over time. */
export interface PredictionHistory {
  /** Unix epoch ms of each prediction. */
  t: number[];
  fermiSurfaceAspect: (number | null)[];
  tofAspect: (number | null)[];
  collapseRatio: (number | null)[];
}
