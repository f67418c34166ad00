/**
 * `npm run bench`: every benchmark of the product, printed as figures with their targets and
 * ratios measured in the same run. Not part of `npm test`: timing belongs here, never in tests.
 */
import { benchPhysics } from '../../shared/physics/physics.bench.js';
import { benchPipeline } from './pipeline.bench.js';
import { benchTrip } from './trip.bench.js';
import { benchHistory } from './history.bench.js';
import { printFigures } from './figures.js';

printFigures('Physics model (shared/physics)', await benchPhysics());
printFigures('Telemetry pipeline (controller → broker → server → WebSocket)', await benchPipeline());
printFigures('Software interlock (offending frame or silence → TripCommand on the broker)', await benchTrip());
printFigures('History (10-min raw window through GET /api/history, against the live path in the same run)', await benchHistory());
process.exit(0);
