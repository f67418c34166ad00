import type { MapQuantity } from '../../../shared/physics/orientation-map';
import { formatNumber } from '../readout/format-quantity';
import { isCollapsed, QUANTITY_TEXT, type ColorScale } from './color-scale';

/**
 * A map value for readouts: one decimal more than the colour scale's ticks (at least three), or
 * what the hatch means where the gas is collapsed.
 */
export function mapValueText(value: number, quantity: MapQuantity, scale: ColorScale): string {
  const digits = Math.max(3, scale.digits + 1);
  if (Number.isNaN(value)) return 'collapsed (no stable state)';
  if (isCollapsed(value, quantity)) return `collapsed (${QUANTITY_TEXT[quantity].symbol} = ${formatNumber(value, digits)})`;
  return `${QUANTITY_TEXT[quantity].symbol} = ${formatNumber(value, digits)}`;
}
