/**
 * Diagnosis accuracy on synthetic faulty boards made by the odex reference
 * integrator (test/core/fit/diagnosis-boards.ts): every registered topology,
 * every role off by ±3–20 %, wrong parts (decade slip, neighbouring E24 value,
 * swapped roles, a small-case class II timing capacitor in place of the flat
 * one), in-tolerance boards for the false-alarm rate; each board
 * recorded once and captured with noise and 8-bit quantisation as output only,
 * capacitor only and both channels. Prints top-1 / top-3 per topology and
 * channel set (a board counts as found when an explanation in the first k
 * names a role at fault, or the service declares the leading hypotheses
 * indistinguishable, one of them does, and the measurement it suggests tells
 * the fault apart on the board itself), the same under the earlier looser
 * rule (any declared look-alike naming the fault), the false-alarm rate, and the time
 * per record of POST /v1/fit's core (capture analysis + fit + diagnosis)
 * beside the time of the reference integration that made the record.
 * Targets (issue): top-1 ≥ 90 %, top-3 ≥ 98 %, false alarms ≤ 5 %.
 *
 * Boards are shared out over worker threads (one per core); each thread
 * builds the same board list from the seed and takes every W-th board.
 * TICKWRIGHT_DIAGNOSIS_SCALE (default 1) scales the number of boards.
 * Slices (the full run takes minutes on a shared machine):
 * - TICKWRIGHT_DIAGNOSIS_FILTER: a regular expression on "topology fault"
 *   (e.g. "open-drain", "other dielectric", "open-drain.*cTiming"); boards that
 *   do not match are left out;
 * - TICKWRIGHT_DIAGNOSIS_CHANNELS: channel sets, comma-separated (e.g. "both,capacitor");
 * - TICKWRIGHT_DIAGNOSIS_SEED: another board list (default the bench's seed);
 * - TICKWRIGHT_DIAGNOSIS_THREADS: worker threads (default one per core, at most 8).
 * The slice is printed on the first line, so a table is never read as the full run's.
 */
import { availableParallelism } from 'node:os';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { fitCircuit } from '../src/core/fit/index.ts';
import { allBoards, boardRecord, captureOf, CHANNEL_SETS, score, type Board, type ChannelSet } from '../test/core/fit/diagnosis-boards.ts';

const SEED = Number(process.env.TICKWRIGHT_DIAGNOSIS_SEED ?? 20261202);
const FILTER = process.env.TICKWRIGHT_DIAGNOSIS_FILTER ? new RegExp(process.env.TICKWRIGHT_DIAGNOSIS_FILTER) : undefined;
const CHANNELS: readonly ChannelSet[] = process.env.TICKWRIGHT_DIAGNOSIS_CHANNELS
  ? CHANNEL_SETS.filter((c) => process.env.TICKWRIGHT_DIAGNOSIS_CHANNELS!.split(',').map((s) => s.trim()).includes(c))
  : CHANNEL_SETS;
/** The boards of this run: the whole list, or the slice the filter names (indices kept, so seeds stay per board). */
const selected = (boards: Board[]) => boards.map((b, k) => ({ b, k })).filter(({ b }) => !FILTER || FILTER.test(`${b.topology} ${b.fault}`));
const SCALE = Number(process.env.TICKWRIGHT_DIAGNOSIS_SCALE ?? 1);
/** 13 deviations per role: ≥ 300 faulty boards over the registered topologies (with the wrong parts and swaps). */
const OPTIONS = { deviationsPerRole: Math.max(1, Math.round(13 * SCALE)), wrongParts: true, inTolerance: Math.max(1, Math.round(10 * SCALE)) };

interface RecordResult {
  topology: string;
  channels: ChannelSet;
  fault: string;
  faulty: boolean;
  detected: boolean;
  top1: boolean;
  top3: boolean;
  looseTop1: boolean;
  looseTop3: boolean;
  falseAlarm: boolean;
  /** Why it is a miss (top three, or the refusal). */
  miss?: string;
  fitMs: number;
}

interface BoardResult {
  records: RecordResult[];
  referenceMs: number;
  oscillates: boolean;
}

