/**
 * The limit-order rule of one channel: going up the scale, the levels must come in the order
 * low trip < LL < L < H < HH < high trip, each strictly beyond the one before it. An alarm
 * beyond its trip level would announce the trip only after the interlock acted; an inverted
 * pair would raise the more severe alarm first (alarm-management common practice, see
 * docs/alarm-rationale.md). Shared so the server refuses and the screen explains the same way.
 */

/** The ordered levels of one channel, lowest first. */
export const LEVEL_ORDER = ['tripLow', 'LL', 'L', 'H', 'HH', 'tripHigh'] as const;
export type OrderedLevel = (typeof LEVEL_ORDER)[number];

/** How the levels are called on the screens. */
export const LEVEL_NAMES: Readonly<Record<OrderedLevel, string>> = {
  tripLow: 'low trip level',
  LL: 'low-low alarm (LL)',
  L: 'low alarm (L)',
  H: 'high alarm (H)',
  HH: 'high-high alarm (HH)',
  tripHigh: 'high trip level',
};

/** The levels a channel has; a missing or null level does not take part. */
export type ChannelLevels = Partial<Record<OrderedLevel, number | null>>;

export interface LimitOrderProblem {
  /** The level that is out of place (the one being checked against its neighbour). */
  level: OrderedLevel;
  /** The neighbour it conflicts with. */
  other: OrderedLevel;
  /** A sentence for the person editing: which level, its value, where it must lie. */
  message: string;
}

/**
 * Every pair of present levels that is out of order, as sentences with the channel's unit
 * (e.g. "the high alarm (H) at 21 A must lie below the high trip level at 20 A"). `subject`
 * says which level is being edited: a problem involving it names it first.
 */
export function limitOrderProblems(levels: ChannelLevels, unit: string, subject?: OrderedLevel): LimitOrderProblem[] {
  const present = LEVEL_ORDER.filter((l) => typeof levels[l] === 'number' && Number.isFinite(levels[l]));
  const problems: LimitOrderProblem[] = [];
  for (let i = 0; i < present.length; i++) {
    for (let j = i + 1; j < present.length; j++) {
      const lower = present[i];
      const upper = present[j];
      if ((levels[lower] as number) < (levels[upper] as number)) continue;
      const upperFirst = subject === upper;
      const [level, other] = upperFirst ? [upper, lower] : [lower, upper];
      const where = upperFirst ? 'above' : 'below';
      problems.push({
        level,
        other,
        message: `the ${LEVEL_NAMES[level]} at ${withUnit(levels[level] as number, unit)} must lie ${where} the ${LEVEL_NAMES[other]} at ${withUnit(levels[other] as number, unit)}`,
      });
    }
  }
  return problems;
}

function withUnit(value: number, unit: string): string {
  const text = String(Number(value.toPrecision(6)));
  return unit === '' ? text : unit === '°' ? `${text}°` : `${text} ${unit}`;
}
