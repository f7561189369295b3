/**
 * YARDSTICK FOR BENCHMARKS ONLY — not product code, never imported from src/.
 *
 * The smallest closed-form evaluator there can be, standing in for the compiled
 * closed form the service had before the one-model change (deleted with it), so
 * bench/prepared.bench.ts can measure "closed-form-eligible circuits are no
 * slower than that" in the same run on the same machine. It does what the
 * deleted evaluator did per vector and nothing more: the nodal solve of both
 * nominal configurations (the product's compiled solve, so both sides pay the
 * same for it), the two switching levels, and one logarithm per state
 * (t = τ·ln((v∞ − v_start)/(v∞ − v_end)), the textbook RC charging time).
 * No event functions, no scope figures, no fallback: it is only valid on a
 * push-pull circuit without amplifier effects, which is all the bench feeds it.
 */
import { CLAMP, configKey, NetworkCoefficients, STAGE, type CompiledShape } from '../src/core/circuit/engine/compiled-network.ts';

export class ClosedFormYardstick {
  private readonly high = new NetworkCoefficients();
  private readonly low = new NetworkCoefficients();
  private readonly key = configKey(STAGE.driven, CLAMP.off, 0);

  constructor(private readonly shape: CompiledShape) {
    if (shape.openDrain || shape.topology.diodeCount > 0) throw new Error('the yardstick handles push-pull circuits without steering diodes only');
  }

  /** Period and duty into out[0], out[1]; false when the vector does not oscillate. */
  evaluate(values: Float64Array, out: Float64Array): boolean {
    const shape = this.shape;
    const slot = shape.slot;
    const roles = shape.layout.roleSlots;
    for (let i = 0; i < roles.length; i++) if (!(values[roles[i]] > 0)) return false;
    const capacitanceF = values[shape.layout.capacitorSlot];
    const biasA = values[slot.bias];
    const config = shape.config(this.key);
    // The deleted evaluator solved each state's network on its own: two solves.
    if (!config.solve(values, capacitanceF, biasA, Infinity, this.high, false)) return false;
    if (!config.solve(values, capacitanceF, biasA, Infinity, this.low, false)) return false;
    const sHigh = values[slot.positiveV] - values[slot.headroomHigh];
    const sLow = values[slot.negativeV] + values[slot.headroomLow];
    const offsetV = values[slot.offset];
    const h = this.high;
    const l = this.low;
    // Switching level: N reaches P + offset, P = pC + pV·v + pS·s.
    const upperV = (h.pC + h.pS * sHigh + offsetV) / (1 - h.pV);
    const lowerV = (l.pC + l.pS * sLow + offsetV) / (1 - l.pV);
    const asymHighV = (h.b0 + h.bS * sHigh) / h.a;
    const asymLowV = (l.b0 + l.bS * sLow) / l.a;
    if (!(upperV > lowerV) || !(asymHighV > upperV) || !(asymLowV < lowerV)) return false;
    const timeHighS = Math.log((asymHighV - lowerV) / (asymHighV - upperV)) / h.a;
    const timeLowS = Math.log((asymLowV - upperV) / (asymLowV - lowerV)) / l.a;
    out[0] = timeHighS + timeLowS;
    out[1] = timeHighS / out[0];
    return true;
  }
}