function runBoard(board: Board, k: number): BoardResult {
  const t0 = performance.now();
  const record = boardRecord(board);
  const referenceMs = performance.now() - t0;
  if (!record) return { records: [], referenceMs, oscillates: false };
  const records: RecordResult[] = [];
  for (const channels of CHANNELS) {
    const capture = captureOf(board, record, channels, 7919 * k + channels.length);
    const base = { topology: board.topology, channels, fault: board.fault, faulty: board.faultRoles.length > 0 };
    const t1 = performance.now();
    try {
      const report = fitCircuit({ circuit: board.nominal, tolerances: board.tolerances, capture });
      const fitMs = performance.now() - t1;
      const s = score(board, report);
      const top = report.diagnosis.explanations.slice(0, 3).map((e) => e.hypothesis).join(', ');
      records.push({ ...base, detected: s.detected, top1: s.top1, top3: s.top3, looseTop1: s.looseTop1, looseTop3: s.looseTop3, falseAlarm: s.falseAlarm, fitMs, ...(s.faulty && !s.top1 ? { miss: `${s.top3 ? 'top-3 only' : 'missed'}: ${report.diagnosis.verdict.agreesWithNominal ? 'agrees with nominal; ' : ''}top ${top}` } : {}) });
    } catch (err) {
      // A record the service refuses (e.g. a decade slip that stops the edges inside the record) counts as a miss.
      records.push({ ...base, detected: base.faulty, top1: false, top3: false, looseTop1: false, looseTop3: false, falseAlarm: !base.faulty, fitMs: performance.now() - t1, miss: `refused (${(err as Error).message.slice(0, 80)})` });
    }
  }
  return { records, referenceMs, oscillates: true };
}

