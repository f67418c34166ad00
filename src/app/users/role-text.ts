import type { Role } from '../../../shared/auth/roles';

/** What each role may do, in a few words (the README's roles table). */
export const ROLE_MEANING: Record<Role, string> = {
  viewer: 'sees everything live and in history',
  operator: 'also acknowledges and shelves alarms, resets a cleared trip',
  lead: 'also edits limits, calibrations and sample profiles',
  admin: 'also manages users and reads the outgoing mail',
};

/** A security event's kind in words. */
export function securityEventText(kind: string): string {
  switch (kind) {
    case 'sign-in.account-delayed':
      return 'Sign-ins to an account delayed after failed attempts';
    case 'sign-in.address-throttled':
      return 'Sign-ins from an address held back (failures across accounts)';
    case 'sign-in.throttle-lifted':
      return 'Sign-in delay lifted by an admin';
    case 'sign-in.disabled-account':
      return 'Sign-in to a disabled account refused';
    default:
      return kind;
  }
}
