/**
 * Whether a pair of output states can oscillate at all (hysteresis, each state's
 * asymptote beyond its threshold) and which state power-up picks. The figures
 * themselves come from the walk (engine/), whose closed-form special case — one
 * exponential piece per state — is the textbook relaxation-oscillator solution
 * (docs/model.md §3).
 */
import { CoreError } from '../errors.ts';
import type { StateModel } from './state-model.ts';
import type { OutputState } from './types.ts';
import { formatVolts } from './format.ts';

export interface OscillationConditions {
  lowerV: number;
  upperV: number;
}

/** Throws 'no-oscillation' when the thresholds leave no hysteresis band (both models need one). */
export function requireHysteresis(upperV: number, lowerV: number): void {
  if (!(upperV > lowerV)) {
    throw new CoreError(
      'no-oscillation',
      `No hysteresis: the upper threshold (${formatVolts(upperV)}) is not above the lower one (${formatVolts(lowerV)}), so the output cannot hold a state`,
      undefined,
      { upperThresholdV: upperV, lowerThresholdV: lowerV },
    );
  }
}

/** Throws 'no-oscillation' with the reason when the pair of states latches. */
export function requireOscillation(high: StateModel, low: StateModel): OscillationConditions {
  const upperV = high.switchingV;
  const lowerV = low.switchingV;
  requireHysteresis(upperV, lowerV);
  if (!(high.asymptoteV > upperV)) {
    throw new CoreError(
      'no-oscillation',
      `The output latches high: in the high state the capacitor settles at ${formatVolts(high.asymptoteV)}, which does not reach the upper threshold ${formatVolts(upperV)}`,
      undefined,
      { stuckState: 'high', asymptoteV: high.asymptoteV, thresholdV: upperV },
    );
  }
  if (!(low.asymptoteV < lowerV)) {
    throw new CoreError(
      'no-oscillation',
      `The output latches low: in the low state the capacitor settles at ${formatVolts(low.asymptoteV)}, which does not fall to the lower threshold ${formatVolts(lowerV)}`,
      undefined,
      { stuckState: 'low', asymptoteV: low.asymptoteV, thresholdV: lowerV },
    );
  }
  return { lowerV, upperV };
}

/**
 * Which state the output takes at power-up with the capacitor empty. Inside the
 * hysteresis band both are consistent and the real outcome depends on how the
 * rails come up: we then assume the output rises first and say it is not determinate.
 */
export function powerUpState(high: StateModel, low: StateModel): { initialState: OutputState; determinate: boolean } {
  const highOk = 0 < high.switchingV;
  const lowOk = 0 > low.switchingV;
  if (highOk && lowOk) return { initialState: 'high', determinate: false };
  return { initialState: highOk ? 'high' : 'low', determinate: true };
}
