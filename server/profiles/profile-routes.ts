import type { Request } from 'express';
import { z } from 'zod';
import { PROFILE_LABELS, parseSampleProfile, SampleProfileError } from '../../shared/profiles/sample-profile.js';
import type { Db } from '../db/database.js';
import { labelled, labelledInside } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { activateProfile, findActiveProfile, listProfiles, saveProfile } from './profile-repository.js';

const reason = z
  .string({ error: 'must be text saying why (it goes into the audit trail)' })
  .trim()
  .min(1, 'must say why (it goes into the audit trail)')
  .max(500, 'must be at most 500 characters');

/** An input of the profile form by its path in a profile (`trapHz.1` → "Frequency along y"). */
export function profileFieldLabel(path: readonly PropertyKey[]): string | null {
  const label: string | readonly string[] | undefined = (PROFILE_LABELS as Record<string, string | readonly string[]>)[String(path[0])];
  if (typeof label === 'string') return label;
  return label?.[Number(path[1])] ?? null;
}

/** Labels as the profile form and the activation form show them. */
export const SaveRequest = z.strictObject({
  // Checked by parseSampleProfile, whose messages name each input as the form labels it.
  profile: labelledInside(z.unknown(), 'Profile', profileFieldLabel),
  reason: labelled(reason, 'Reason for this version'),
});

export const ActivateRequest = z.strictObject({ reason: labelled(reason, 'Reason for activating') });

const ProfileId = z.object({
  id: z.coerce.number({ error: 'must be a profile version id' }).int('must be a whole number').positive('must be a profile version id ≥ 1'),
});

/**
 * Sample-profile routes: `GET /api/profiles` → `{ profiles }` (by name, oldest version
 * first), `GET /api/profiles/active`, `POST /api/profiles` (lead) → 201 with the new version (never active: activation is its own step),
 * `POST /api/profiles/:id/activate` (lead). `activated` is awaited after a change of the
 * active version, so the live prediction follows before the answer goes out.
 */
export function profileHandlers(
  db: Db,
  activated: () => Promise<void>,
): Pick<RouteHandlers, 'profiles.list' | 'profiles.active' | 'profiles.save' | 'profiles.activate'> {
  return {
    'profiles.list': async (_req, res) => {
      res.json({ profiles: await listProfiles(db) });
    },
    'profiles.active': async (_req, res) => {
      const active = await findActiveProfile(db);
      if (!active) throw new HttpError(404, 'No sample profile is active');
      res.json(active);
    },
    'profiles.save': async (req, res) => {
      if (typeof req.body === 'object' && req.body !== null && 'activate' in req.body) {
        throw new HttpError(400, 'Saving never activates a profile: save the version, then activate it with POST /api/profiles/:id/activate and a reason');
      }
      const body = parseInput(SaveRequest, req.body, 'body');
      const record = await saveProfile(db, { profile: checkedProfile(body.profile), reason: body.reason, actor: actor(req) });
      res.status(201).json(record);
    },
    'profiles.activate': async (req, res) => {
      const { id } = parseInput(ProfileId, req.params, 'path');
      const body = parseInput(ActivateRequest, req.body, 'body');
      const record = await activateProfile(db, { id, reason: body.reason, actor: actor(req) });
      if (!record) throw new HttpError(404, `No sample profile version with id ${id}: see GET /api/profiles`);
      await activated();
      res.json(record);
    },
  };
}

function checkedProfile(value: unknown) {
  try {
    return parseSampleProfile(value);
  } catch (err) {
    if (err instanceof SampleProfileError) throw new HttpError(400, `The profile was not saved: ${err.message.replace(/^sample profile: /, '')}`, err.field ? `profile.${err.field}` : 'profile');
    throw err;
  }
}

function actor(req: Request): string {
  if (!req.user) throw new Error('profile routes must sit behind requireRole');
  return req.user.email;
}
