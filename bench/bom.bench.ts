/**
 * BOM checks throughput: assemblies checked per second in worst-case mode
 * (options.mode = 'worst-case': every rule, worst case over the corners, no
 * Monte Carlo), on one core, against a baseline measured in the same run: one
 * bare analyzeCircuit per assembly (the least any check of a circuit costs).
 *
 * The assemblies are all different (E24 values drawn per assembly), so the
 * batch's cache of identical designs never hits; a second figure shows a batch
 * of 50 designs repeated, as PLM revision batches are. Target: ≥ 2000/s per core.
 * Scenario values are our own (demo only).
 */
import { analyzeCircuit, DEFAULT_BOM_OPTIONS, evaluateAssemblies, findBuiltInAmplifier, type BomAssembly, type BomCheckContext } from '../src/core/index.ts';
import { seriesValues } from '../src/core/parts/index.ts';

const E24_KOHM = seriesValues('E24', 10e3, 91e3);
const E24_NF = seriesValues('E24', 1e-9, 9.1e-9);

/** Small deterministic generator so every run checks the same batch. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function kilo(ohm: number): string {
  return `${Number((ohm / 1e3).toPrecision(3))}K`;
}

function assemblies(count: number, distinct: number): BomAssembly[] {
  const rnd = lcg(42);
  const designs = Array.from({ length: distinct }, (_, i) => {
    const r = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    const c = E24_NF[Math.floor(rnd() * E24_NF.length)];
    const rDiv = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    const f = 1 / (2 * Math.LN2 * r * c);
    return { i, r, c, rDiv, f };
  });
  return Array.from({ length: count }, (_, k) => {
    const d = designs[k % distinct];
    return {
      id: `bench-${k}`,
      lines: [
        { refdes: 'R1', value: `${kilo(d.r)} 1% 0603` },
        { refdes: 'C1', value: `${Number((d.c * 1e9).toPrecision(2))}nF 50V C0G 2%` },
        { refdes: 'R2 R3 R4', value: `${kilo(d.rDiv)} 1% 0603 100ppm` },
        { refdes: 'U1', value: 'quad op-amp' },
      ],
      roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
      topology: 'single-supply-divider',
      amplifier: 'cmos-rrio-fast',
      supply: { positiveV: 5, negativeV: 0, tolerance: 0.05 },
      temperature: { minC: -20, maxC: 70 },
      spec: { frequencyHz: d.f, frequencyTolerance: 0.08, dutyMin: 0.4, dutyMax: 0.6, minimumYield: 0.99 },
      series: 'E24',
    } satisfies BomAssembly;
  });
}

function context(): BomCheckContext {
  return { lookupAmplifier: findBuiltInAmplifier, options: { ...DEFAULT_BOM_OPTIONS, mode: 'worst-case' }, spreadCache: new Map() };
}

function timeIt(fn: () => number): { seconds: number; count: number } {
  const t0 = performance.now();
  const count = fn();
  return { seconds: (performance.now() - t0) / 1000, count };
}

const N = 3000;
const distinct = assemblies(N, N);
const repeated = assemblies(N, 50);
const amp = findBuiltInAmplifier('cmos-rrio-fast')!;

function baseline(): number {
  let n = 0;
  const rnd = lcg(42);
  for (let k = 0; k < N; k++) {
    const r = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    const c = E24_NF[Math.floor(rnd() * E24_NF.length)];
    const rDiv = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    analyzeCircuit({ topology: 'single-supply-divider', supply: { positiveV: 5, negativeV: 0 }, amplifier: amp, parts: { rTiming: r, cTiming: c, rTop: rDiv, rBottom: rDiv, rFeedback: rDiv } }, { model: 'closed-form' });
    n++;
  }
  return n;
}

function checkAll(batch: BomAssembly[]): number {
  let n = 0;
  let passed = 0;
  for (const r of evaluateAssemblies(batch, context())) {
    n++;
    if (r.pass) passed++;
  }
  if (passed === 0) throw new Error('bench batch: nothing passed, the scenario is broken');
  return n;
}

// Warm-up so the JIT has compiled the hot paths for every measurement.
checkAll(distinct.slice(0, 300));
baseline();

const base = timeIt(baseline);
const wc = timeIt(() => checkAll(distinct));
const rep = timeIt(() => checkAll(repeated));

const rate = (t: { seconds: number; count: number }) => t.count / t.seconds;
console.log(`baseline  analyzeCircuit per assembly       ${rate(base).toFixed(0).padStart(8)} /s`);
console.log(`bom-checks worst-case, all designs distinct ${rate(wc).toFixed(0).padStart(8)} /s   ratio to baseline ${(rate(wc) / rate(base)).toFixed(3)}`);
console.log(`bom-checks worst-case, 50 designs repeated  ${rate(rep).toFixed(0).padStart(8)} /s   ratio to baseline ${(rate(rep) / rate(base)).toFixed(3)}`);
console.log(`target ≥ 2000 assemblies/s per core: distinct ${rate(wc) >= 2000 ? 'met' : 'NOT met'}, repeated ${rate(rep) >= 2000 ? 'met' : 'NOT met'}`);
