import type { PreflightCheck, PreflightCheckName } from '../../../shared/steering/steering-api';
import { formatNumber } from '../readout/format-quantity';

/** How each pre-flight check is named on screen. */
export const CHECK_LABELS: Record<PreflightCheckName, string> = {
  controller: 'Controller reporting',
  interlock: 'Interlock clear',
  'field-magnitude': 'Field magnitude |B|',
  currents: 'Coil currents',
  'ramp-rate': 'Current ramp rate dI/dt',
  'coil-temperature': 'Steady coil temperature',
  'collapse-ratio': 'Collapse ratio ε_dd/ε_dd,crit',
};

/** Yes/no checks show "yes"/"no" instead of 1/0. */
const BINARY: readonly PreflightCheckName[] = ['controller', 'interlock'];

export function checkValueText(check: PreflightCheck): string {
  if (BINARY.includes(check.name)) return check.ok ? 'yes' : 'no';
  if (check.value === null) return '—';
  return `${formatNumber(check.value, digits(check.value))}${check.unit ? ` ${check.unit}` : ''}`;
}

export function checkLimitText(check: PreflightCheck): string {
  if (BINARY.includes(check.name)) return '';
  return `${check.name === 'coil-temperature' ? 'below' : 'up to'} ${formatNumber(check.limit, digits(check.limit))}${check.unit ? ` ${check.unit}` : ''}`;
}

function digits(v: number): number {
  const a = Math.abs(v);
  return a >= 100 ? 0 : a >= 10 ? 1 : a >= 1 ? 2 : 3;
}
