import { benchPipeline } from './test/bench/pipeline.bench.js';
import { printFigures } from './test/bench/figures.js';
printFigures('pipeline', await benchPipeline());
process.exit(0);
