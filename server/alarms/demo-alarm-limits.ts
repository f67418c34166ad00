/**
 * Seeded alarm limits of the fictional Lindqvist Hall dipolar lab (invented values, demo only;
 * a real lab rationalizes its own). Levels sit inside the trip levels of the demo level set
 * (server/levels/demo-levels.ts) so that an alarm warns before the software interlock acts.
 */
import { DEMO_LEVEL_SET } from '../levels/demo-levels.js';
import { AXES, type Axis } from '../../shared/telemetry/messages.js';
import { parseAlarmLimits, type AlarmLimit } from './alarm-limit.js';

type LimitInput = Omit<AlarmLimit, 'id' | 'suppressDuringRamp'> & { suppressDuringRamp?: boolean };

const trips = DEMO_LEVEL_SET.trips;

function perAxis(make: (axis: Axis) => LimitInput): LimitInput[] {
  return AXES.map(make);
}

const inputs: LimitInput[] = [
  ...perAxis((a) => ({
    channel: `current.${a}`,
    level: 'H',
    limit: 18,
    deadband: 0.5,
    onDelayMs: 200,
    offDelayMs: 1000,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: `Coil pair ${a} carries more than its continuous rating: the target or sequence asks for a stronger field than this pair should give, or its supply regulates badly.`,
      consequence: `At ${trips.currentHighA} A the software interlock trips and ramps every coil to zero, which ends the run; meanwhile the winding heats quickly.`,
      action: 'Open Steer and lower the requested field. If the setpoint is already below the alarm level, the supply is running away: ramp down and call the lab engineer.',
      respondWithinMin: 2,
    },
  })),
  ...perAxis((a) => ({
    channel: `currentDeviation.${a}`,
    level: 'H',
    limit: 0.5,
    deadband: 0.1,
    onDelayMs: 300,
    offDelayMs: 1000,
    priority: 'medium',
    latching: false,
    suppressDuringRamp: true,
    rationale: {
      cause: `The current in pair ${a} does not follow its setpoint: the supply hit its voltage or current limit, a cable or contact got worse, or the supply is faulty.`,
      consequence: 'The field points elsewhere than planned, so the data taken now do not belong to the intended orientation.',
      action: 'Mark the running shots as suspect in the logbook, compare voltage and current on Coil detail, and stop the sequence if the deviation persists.',
      respondWithinMin: 5,
    },
  })),
  ...perAxis((a) => ({
    channel: `temperature.${a}`,
    level: 'H',
    limit: 55,
    deadband: 2,
    onDelayMs: 1000,
    offDelayMs: 5000,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: `Coil pair ${a} runs warmer than usual: a long high-current sequence, reduced coolant flow or warm supply water.`,
      consequence: `If the rise continues the coil reaches the HH level and, at ${trips.temperatureHighC} °C, the interlock trips; hot windings age their insulation.`,
      action: 'Check the flow and water temperatures of this pair; shorten the duty cycle or lower the field until the temperature falls.',
      respondWithinMin: 10,
    },
  })),
  ...perAxis((a) => ({
    channel: `temperature.${a}`,
    level: 'HH',
    limit: 60,
    deadband: 2,
    onDelayMs: 1000,
    offDelayMs: 5000,
    priority: 'high',
    latching: true,
    rationale: {
      cause: `Coil pair ${a} is close to its trip temperature, almost always because cooling failed or the pair ran far above its rating.`,
      consequence: `The interlock trips at ${trips.temperatureHighC} °C; past that the hardware chain cuts the supply and the epoxy of the winding can be damaged.`,
      action: 'Ramp the field down now, then find the cooling fault. Reset this alarm only once the cause is understood and noted in the logbook.',
      respondWithinMin: 1,
    },
  })),
  ...perAxis((a) => ({
    channel: `flow.${a}`,
    level: 'L',
    limit: 1.5,
    deadband: 0.2,
    onDelayMs: 1000,
    offDelayMs: 3000,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: `Less coolant reaches pair ${a}: a partly closed valve, a clogged filter or a weakening chiller pump.`,
      consequence: 'The coil warms faster than usual and reaches its temperature alarms at lower currents.',
      action: 'Check valves and the filter of this circuit; tell the lab engineer if the chiller pressure is low.',
      respondWithinMin: 10,
    },
  })),
  ...perAxis((a) => ({
    channel: `flow.${a}`,
    level: 'LL',
    limit: 1.2,
    deadband: 0.2,
    onDelayMs: 500,
    offDelayMs: 3000,
    priority: 'high',
    latching: true,
    rationale: {
      cause: `Coolant flow of pair ${a} has nearly stopped: a closed valve, a burst hose or a chiller failure.`,
      consequence: `Below ${trips.flowLowLpm} L/min the interlock trips; with no flow the coil overheats within minutes at full current.`,
      action: 'Ramp the field down now, look for leaks near the coils, and call the lab engineer. Reset only after flow is back and the cause is noted.',
      respondWithinMin: 1,
    },
  })),
  ...perAxis((a) => ({
    channel: `waterReturn.${a}`,
    level: 'H',
    limit: 35,
    deadband: 1,
    onDelayMs: 5000,
    offDelayMs: 10_000,
    priority: 'low',
    latching: false,
    rationale: {
      cause: `The water leaving pair ${a} is warm: high load, low flow or warm supply water.`,
      consequence: 'Little margin is left before the coil temperature alarms; over hours, warm return water strains the chiller.',
      action: 'Compare with the supply temperature and flow of this circuit; reduce the duty cycle if it keeps rising.',
      respondWithinMin: 30,
    },
  })),
  {
    channel: 'waterSupply',
    level: 'H',
    limit: 25,
    deadband: 0.5,
    onDelayMs: 10_000,
    offDelayMs: 10_000,
    priority: 'low',
    latching: false,
    rationale: {
      cause: 'The building chiller delivers warm water: it is overloaded, in maintenance or failing.',
      consequence: 'Every coil runs warmer and may reach its temperature alarms during normal sequences.',
      action: 'Ask facilities about the chiller; plan lower-field or shorter sequences until the supply cools.',
      respondWithinMin: 30,
    },
  },
  {
    channel: 'waterSupply',
    level: 'L',
    limit: 10,
    deadband: 0.5,
    onDelayMs: 10_000,
    offDelayMs: 10_000,
    priority: 'low',
    latching: false,
    rationale: {
      cause: 'The supply water is colder than the room dew point usually allows.',
      consequence: 'Condensation forms on hoses and coil mounts and can drip onto electronics near the chamber.',
      action: 'Check for water on surfaces near the coils and ask facilities to raise the chiller setpoint.',
      respondWithinMin: 30,
    },
  },
  {
    channel: 'fieldMagnitude',
    level: 'H',
    limit: 35,
    deadband: 0.5,
    onDelayMs: 500,
    offDelayMs: 1000,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: 'The field is stronger than the range the lab calibrated and uses for its dipolar gases.',
      consequence: 'Predictions outside the calibrated range are unreliable, and the gas may sit near an unwanted scattering resonance and lose atoms.',
      action: 'Lower the field target; if no target asks for it, compare the coil currents with their setpoints.',
      respondWithinMin: 5,
    },
  },
  {
    channel: 'fieldAngleDeviation',
    level: 'H',
    limit: 3,
    deadband: 0.5,
    onDelayMs: 500,
    offDelayMs: 1000,
    priority: 'medium',
    latching: false,
    suppressDuringRamp: true,
    rationale: {
      cause: 'The field points more than 3° away from the target: one pair deviates from its setpoint, a background field changed, or the calibration no longer fits.',
      consequence: 'The dipoles, and with them the deformation of the gas, are not where the experiment assumes; shots taken now are mislabelled.',
      action: 'Check the current deviations first; if they are small, suspect a background-field change and ask the lead about a new calibration.',
      respondWithinMin: 5,
    },
  },
  {
    channel: 'collapseRatio',
    level: 'H',
    limit: 0.9,
    deadband: 0.02,
    onDelayMs: 1000,
    offDelayMs: 2000,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: 'The prediction puts the dipolar strength within 10 % of the mean-field collapse threshold for the present field direction and sample profile.',
      consequence: 'Near the threshold the gas may collapse and lose its atoms, and the mean-field prediction itself becomes unreliable.',
      action: 'Turn the field back towards a stable direction (see the Orientation map) or check that the active sample profile matches the running gas.',
      respondWithinMin: 5,
    },
  },
  {
    channel: 'stale',
    level: 'H',
    limit: 500,
    deadband: 100,
    onDelayMs: 0,
    offDelayMs: 1000,
    priority: 'high',
    latching: false,
    rationale: {
      cause: 'No telemetry has arrived for half a second: the controller stopped, its network link or the message broker failed.',
      consequence: 'The screens show old numbers and the software interlock cannot see the coils; it trips on stale data, but only the hardware interlocks still protect the apparatus.',
      action: 'Check the controller and its network; keep the field off until telemetry is back and the interlock has been reset.',
      respondWithinMin: 1,
    },
  },
  {
    channel: 'databaseOutage',
    level: 'H',
    limit: 2,
    deadband: 1,
    onDelayMs: 0,
    offDelayMs: 0,
    priority: 'medium',
    latching: false,
    rationale: {
      cause: 'The server cannot reach its PostgreSQL database (restart, network or disk trouble on the database host).',
      consequence: 'Alarms and the software interlock keep working from memory, but telemetry, alarm history and trips of the outage may not be recorded, and operator actions that must be recorded are refused.',
      action: 'Check the database server and its host; /api/health shows the connection error. Avoid resets and limit changes until it is back.',
      respondWithinMin: 15,
    },
  },
];

/** The seeded demo set, validated at load so a typo fails the first test run. */
export const DEMO_ALARM_LIMITS: readonly AlarmLimit[] = parseAlarmLimits(
  inputs.map((l) => ({ ...l, id: `${l.channel}.${l.level}` })),
);
