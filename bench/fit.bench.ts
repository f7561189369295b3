/**
 * POST /v1/fit's core on a 1,000,000-sample two-channel capture: capture
 * analysis (histogram-mode state levels, reference-level instants, capacitor turning points
 * and windowed time constants) + MAP fit + diagnosis, each timed, beside a
 * baseline measured in the same run: one plain pass over both typed arrays
 * (the least any analysis must do). Target (issue): the whole path ≤ 0.4 s.
 */
import { analyzeCapture, fitCircuit, predictFigures, readCapture, type ScalarMeasurements } from '../src/core/fit/index.ts';
import { addNoise, quantise } from '../test/core/fit/capture-synth.ts';
import { synthesizeCapture } from '../test/core/fit/estimate-capture-synth.ts';
import { bridgeClock, bridgeClockTolerances, withParts } from '../test/core/fit/estimate-scenario.ts';

const N = 1_000_000;
const DT = 20e-9; // 20 ms, about 190 periods
const truth = withParts(bridgeClock, { cTiming: 4.7e-9 * 1.175 });
const cap = synthesizeCapture(truth, { sampleIntervalS: DT, sampleCount: N, phaseS: 37e-6 });
addNoise(cap.output, 0.02, 1);
addNoise(cap.capacitor, 0.005, 2);
quantise(cap.output, 8, -3, 3);
quantise(cap.capacitor, 8, -1.5, 1.5);

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const plain: number[] = [];
const analysis: number[] = [];
const whole: number[] = [];
let top = '';
let sink = 0;
for (let k = 0; k < 5; k++) {
  let t = performance.now();
  let s = 0;
  for (let i = 0; i < N; i++) s += cap.output[i] + cap.capacitor[i];
  sink += s;
  plain.push(performance.now() - t);
  t = performance.now();
  analyzeCapture({ sampleIntervalS: DT, ...cap });
  analysis.push(performance.now() - t);
  t = performance.now();
  const r = fitCircuit({ circuit: bridgeClock, tolerances: bridgeClockTolerances, capture: { sampleIntervalS: DT, ...cap } });
  whole.push(performance.now() - t);
  top = r.diagnosis.explanations[0]?.hypothesis ?? 'none';
}
// The fit + diagnosis part alone: the capture's measurements handed over as scalars (the same path after the
// capture analysis), beside one forward-model evaluation (a walk from power-up and its reading) in the same run.
const scalars: ScalarMeasurements = Object.fromEntries(readCapture({ sampleIntervalS: DT, ...cap }).measurements.map((m) => [m.name, { value: m.value, uncertainty: m.uncertainty }]));
const fitOnly: number[] = [];
const forward: number[] = [];
for (let k = 0; k < 7; k++) {
  let t = performance.now();
  fitCircuit({ circuit: bridgeClock, tolerances: bridgeClockTolerances, measurements: scalars });
  fitOnly.push(performance.now() - t);
  t = performance.now();
  for (let j = 0; j < 100; j++) predictFigures(bridgeClock);
  forward.push((performance.now() - t) / 100);
}
const p = median(plain);
const a = median(analysis);
const w = median(whole);
console.log(`capture: ${N.toLocaleString('en')} samples x 2 channels (sink ${sink.toExponential(2)})`);
console.log(`baseline, one plain pass over both arrays: median ${p.toFixed(1)} ms`);
console.log(`capture analysis: median ${a.toFixed(0)} ms (${(a / p).toFixed(0)}x the plain pass)`);
console.log(`analysis + fit + diagnosis: median ${w.toFixed(0)} ms (${(w / p).toFixed(0)}x the plain pass; target <= 400 ms: ${w <= 400 ? 'met' : 'MISSED'})`);
const f = median(fitOnly);
const e = median(forward);
console.log(`fit + diagnosis alone (the capture's measurements as scalars): median ${f.toFixed(0)} ms, ${(f / e).toFixed(0)}x one forward evaluation (${(e * 1000).toFixed(0)} µs)`);
console.log(`top hypothesis: ${top} (truth: cTiming +17.5 %)`);
