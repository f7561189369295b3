/**
 * The `tickwright` command line end to end: spawned as a child process on real
 * files in a temp dir, in-process (the app's routes through inject, on the same
 * store settings as the server) and against a server listening on loopback
 * (--server). Checks exit codes (0 ok, 1 check/spec failed, 2 usage, 3 service
 * error), stdin input, NDJSON output and that both paths give identical answers.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteStore } from '../../src/store/index.ts';
import { addNoise, quantise } from '../core/fit/capture-synth.ts';
import { synthesizeCapture } from '../core/fit/estimate-capture-synth.ts';
import { bridgeClock, withParts } from '../core/fit/estimate-scenario.ts';
import { testApp } from '../helpers/app.ts';
import { tickwright } from './run.ts';

const READ_KEY = 'cli-read-key';
const WRITE_KEY = 'cli-write-key';

/** Scenarios of our own (README). */
const PROBE_CLOCK = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '15k', cTiming: '10n', rTop: '100k', rBottom: '100k', rFeedback: '100k' },
};
const DESIGN = { targetFrequencyHz: 5000, targetDutyCycle: 0.5, frequencyTolerance: 0.01, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast', count: 2 };
const TOLERANCE = {
  circuit: {
    topology: 'three-resistor-divider',
    supply: { positiveV: 5 },
    amplifier: 'cmos-rrio-fast',
    parts: { rTiming: '2k2', cTiming: '180n', rTop: '5k1', rBottom: '5k1', rFeedback: '18k' },
  },
  tolerances: { rTiming: 0.01, cTiming: 0.05, rTop: 0.01, rBottom: 0.01, rFeedback: 0.01 },
  monteCarlo: { samples: 2000, seed: 7 },
  spec: { frequencyHz: 5000, frequencyTolerance: 0.05 },
};
const BOM_CSV = [
  'assembly,refdes,value',
  'probe-clock-rev-c,R1,22K 1% 0603',
  'probe-clock-rev-c,C1,4n7 50V C0G 2%',
  'probe-clock-rev-c,"R2, R3, R4",68K 1% 0603',
  'probe-clock-rev-d,R1,22K 5% 0603',
  'probe-clock-rev-d,C1,4n7/16V Y5V',
  'probe-clock-rev-d,"R2, R3, R4",68K 1% 0603',
].join('\r\n');
const BOM_ASSEMBLY = {
  roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
  topology: 'three-resistor-divider',
  amplifier: 'cmos-rrio-fast',
  supply: { positiveV: 5, tolerance: 0.05 },
  temperature: { minC: 0, maxC: 50 },
  spec: { frequencyHz: 7000, frequencyTolerance: 0.1 },
  series: 'E24',
};
const CATALOGUE = {
  name: 'Greenhouse line approved timing parts',
  parts: [{ kind: 'capacitor', value: '47n', tolerance: 0.05, dielectric: 'C0G', ratedVoltageV: 25, partNumber: 'GH-C-0103', package: '1206', status: 'active' }],
};
// The second scenario: a ±2.5 V bridge-excitation clock whose capacitor came out 8 % high.
const FIT_CIRCUIT = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 2.5, negativeV: -2.5 },
  amplifier: { base: 'cmos-rrio-fast', outputResistanceOhm: 0 },
  parts: { rTiming: '16k', cTiming: '4n7', rFeedback: '22k', rGround: '10k' },
};

function scopeCsv(cTimingF: number): string {
  const dt = 0.1e-6;
  const c = synthesizeCapture(withParts(bridgeClock, { cTiming: cTimingF }), { sampleIntervalS: dt, sampleCount: 20_000, phaseS: 21e-6 });
  addNoise(c.output, 0.02, 9);
  addNoise(c.capacitor, 0.005, 10);
  const out = quantise(c.output, 8, -3, 3);
  const cap = quantise(c.capacitor, 8, -1.5, 1.5);
  const lines = ['Model,bench scope', 'Time (us),CH1 (V),CH2 (V)'];
  for (let i = 0; i < out.length; i++) lines.push(`${(i * dt * 1e6).toFixed(4)},${out[i].toFixed(4)},${cap[i].toFixed(4)}`);
  return lines.join('\r\n');
}

let dir: string;
let dbPath: string;
let server: FastifyInstance;
let serverUrl: string;
let keyed: FastifyInstance;
let keyedUrl: string;
const file = (name: string) => path.join(dir, name);

async function listen(app: FastifyInstance): Promise<string> {
  await app.listen({ port: 0, host: '127.0.0.1' });
  const address = app.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  return `http://127.0.0.1:${address.port}`;
}

