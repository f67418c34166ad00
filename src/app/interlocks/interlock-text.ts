/** Sentences about the software interlock, shared by the banner and the Interlocks page. */
import { FIRST_OUT_FOUND_AT_START, type InterlockCondition, type InterlockFirstOut, type InterlockStatus } from '../../../shared/alarms/alarm-api';
import { isChannelId } from '../../../shared/alarms/channels';
import { channelUnit, defaultDigits, quantityText } from '../alarms/channel-text';
import { formatLocalTime } from '../readout/format-quantity';

/** Words for a trip found at start, whose cause is unknown. */
const FOUND_AT_START_WORDS = 'unknown, found at start';

/** A condition name in words: "low-flow-x" → "low flow x". */
export function conditionWords(name: string): string {
  return name === FIRST_OUT_FOUND_AT_START ? FOUND_AT_START_WORDS : name.replace(/-/g, ' ');
}

/**
 * The cause of a trip in words: "low flow x on flow.x: 0.42 L/min, trip level 1.00 L/min", or
 * for a trip found at start why nothing more is known.
 */
export function tripCauseText(firstOut: InterlockFirstOut, condition: Pick<InterlockCondition, 'channel' | 'unit' | 'tripsWhen'>): string {
  if (firstOut.condition === FIRST_OUT_FOUND_AT_START) {
    return `${FOUND_AT_START_WORDS} (the controller was holding with no trip on record)`;
  }
  return `${conditionOnChannel(firstOut.condition, firstOut.channel)}: ${readingAgainstLimit(firstOut, condition)}`;
}

/** Unit of a condition's value: the one the server sent, else its channel's. */
export function conditionUnit(condition: Pick<InterlockCondition, 'channel' | 'unit'>): string {
  return condition.unit ?? channelUnit(condition.channel);
}

/**
 * "0.42 L/min, trip level 1.00 L/min"; for a yes/no condition (no unit) just its state in
 * words ("offline"), since "0 against 1" would mean nothing to the operator.
 */
export function readingAgainstLimit(
  reading: { value: number | null; limit: number },
  condition: Pick<InterlockCondition, 'channel' | 'unit' | 'tripsWhen'>,
): string {
  const unit = conditionUnit(condition);
  if (unit === '' && condition.tripsWhen) return condition.tripsWhen;
  // A value just past the level must not read as equal to it ("1.00 L/min, trip level 1.00 L/min").
  let digits = defaultDigits(reading.limit);
  const text = (v: number | null) => quantityText(v, unit, digits);
  while (digits < 4 && reading.value !== null && reading.value !== reading.limit && text(reading.value) === text(reading.limit)) digits++;
  return `${text(reading.value)}, trip level ${text(reading.limit)}`;
}

/**
 * "low flow x on flow.x"; a condition that watches no single coil's channel (staleness,
 * controller connection, frame loss) is named alone, since "telemetry stale on stale" would
 * only puzzle the reader.
 */
export function conditionOnChannel(name: string, channel: string): string {
  const words = conditionWords(name);
  return isChannelId(channel) && channel.includes('.') ? `${words} on ${channel}` : words;
}

/**
 * "first out: low flow x on flow.x at 14:03:12 (0.42 L/min, trip level 1.00 L/min)" — the
 * condition that tripped the interlock, when (local time) and by how much.
 */
export function firstOutText(firstOut: InterlockFirstOut, conditions: readonly InterlockCondition[]): string {
  const condition = conditions.find((c) => c.name === firstOut.condition) ?? { channel: firstOut.channel };
  const at = formatLocalTime(Date.parse(firstOut.at));
  if (firstOut.condition === FIRST_OUT_FOUND_AT_START) return `first out: ${tripCauseText(firstOut, condition)}, at ${at}`;
  return `first out: ${conditionOnChannel(firstOut.condition, firstOut.channel)} at ${at} (${readingAgainstLimit(firstOut, condition)})`;
}

/** The banner's headline for a tripped interlock, or null while it is ok. */
export function tripHeadline(status: InterlockStatus | null): string | null {
  if (!status || status.state !== 'tripped') return null;
  const cause = status.firstOut ? ` — ${firstOutText(status.firstOut, status.conditions)}` : '';
  return `Software interlock tripped${cause}`;
}