if (!isMainThread) {
  const { index, count } = workerData as { index: number; count: number };
  const boards = selected(allBoards(SEED, OPTIONS));
  const results: BoardResult[] = [];
  for (let i = index; i < boards.length; i += count) results.push(runBoard(boards[i].b, boards[i].k));
  parentPort!.postMessage(results);
} else {
  const boards = selected(allBoards(SEED, OPTIONS)).map(({ b }) => b);
  const threads = Math.max(1, Math.min(Number(process.env.TICKWRIGHT_DIAGNOSIS_THREADS ?? availableParallelism()), 8));
  const faultyBoards = boards.filter((b) => b.faultRoles.length > 0).length;
  const slice = [FILTER ? `filter /${FILTER.source}/` : '', CHANNELS.length < CHANNEL_SETS.length ? `channels ${CHANNELS.join(',')}` : '', process.env.TICKWRIGHT_DIAGNOSIS_SEED ? `seed ${SEED}` : ''].filter(Boolean);
  console.log(slice.length > 0 ? `SLICE: ${slice.join('; ')}` : 'full run');
  process.stderr.write(`${boards.length} boards (${faultyBoards} faulty) over ${threads} worker threads\n`);
  const started = performance.now();
  // Each thread registers tsx itself (as src/http/workers/source-entry.mjs does), then loads this file.
  const entry = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(import.meta.url)}); })`;
  const perThread = await Promise.all(
    Array.from(
      { length: threads },
      (_, index) =>
        new Promise<BoardResult[]>((resolve, reject) => {
          const w = new Worker(entry, { eval: true, workerData: { index, count: threads } });
          w.once('message', resolve);
          w.once('error', reject);
        }),
    ),
  );
  const wallS = (performance.now() - started) / 1000;
  const results = perThread.flat();

  /** n, top-1, top-3 over every faulty record; d, d1, d3 over the detected ones (the verdict departs from the tolerance spread). */
  type Tally = { n: number; top1: number; top3: number; d: number; d1: number; d3: number };
  const empty = (): Tally => ({ n: 0, top1: 0, top3: 0, d: 0, d1: 0, d3: 0 });
  const table = new Map<string, Tally>();
  const byKind = new Map<string, Tally>();
  /** The same faulty records under the looser rule (any declared look-alike naming the fault counts). */
  const looseByKind = new Map<string, { n: number; top1: number; top3: number }>();
  const alarms = { n: 0, false: 0 };
  const misses: string[] = [];
  let fitMs = 0;
  let records = 0;
  let referenceMs = 0;
  let latched = 0;
  const kindOf = (fault: string) =>
    fault.includes('decade') ? 'decade slip' : fault.includes('neighbouring') ? 'neighbouring value' : fault.includes('swapped') ? 'swapped roles' : fault.includes('dielectric') ? 'other dielectric' : 'deviation ±3–20 %';
  for (const b of results) {
    referenceMs += b.referenceMs;
    if (!b.oscillates) latched++;
    for (const r of b.records) {
      fitMs += r.fitMs;
      records++;
      if (!r.faulty) {
        alarms.n++;
        if (r.falseAlarm) alarms.false++;
        continue;
      }
      for (const [map, key] of [
        [table, `${r.topology}|${r.channels}`],
        [byKind, `${kindOf(r.fault)}|${r.channels}`],
      ] as const) {
        const t = map.get(key) ?? empty();
        t.n++;
        if (r.top1) t.top1++;
        if (r.top3) t.top3++;
        if (r.detected) {
          t.d++;
          if (r.top1) t.d1++;
          if (r.top3) t.d3++;
        }
        map.set(key, t);
      }
      for (const key of [kindOf(r.fault), 'all']) {
        const t = looseByKind.get(key) ?? { n: 0, top1: 0, top3: 0 };
        t.n++;
        if (r.looseTop1) t.top1++;
        if (r.looseTop3) t.top3++;
        looseByKind.set(key, t);
      }
      if (r.miss) misses.push(`${r.topology} ${r.fault} [${r.channels}]: ${r.miss}`);
    }
  }
  const pct = (a: number, b: number) => (b === 0 ? '   -  ' : `${((100 * a) / b).toFixed(1).padStart(5)} %`);
  const add = (into: Tally, t: Tally) => {
    for (const k of Object.keys(into) as (keyof Tally)[]) into[k] += t[k];
  };
  const row = (group: string, channels: string, t: Tally) =>
    `${group.padEnd(26)}${channels.padEnd(12)}${String(t.n).padStart(7)}  ${String(t.n - t.d).padStart(7)}   ${pct(t.d1, t.d)}   ${pct(t.d3, t.d)}     ${pct(t.top1, t.n)}   ${pct(t.top3, t.n)}`;
  const print = (title: string, map: Map<string, Tally>) => {
    console.log(`${''.padEnd(38)}         within   -- detected faults --     ---- all faulty ----`);
    console.log(`${title.padEnd(26)}channels    records   spread   top-1     top-3       top-1     top-3`);
    const perChannels = new Map<string, Tally>();
    for (const [key, t] of [...map.entries()].sort()) {
      const [group, channels] = key.split('|');
      console.log(row(group, channels, t));
      const c = perChannels.get(channels) ?? empty();
      add(c, t);
      perChannels.set(channels, c);
    }
    const total = empty();
    for (const [channels, t] of perChannels) {
      console.log(row('all', channels, t));
      add(total, t);
    }
    console.log(`${row('all', '', total)}   (targets 90 % / 98 % where the channels tell)`);
  };
  console.log(`${boards.length} boards (${faultyBoards} faulty, ${latched} of them do not oscillate and are skipped), ${records} records diagnosed`);
  console.log(
    'within spread: faulty records the verdict finds consistent with every part in tolerance (the channels cannot tell the fault); top-k counts a record when ' +
      'one of the first k explanations names a role at fault, or the service declares the leading hypotheses indistinguishable, one of them does, and the measurement it suggests tells the fault apart on the board',
  );
  print('topology', table);
  console.log('');
  print('fault kind', byKind);
  console.log('earlier, looser rule (a declared look-alike naming the fault counts, whatever the measurement it suggests), all faulty records:');
  for (const [kind, t] of [...looseByKind.entries()].sort()) console.log(`  ${kind.padEnd(24)}${String(t.n).padStart(6)}   top-1 ${pct(t.top1, t.n)}   top-3 ${pct(t.top3, t.n)}`);
  console.log(`false alarms on in-tolerance boards: ${alarms.false} of ${alarms.n} (${pct(alarms.false, alarms.n)}; target <= 5 %)`);
  const perFit = fitMs / Math.max(1, records);
  const perReference = referenceMs / Math.max(1, results.length);
  console.log(
    `time: ${perFit.toFixed(0)} ms per record for capture analysis + fit + diagnosis, beside ${perReference.toFixed(0)} ms per board for the reference integration ` +
      `that made it (ratio ${(perFit / perReference).toFixed(2)}); wall ${wallS.toFixed(0)} s on ${threads} threads`,
  );
  console.log(`misses and top-3-only finds (first 80 of ${misses.length}):`);
  for (const m of misses.slice(0, 80)) console.log(`  ${m}`);
}
