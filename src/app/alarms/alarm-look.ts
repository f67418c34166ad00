/**
 * How an alarm is shown: priority as icon shape plus word (never colour alone), state in the
 * words of the ISA-18.2 / IEC 62682 state model, and which actions the state allows.
 */
import type { AlarmPriority } from '../../../shared/alarms/alarm-api';
import { hasRole, type Role } from '../../../shared/auth/roles';

export interface PriorityLook {
  /** Material Symbols name; each priority has its own outline shape (diamond, triangle, circle). */
  icon: string;
  label: string;
}

export const PRIORITY_LOOK: Record<AlarmPriority, PriorityLook> = {
  high: { icon: 'emergency_home', label: 'High' },
  medium: { icon: 'warning', label: 'Medium' },
  low: { icon: 'info', label: 'Low' },
};

const LEVEL_WORDS: Record<string, string> = { HH: 'high-high', H: 'high', L: 'low', LL: 'low-low' };

/** An alarm level in words ("low-low"); an unknown level as given. */
export function levelWords(level: string): string {
  return LEVEL_WORDS[level] ?? level;
}

const STATE_WORDS: Record<string, string> = {
  normal: 'Normal',
  unacknowledged: 'Unacknowledged',
  acknowledged: 'Acknowledged',
  'returned-unacknowledged': 'Returned to normal, unacknowledged',
  latched: 'Latched: cleared, waits for a reset',
  shelved: 'Shelved',
  suppressed: 'Suppressed by design (ramp programmed)',
  'out-of-service': 'Out of service',
};

/** The state in words for the operator; an unknown state is shown as the server named it. */
export function stateWords(state: string): string {
  return STATE_WORDS[state] ?? state;
}

/** True while an alarm waits for an operator's acknowledgement (counted in the navigation badge). */
export function awaitsAcknowledgement(state: string): boolean {
  return state === 'unacknowledged' || state === 'returned-unacknowledged';
}

export type AlarmAction = 'acknowledge' | 'shelve' | 'unshelve' | 'reset' | 'out-of-service' | 'return-to-service';

/**
 * The actions `role` may take on an alarm in `state`, in the order they are offered. Viewers
 * get none; out of service is for the lead. States whose request the server would refuse
 * (acknowledging a latched alarm, shelving a shelved one) are not offered.
 */
export function actionsFor(state: string, role: Role | null): AlarmAction[] {
  if (!role || !hasRole(role, 'operator')) return [];
  const actions: AlarmAction[] = [];
  if (awaitsAcknowledgement(state)) actions.push('acknowledge');
  if (state === 'latched') actions.push('reset');
  if (state === 'shelved') actions.push('unshelve');
  else if (state !== 'out-of-service') actions.push('shelve');
  if (hasRole(role, 'lead')) actions.push(state === 'out-of-service' ? 'return-to-service' : 'out-of-service');
  return actions;
}

export const ACTION_LOOK: Record<AlarmAction, { icon: string; label: string }> = {
  acknowledge: { icon: 'check', label: 'Acknowledge' },
  shelve: { icon: 'shelves', label: 'Shelve' },
  unshelve: { icon: 'unarchive', label: 'Unshelve' },
  reset: { icon: 'restart_alt', label: 'Reset' },
  'out-of-service': { icon: 'build_circle', label: 'Out of service' },
  'return-to-service': { icon: 'settings_backup_restore', label: 'Return to service' },
};