/** In-process: the store the server would open, from the same environment variable. */
const local = (args: string[], stdin?: string) => tickwright(args, { cwd: dir, env: { TICKWRIGHT_DB_PATH: dbPath }, ...(stdin !== undefined ? { stdin } : {}) });
const remote = (args: string[], env: Record<string, string> = {}) => tickwright(['--server', serverUrl, ...args], { cwd: dir, env });

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'tickwright-cli-'));
  dbPath = file('tickwright.db');
  writeFileSync(file('probe.json'), JSON.stringify(PROBE_CLOCK));
  writeFileSync(file('design.json'), JSON.stringify(DESIGN));
  writeFileSync(file('tolerance.json'), JSON.stringify(TOLERANCE));
  writeFileSync(file('bom.csv'), BOM_CSV);
  writeFileSync(file('assembly.json'), JSON.stringify(BOM_ASSEMBLY));
  writeFileSync(file('catalogue.json'), JSON.stringify(CATALOGUE));
  writeFileSync(file('circuit.json'), JSON.stringify(FIT_CIRCUIT));
  // A 5 % timing capacitor: the capture's +8 % is then beyond its tolerance, so the board departs from nominal
  // (within a 10 % tolerance the fit would rightly call +8 % a board in order).
  writeFileSync(file('tolerances.json'), JSON.stringify({ cTiming: 0.05, rTiming: 0.01, rFeedback: 0.01, rGround: 0.01 }));
  writeFileSync(file('scope.csv'), scopeCsv(4.7e-9 * 1.08));
  writeFileSync(file('broken.json'), '{"topology": ');
  // The loopback server runs on the same SQLite file the in-process commands use.
  server = await testApp({ store: openSqliteStore(dbPath) });
  serverUrl = await listen(server);
  keyed = await testApp({ config: { apiKeys: `read:${READ_KEY},write:${WRITE_KEY}` } });
  keyedUrl = await listen(keyed);
});

afterAll(async () => {
  await server?.close();
  await keyed?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

// Each spawned command loads the TypeScript sources and builds the app: generous limits for a busy machine.
describe('in-process (no --server)', { timeout: 120_000 }, () => {
  it('analyze: a table, exit 0, near the textbook period', async () => {
    const run = await local(['analyze', 'probe.json']);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/frequency\s+│\s+4\.7\d+ kHz/);
    expect(run.stdout).toContain('checks: none');
  });

  it('analyze from stdin with --json answers exactly what the server answers', async () => {
    const run = await local(['analyze', '-', '--json'], JSON.stringify(PROBE_CLOCK));
    expect(run.code).toBe(0);
    const viaServer = await server.inject({ method: 'POST', url: '/v1/analyze', payload: PROBE_CLOCK });
    expect(JSON.parse(run.stdout)).toEqual(viaServer.json());
    // Textbook (Horowitz & Hill, The Art of Electronics, Schmitt-trigger oscillator): thresholds at V/3 and
    // 2V/3 give T = 2·R·C·ln 2 with an ideal output; the archetype's non-idealities move it by a few per cent.
    expect(Math.abs(JSON.parse(run.stdout).frequencyHz * 2 * 15e3 * 10e-9 * Math.log(2) - 1)).toBeLessThan(0.03);
  });

  it('bom: CSV in, NDJSON out in request order, a progress bar on stderr, exit 1 when an assembly fails', async () => {
    const run = await local(['bom', 'bom.csv', '--assembly', 'assembly.json', '--json', '--mode', 'worst-case', '--progress', 'always']);
    expect(run.code).toBe(1);
    const lines = run.stdout.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => [l.id, l.index, l.pass])).toEqual([
      ['probe-clock-rev-c', 0, true],
      ['probe-clock-rev-d', 1, false],
    ]);
    // EIA-198: Y5V is a class III dielectric (+22 %/−82 %), unfit for a timing capacitor.
    expect(lines[1].rules.map((r: { code: string }) => r.code)).toContain('dielectric-unfit-for-timing');
    expect(run.stderr).toContain('2/2 assemblies, 1 failed');
  });

  it('catalogues put writes the store the server reads: nothing kept twice', async () => {
    const put = await local(['catalogues', 'put', 'greenhouse-approved', 'catalogue.json', '--json']);
    expect(put.code).toBe(0);
    const created = JSON.parse(put.stdout);
    expect(created.version).toBe(1);
    const read = await server.inject({ method: 'GET', url: '/v1/catalogues/greenhouse-approved' });
    expect(read.statusCode).toBe(200);
    expect(read.headers.etag).toBe(created.etag);
    // Replacing without If-Match: 428 (RFC 6585 §3) -> a service error, exit 3, with a hint.
    const blind = await local(['catalogues', 'put', 'greenhouse-approved', 'catalogue.json']);
    expect(blind.code).toBe(3);
    expect(blind.stderr).toContain('428');
    expect(blind.stderr).toContain('--if-match');
  });

  it('usage errors exit 2: unknown command, missing file, unreadable JSON, a CSV BOM without its assembly', async () => {
    const runs = await Promise.all([
      local(['frobnicate']),
      local(['analyze', 'no-such-file.json']),
      local(['analyze', 'broken.json']),
      local(['bom', 'bom.csv']),
    ]);
    expect(runs.map((r) => r.code)).toEqual([2, 2, 2, 2]);
    expect(runs[1].stderr).toContain('ENOENT');
    expect(runs[2].stderr).toContain('not valid JSON');
    expect(runs[3].stderr).toContain('--assembly');
  });

  it('a bad value is a service error (exit 3) naming the field by JSON pointer (RFC 6901)', async () => {
    const run = await local(['analyze', '-'], JSON.stringify({ ...PROBE_CLOCK, parts: { ...PROBE_CLOCK.parts, cTiming: 'ten nano' } }));
    expect(run.code).toBe(3);
    expect(run.stderr).toContain('/parts/cTiming');
  });
});

