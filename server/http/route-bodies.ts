/**
 * The request-body schema of every write route that takes a JSON body, by route id: the one
 * place the generic edge check (`refuseHostileBody`) finds the labels a screen gives each
 * field, so that even that check names a field as the form labels it. The routes validate
 * with the same schemas (`parseInput`) or, where the route checks the body with its own code,
 * the schema only carries the labels.
 */
import type { z } from 'zod';
import { OutOfServiceBody, ReasonBody as AlarmReasonBody, ShelveBody } from '../alarms/alarm-routes.js';
import { LimitEditBody } from '../alarms/alarm-limit-routes.js';
import { LoginRequest, PasswordChange } from '../auth/auth-routes.js';
import { ApproveRequest } from '../calibration/calibration-routes.js';
import { AcceptBody, CloseBody, EditBody } from '../handover/handover-routes.js';
import { ResetBody } from '../interlock/interlock-routes.js';
import { LevelsBody } from '../levels/level-routes.js';
import { EntryBody } from '../logbook/entry-input.js';
import { ActivateRequest, SaveRequest } from '../profiles/profile-routes.js';
import { PreviewBody, RunAbortBody, RunBody, SaveSequenceBody } from '../sequences/sequence-request.js';
import { ReasonBody as SteerReasonBody, SteerRequestBody } from '../steering/steer-request.js';
import { Lift, NewUser, UserChange } from '../users/user-routes.js';
import type { RouteId } from './route-table.js';

export const ROUTE_BODIES: Partial<Record<RouteId, z.ZodType>> = {
  'auth.login': LoginRequest,
  'auth.password': PasswordChange,
  'levels.update': LevelsBody,
  'calibrations.approve': ApproveRequest,
  'profiles.save': SaveRequest,
  'profiles.activate': ActivateRequest,
  'alarms.shelve': ShelveBody,
  'alarms.unshelve': AlarmReasonBody,
  'alarms.out-of-service': OutOfServiceBody,
  'alarms.reset': AlarmReasonBody,
  'alarm-limits.update': LimitEditBody,
  'interlock.reset': ResetBody,
  'users.create': NewUser,
  'users.update': UserChange,
  'security.lift': Lift,
  'steering.preflight': SteerRequestBody,
  'steering.target': SteerRequestBody,
  'steering.abort': SteerReasonBody,
  'steering.release': SteerReasonBody,
  'sequences.save': SaveSequenceBody,
  'sequences.preview': PreviewBody,
  'sequences.run': RunBody,
  'runs.abort': RunAbortBody,
  'logbook.write': EntryBody,
  'handovers.update': EditBody,
  'handovers.accept': AcceptBody,
  'handover-items.close': CloseBody,
};
