/**
 * The threshold networks topologies are built from, with what design, snap and
 * fit need to know about each: its roles, how they sit around the decision node,
 * where a hysteresis width puts the thresholds, and the ideal resistor values
 * that produce a threshold pair at a chosen Thevenin resistance (the threshold
 * solver). A topology lists the networks it can be built with (topology.ts).
 */
import { CoreError } from '../../errors.ts';
import {
  centredThresholds,
  networkThresholds,
  placeThresholds,
  solveDivider,
  type DecisionNetwork,
  type ScreeningContext,
  type ThresholdPair,
} from './threshold-solver.ts';

export interface ThresholdNetworkSpec {
  /** Our name for the arrangement, for messages. */
  name: string;
  /** Roles of the network around the decision node, in solver order. */
  roles: readonly string[];
  /** True when the thresholds are returned around ground and need a rail below it (split supply). */
  needsNegativeRail: boolean;
  /** True when the pair can sit anywhere in the swing, so placement sets the duty cycle. */
  placesDuty: boolean;
  network(values: Readonly<Record<string, number>>): DecisionNetwork;
  /**
   * The threshold pair for a hysteresis width (fraction of the output swing) and duty target,
   * bias current ignored: placed for the duty (divider) or as the ratio sets it (feedback, duty
   * then follows from the levels). Throws 'infeasible' when the network cannot produce it.
   */
  thresholds(fraction: number, dutyCycle: number, ctx: ScreeningContext): ThresholdPair;
  /** A pair centred on the swing (diode steering sets the duty by its path ratio instead). */
  centred(fraction: number, ctx: ScreeningContext): ThresholdPair;
  /** Ideal role values that put the thresholds at `t` with Thevenin resistance `parallelOhm` at P. */
  solve(t: ThresholdPair, ctx: ScreeningContext, parallelOhm: number): Record<string, number>;
  /** Roles in series from a rail through the network: the path whose current a supply budget bounds. */
  railPathRoles: readonly string[];
  /** Free-ratio search (snap without ideal values): the feedback and return roles of a two-resistor network. */
  freeRatio?: { feedback: string; ground: string };
}

const noBias = (ctx: ScreeningContext): ScreeningContext => ({ ...ctx, inputBiasCurrentA: 0 });

/** rTop to V+, rBottom to ground, rFeedback from the output: the pair can be placed anywhere in the swing. */
export const DIVIDER_NETWORK: ThresholdNetworkSpec = {
  name: 'three-resistor divider',
  roles: ['rTop', 'rBottom', 'rFeedback'],
  needsNegativeRail: false,
  placesDuty: true,
  network: (v) => ({ toPositiveOhm: v.rTop, toGroundOhm: v.rBottom, toOutputOhm: v.rFeedback }),
  thresholds(fraction, dutyCycle, ctx) {
    const t = placeThresholds(dutyCycle, fraction * (ctx.levels.highV - ctx.levels.lowV), ctx.levels);
    solveDivider(t, noBias(ctx), 1); // throws when no divider from V+ and ground produces the pair
    return t;
  },
  centred(fraction, ctx) {
    const t = centredThresholds(fraction * (ctx.levels.highV - ctx.levels.lowV), ctx.levels);
    solveDivider(t, noBias(ctx), 1);
    return t;
  },
  solve: (t, ctx, parallelOhm) => ({ ...solveDivider(t, ctx, parallelOhm) }),
  railPathRoles: ['rTop', 'rBottom'],
};

/** rFeedback from the output, rGround to ground (mid rail): thresholds at ±β times the output levels. */
export const FEEDBACK_NETWORK: ThresholdNetworkSpec = {
  name: 'two-resistor feedback',
  roles: ['rFeedback', 'rGround'],
  needsNegativeRail: true,
  placesDuty: false,
  network: (v) => ({ toGroundOhm: v.rGround, toOutputOhm: v.rFeedback }),
  thresholds(fraction, _dutyCycle, ctx) {
    if (!(fraction > 0 && fraction < 1)) throw new CoreError('infeasible', 'The hysteresis must be narrower than the output swing');
    // β = rGround / (rGround + rFeedback) = width / swing.
    return networkThresholds({ toGroundOhm: fraction, toOutputOhm: 1 - fraction }, noBias(ctx));
  },
  centred(fraction, ctx) {
    return FEEDBACK_NETWORK.thresholds(fraction, 0.5, ctx);
  },
  solve(t, ctx, parallelOhm) {
    const beta = (t.upperV - t.lowerV) / (ctx.levels.highV - ctx.levels.lowV);
    if (!(beta > 0 && beta < 1)) {
      throw new CoreError('infeasible', `A feedback network cannot make a hysteresis of ${(beta * 100).toPrecision(3)} % of the swing`, undefined, { feedbackFraction: beta });
    }
    // Conductance shares: β through rFeedback, 1 − β through rGround (the earlier hand formula had them swapped).
    return { rFeedback: parallelOhm / beta, rGround: parallelOhm / (1 - beta) };
  },
  railPathRoles: ['rFeedback', 'rGround'],
  freeRatio: { feedback: 'rFeedback', ground: 'rGround' },
};