describe('--server on loopback', { timeout: 120_000 }, () => {
  it('analyze gives the same answer as in-process', async () => {
    const [viaServer, inProcess] = await Promise.all([remote(['analyze', 'probe.json', '--json']), local(['analyze', 'probe.json', '--json'])]);
    expect(viaServer.code).toBe(0);
    expect(JSON.parse(viaServer.stdout)).toEqual(JSON.parse(inProcess.stdout));
  });

  it('design: designs within the requested tolerance, exit 0', async () => {
    const run = await remote(['design', 'design.json', '--json']);
    expect(run.code).toBe(0);
    const body = JSON.parse(run.stdout);
    expect(body.designs.length).toBeGreaterThan(0);
    for (const d of body.designs) expect(Math.abs(d.frequencyError)).toBeLessThanOrEqual(0.01);
  });

  it('tolerance: exit by worst case, or by Monte Carlo yield with --min-yield', async () => {
    const [byCorner, byYield, strict] = await Promise.all([
      remote(['tolerance', 'tolerance.json', '--json']),
      remote(['tolerance', 'tolerance.json', '--min-yield', '0.9']),
      remote(['tolerance', 'tolerance.json', '--min-yield', '0.99999']),
    ]);
    const body = JSON.parse(byCorner.stdout);
    // A 5 % capacitor alone moves f by about 5 % (f ∝ 1/C), so the corners leave a ±5 % spec ...
    expect(body.worstCase.withinSpec).toBe(false);
    expect(byCorner.code).toBe(1);
    // ... while nearly every normal sample (σ = tolerance/3, common practice) stays inside it.
    expect(body.monteCarlo.yield).toBeGreaterThan(0.9);
    expect(byYield.code).toBe(0);
    expect(byYield.stdout).toContain('yield');
    expect(strict.code).toBe(body.monteCarlo.yield < 0.99999 ? 1 : 0);
  });

  it('fit: a scope CSV and the circuit; the capacitor is named, exit 1 (the board departs from nominal)', async () => {
    const run = await remote(['fit', 'scope.csv', '--circuit', 'circuit.json', '--tolerances', 'tolerances.json', '--json']);
    expect(run.code).toBe(1);
    const body = JSON.parse(run.stdout);
    expect(body.verdict.agreesWithNominal).toBe(false);
    expect(body.explanations[0].causes[0].parameter).toBe('cTiming');
    const estimate = body.estimates.find((e: { parameter: string }) => e.parameter === 'cTiming');
    expect(Math.abs(estimate.estimate / (4.7e-9 * 1.08) - 1)).toBeLessThan(0.02);
  });

  it('a CSV capture without --circuit is a usage error; an unreachable server a service error', async () => {
    const [noCircuit, unreachable] = await Promise.all([
      remote(['fit', 'scope.csv']),
      tickwright(['--server', 'http://127.0.0.1:9', 'amplifiers', 'list'], { cwd: dir }),
    ]);
    expect(noCircuit.code).toBe(2);
    expect(unreachable.code).toBe(3);
    expect(unreachable.stderr).toContain('cannot reach');
  });

  it('API keys: 401 without a key (exit 3); TICKWRIGHT_API_KEY or --api-key lets the call through', async () => {
    const [none, fromEnv, fromFlag] = await Promise.all([
      tickwright(['amplifiers', 'list'], { cwd: dir, env: { TICKWRIGHT_SERVER: keyedUrl } }),
      tickwright(['amplifiers', 'get', 'cmos-rrio-fast', '--json'], { cwd: dir, env: { TICKWRIGHT_SERVER: keyedUrl, TICKWRIGHT_API_KEY: READ_KEY } }),
      tickwright(['--server', keyedUrl, '--api-key', READ_KEY, 'amplifiers', 'list'], { cwd: dir }),
    ]);
    expect(none.code).toBe(3);
    expect(none.stderr).toContain('401');
    expect(fromEnv.code).toBe(0);
    expect(JSON.parse(fromEnv.stdout).id).toBe('cmos-rrio-fast');
    expect(fromFlag.code).toBe(0);
    expect(fromFlag.stdout).toContain('cmos-rrio-fast');
  });
});
