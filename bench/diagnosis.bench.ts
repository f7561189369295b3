/**
 * Diagnosis accuracy on synthetic faulty boards made by the odex reference
 * integrator (test/core/fit/diagnosis-boards.ts): every registered topology,
 * every role off by ±3–20 %, wrong parts (decade slip, neighbouring E24 value,
 * swapped roles), in-tolerance boards for the false-alarm rate; each board
 * captured with noise and 8-bit quantisation as output only, capacitor only
 * and both channels. Prints top-1 / top-3 per topology and channel set (a
 * board counts as found when an explanation in the first k names a role at
 * fault, or the service declares the leading hypotheses indistinguishable
 * and one of them does), the false-alarm rate, and the time per diagnosis
 * beside the time of the reference integration that made the record.
 * Targets (issue): top-1 ≥ 90 %, top-3 ≥ 98 %, false alarms ≤ 5 %.
 */
import { fitCircuit } from '../src/core/fit/index.ts';
import { allBoards, boardCapture, CHANNEL_SETS, score, type ChannelSet } from '../test/core/fit/diagnosis-boards.ts';

const boards = allBoards(20261202, { deviationsPerRole: 3, wrongParts: true, inTolerance: 4 });
type Tally = { n: number; top1: number; top3: number };
const table = new Map<string, Tally>();
const alarms = { n: 0, false: 0 };
let diagnoseMs = 0;
let referenceMs = 0;
let records = 0;
let skipped = 0;
const misses: string[] = [];
for (const [k, board] of boards.entries()) {
  if (k % 10 === 0) process.stderr.write(`board ${k} of ${boards.length}\n`);
  for (const channels of CHANNEL_SETS as readonly ChannelSet[]) {
    const t0 = performance.now();
    const capture = boardCapture(board, channels, 7919 * k + channels.length);
    const t1 = performance.now();
    referenceMs += t1 - t0;
    if (!capture) {
      skipped++;
      continue;
    }
    let report;
    try {
      report = fitCircuit({ circuit: board.nominal, tolerances: board.tolerances, capture });
    } catch (err) {
      // A record the service refuses (e.g. a decade slip that stops the edges inside the record) counts as a miss.
      misses.push(`${board.topology} ${board.fault} [${channels}]: refused (${(err as Error).message.slice(0, 80)})`);
      if (board.faultRoles.length > 0) {
        const key = `${board.topology}|${channels}`;
        const t = table.get(key) ?? { n: 0, top1: 0, top3: 0 };
        t.n++;
        table.set(key, t);
      }
      continue;
    }
    diagnoseMs += performance.now() - t1;
    records++;
    const s = score(board, report);
    if (!s.faulty) {
      alarms.n++;
      if (s.falseAlarm) alarms.false++;
      continue;
    }
    const key = `${board.topology}|${channels}`;
    const t = table.get(key) ?? { n: 0, top1: 0, top3: 0 };
    t.n++;
    if (s.top1) t.top1++;
    if (s.top3) t.top3++;
    else misses.push(`${board.topology} ${board.fault} [${channels}]: top ${report.diagnosis.explanations.slice(0, 3).map((e) => e.hypothesis).join(', ')}`);
    table.set(key, t);
  }
}
const pct = (a: number, b: number) => (b === 0 ? '   -  ' : `${((100 * a) / b).toFixed(1).padStart(5)} %`);
console.log(`${boards.length} boards (${boards.filter((b) => b.faultRoles.length > 0).length} faulty), ${records} records diagnosed, ${skipped} faulty boards that do not oscillate skipped`);
console.log('topology                  channels    records   top-1     top-3');
const total: Tally = { n: 0, top1: 0, top3: 0 };
for (const [key, t] of [...table.entries()].sort()) {
  const [topology, channels] = key.split('|');
  console.log(`${topology.padEnd(26)}${channels.padEnd(12)}${String(t.n).padStart(7)}   ${pct(t.top1, t.n)}   ${pct(t.top3, t.n)}`);
  total.n += t.n;
  total.top1 += t.top1;
  total.top3 += t.top3;
}
console.log(`${'all'.padEnd(38)}${String(total.n).padStart(7)}   ${pct(total.top1, total.n)}   ${pct(total.top3, total.n)}   (targets 90 % / 98 %)`);
console.log(`false alarms on in-tolerance boards: ${alarms.false} of ${alarms.n} (${pct(alarms.false, alarms.n)}; target <= 5 %)`);
console.log(`time: ${(diagnoseMs / Math.max(1, records)).toFixed(0)} ms per capture analysis + fit + diagnosis, beside ${(referenceMs / Math.max(1, records + skipped)).toFixed(0)} ms per reference integration (ratio ${(diagnoseMs / Math.max(1, referenceMs)).toFixed(2)})`);
console.log(`misses (first 25 of ${misses.length}):`);
for (const m of misses.slice(0, 25)) console.log(`  ${m}`);
