/**
 * BOM checks' Monte Carlo under a time budget (options.monteCarloBudgetMs, src/core/tolerance/time-budget.ts):
 * an assembly whose yield run is projected past the budget keeps its worst case and gets the yield rule's
 * yield-not-evaluated with the reason; under the budget the verdict is the unbudgeted one. The clock is our
 * own fake (it moves a fixed step at every reading), so the verdicts are deterministic.
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssembly, type BomAssemblyResult, type BomCheckContext } from '../../../src/core/index.ts';
import { baseAssembly, context, NOMINAL_FREQUENCY_HZ } from './fixtures.ts';

function steppingClock(stepMs: number) {
  let t = 0;
  return () => (t += stepMs);
}

const assembly = baseAssembly({ spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1, minimumYield: 0.99 } });
const rule = (r: BomAssemblyResult, code: string) => r.rules.find((x) => x.code === code);
const check = (ctx: BomCheckContext) => evaluateAssembly(assembly, 0, ctx);

describe('BOM Monte Carlo under a time budget', () => {
  it('projected past the budget: worst case kept, the yield not evaluated with the cost and the samples that fit', () => {
    // 10 ms a reading against a 300 ms budget: 20,000 samples project to seconds.
    const refused = check({ ...context({ mode: 'full', monteCarloSamples: 20_000, monteCarloBudgetMs: 300 }), clock: steppingClock(10) });
    const skipped = rule(refused, 'yield-not-evaluated');
    expect(skipped?.message).toMatch(/^The yield was not evaluated: options\.monteCarloSamples: 20,000 Monte Carlo samples would take about [\d.]+ s .*ask for at most [\d,]+ samples, or set options\.mode to 'worst-case'$/);
    expect(rule(refused, 'yield-met')).toBeUndefined();
    // The worst case is the worst-case-only run's, figure for figure.
    const worstCaseOnly = check(context({ mode: 'worst-case' }));
    const figures = (r: BomAssemblyResult) => r.rules.filter((x) => x.code.startsWith('frequency-') || x.code.startsWith('duty-')).map((x) => x.figures);
    expect(figures(refused)).toEqual(figures(worstCaseOnly));
    expect(figures(refused).length).toBeGreaterThan(0);
  });

  it('under the budget: the verdict of the run without one', () => {
    const unbudgeted = check(context({ mode: 'full', monteCarloSamples: 2000 }));
    const budgeted = check({ ...context({ mode: 'full', monteCarloSamples: 2000, monteCarloBudgetMs: 60_000 }), clock: steppingClock(50) });
    expect(rule(budgeted, 'yield-met')?.figures).toEqual(rule(unbudgeted, 'yield-met')?.figures);
    expect(budgeted).toEqual(unbudgeted);
  });
});
