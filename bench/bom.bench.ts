/**
 * BOM checks throughput: assemblies checked per second in worst-case mode
 * (options.mode = 'worst-case': every rule, worst case over the corners, no
 * Monte Carlo), on one core, against a baseline measured in the same run: one
 * bare analyzeCircuit per assembly (the least any check of a circuit costs).
 *
 * The assemblies are all different (E24 values drawn per assembly), so the
 * batch's cache of identical designs never hits; a second figure shows a batch
 * of 50 designs repeated, as PLM revision batches are. Target: ≥ 2000/s per core. Each
 * figure is the best of five rounds, by wall clock and by CPU time (the machine is shared:
 * on these machines rounds of one process were seen to range over ±20 %).
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
      topology: 'three-resistor-divider',
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

/** Rounds per figure: the best one is reported (a shared machine only ever slows a round down). */
const ROUNDS = 5;

/**
 * Best of ROUNDS, by wall clock and by this process's CPU time: on a loaded machine the wall
 * clock counts time spent waiting for a core, the CPU time does not.
 */
function timeIt(fn: () => number): { seconds: number; cpuSeconds: number; count: number } {
  let best = { seconds: Infinity, cpuSeconds: Infinity, count: 0 };
  for (let round = 0; round < ROUNDS; round++) {
    const cpu0 = process.cpuUsage();
    const t0 = performance.now();
    const count = fn();
    const seconds = (performance.now() - t0) / 1000;
    const cpu = process.cpuUsage(cpu0);
    const cpuSeconds = (cpu.user + cpu.system) / 1e6;
    best = { seconds: Math.min(best.seconds, seconds), cpuSeconds: Math.min(best.cpuSeconds, cpuSeconds), count };
  }
  return best;
}

const N = 3000;
const distinct = assemblies(N, N);
const repeated = assemblies(N, 50);
const amp = findBuiltInAmplifier('cmos-rrio-fast')!;

/**
 * The baseline batch is checked this many times per round: one pass over N assemblies takes ~15 ms,
 * a few of the kernel's CPU-time ticks, so a single pass read anywhere from 110 k to 210 k/s.
 */
const BASELINE_PASSES = 40;

function baseline(): number {
  let n = 0;
  for (let pass = 0; pass < BASELINE_PASSES; pass++) n += baselinePass();
  return n;
}

function baselinePass(): number {
  let n = 0;
  const rnd = lcg(42);
  for (let k = 0; k < N; k++) {
    const r = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    const c = E24_NF[Math.floor(rnd() * E24_NF.length)];
    const rDiv = E24_KOHM[Math.floor(rnd() * E24_KOHM.length)];
    analyzeCircuit({ topology: 'three-resistor-divider', supply: { positiveV: 5, negativeV: 0 }, amplifier: amp, parts: { rTiming: r, cTiming: c, rTop: rDiv, rBottom: rDiv, rFeedback: rDiv } }, { model: 'closed-form' });
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
const cpuRate = (t: { cpuSeconds: number; count: number }) => t.count / t.cpuSeconds;
const line = (label: string, t: ReturnType<typeof timeIt>, ratio: string) =>
  console.log(`${label} ${rate(t).toFixed(0).padStart(8)} /s wall ${cpuRate(t).toFixed(0).padStart(8)} /s cpu${ratio}`);
line('baseline  analyzeCircuit per assembly (closed form)', base, '');
line('bom-checks worst-case, all designs distinct', wc, `   ratio to baseline ${(rate(wc) / rate(base)).toFixed(3)}`);
line('bom-checks worst-case, 50 designs repeated ', rep, `   ratio to baseline ${(rate(rep) / rate(base)).toFixed(3)}`);
console.log(`target ≥ 2000 assemblies/s per core (cpu time): distinct ${cpuRate(wc) >= 2000 ? 'met' : 'NOT met'}, repeated ${cpuRate(rep) >= 2000 ? 'met' : 'NOT met'}`);
