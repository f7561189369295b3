/**
 * The last step of every search: the full analysis (time-domain engine where the amplifier needs it) of the
 * best-ranked candidates, in rank order. Skips candidates already analysed in an earlier pass and those
 * that latch; stops once `count` candidates were analysed. The caller decides what to keep.
 */
import { analyzeCircuit } from '../circuit/analyze.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import type { Circuit } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';

export function analyseInRankOrder<E extends { key: string; circuit: Circuit }>(
  ranked: Iterable<E>,
  count: number,
  analysedKeys: Set<string>,
  stats: { fullAnalyses: number },
  onAnalysed: (candidate: E, analysis: AnalysisResult) => void,
): void {
  let taken = 0;
  for (const e of ranked) {
    if (taken >= count) break;
    if (analysedKeys.has(e.key)) continue;
    analysedKeys.add(e.key);
    taken++;
    stats.fullAnalyses++;
    let analysis: AnalysisResult;
    try {
      analysis = analyzeCircuit(e.circuit);
    } catch (err) {
      if (err instanceof CoreError && err.code === 'no-oscillation') continue;
      throw err;
    }
    onAnalysed(e, analysis);
  }
}
