/**
 * The diode-steered and open-drain topologies against textbook results and
 * hand derivations written out here (not taken from the code).
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, IDEAL_FIGURES, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { CoreError } from '../../../src/core/errors.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const amp = (overrides: Partial<AmplifierModel>): AmplifierModel => ({ ...ideal, ...IDEAL_FIGURES, ...overrides, id: 'test', figuresBasis: 'caller-supplied' }) as AmplifierModel;

function steeredSplit(rCharge: number, rDischarge: number, diode: { forwardDropV: number; resistanceOhm: number }, railV = 10): Circuit {
  // β = rGround / (rGround + rFeedback) = 0.5
  return {
    topology: 'diode-steered',
    supply: { positiveV: railV, negativeV: -railV },
    amplifier: ideal,
    parts: { rCharge, rDischarge, cTiming: 10e-9, rFeedback: 10e3, rGround: 10e3 },
    diode,
  };
}

describe('diode-steered, split rails (Sedra & Smith astable, one resistor per half cycle)', () => {
  it('ideal diodes: each half is R·C·ln((1+β)/(1−β)) with its own R', () => {
    // Sedra & Smith, op-amp astable: T/2 = τ·ln((1+β)/(1−β)); with steering, τ differs per half.
    for (const [rc, rd] of [
      [10e3, 10e3],
      [4.7e3, 47e3],
      [100e3, 2.2e3],
    ]) {
      const r = analyzeCircuit(steeredSplit(rc, rd, { forwardDropV: 0, resistanceOhm: 0 }));
      const k = Math.log((1 + 0.5) / (1 - 0.5));
      expect(r.timeHighS / (rc * 10e-9 * k) - 1).toBeLessThan(1e-12);
      expect(r.timeLowS / (rd * 10e-9 * k) - 1).toBeLessThan(1e-12);
      expect(r.dutyCycle).toBeCloseTo(rc / (rc + rd), 12);
    }
  });

  it('real diodes: the drop lowers the asymptote, the resistance adds to the path (hand derivation)', () => {
    // High state: v rises from −βV toward V − Vf through (rCharge + rD):
    //   t_high = (rCharge + rD)·C·ln((V − Vf + βV)/(V − Vf − βV)); low state by symmetry with rDischarge.
    const V = 10;
    const beta = 0.5;
    const d = { forwardDropV: 0.65, resistanceOhm: 25 };
    const r = analyzeCircuit(steeredSplit(22e3, 6.8e3, d, V));
    const ln = Math.log((V - d.forwardDropV + beta * V) / (V - d.forwardDropV - beta * V));
    expect(r.timeHighS / ((22e3 + 25) * 10e-9 * ln) - 1).toBeLessThan(1e-12);
    expect(r.timeLowS / ((6.8e3 + 25) * 10e-9 * ln) - 1).toBeLessThan(1e-12);
  });

  it('uses the documented default diode (0.6 V, 10 Ω) when none is given', () => {
    const withDefault = analyzeCircuit({ ...steeredSplit(10e3, 10e3, { forwardDropV: 0.6, resistanceOhm: 10 }), diode: undefined });
    const explicit = analyzeCircuit(steeredSplit(10e3, 10e3, { forwardDropV: 0.6, resistanceOhm: 10 }));
    expect(withDefault.periodS).toBe(explicit.periodS);
  });

  it('single-rail arrangement: thresholds V+/3 and 2V+/3 with three equal divider resistors', () => {
    // Textbook single-supply case (DESIGN §5): equal rTop, rBottom, rFeedback put the thresholds at V+/3 and 2V+/3;
    // with ideal diodes charging through R_c from the output at V+ (and discharging through R_d to 0 V)
    // each half is R·C·ln 2.
    const r = analyzeCircuit({
      topology: 'diode-steered',
      supply: { positiveV: 9, negativeV: 0 },
      amplifier: ideal,
      parts: { rCharge: 15e3, rDischarge: 33e3, cTiming: 4.7e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      diode: { forwardDropV: 0, resistanceOhm: 0 },
    });
    expect(r.thresholds.upperV).toBeCloseTo(6, 12);
    expect(r.thresholds.lowerV).toBeCloseTo(3, 12);
    expect(r.timeHighS / (15e3 * 4.7e-9 * Math.LN2) - 1).toBeLessThan(1e-12);
    expect(r.timeLowS / (33e3 * 4.7e-9 * Math.LN2) - 1).toBeLessThan(1e-12);
  });

  it('names the missing or conflicting part of the threshold network', () => {
    const base = steeredSplit(10e3, 10e3, { forwardDropV: 0.6, resistanceOhm: 10 });
    const noGround = { ...base, parts: { rCharge: 1e4, rDischarge: 1e4, cTiming: 1e-8, rFeedback: 1e4 } };
    expect(() => analyzeCircuit(noGround)).toThrow(CoreError);
    try {
      analyzeCircuit(noGround);
    } catch (e) {
      expect((e as CoreError).code).toBe('missing-part');
      expect((e as CoreError).pointer).toBe('/parts/rGround');
    }
    const both = { ...base, parts: { ...base.parts, rTop: 1e4, rBottom: 1e4 } };
    try {
      analyzeCircuit(both);
      expect.unreachable();
    } catch (e) {
      expect((e as CoreError).code).toBe('unexpected-part');
    }
  });
});

describe('open-drain-pullup', () => {
  const openDrain = (rPullup: number, overrides: Partial<AmplifierModel> = {}): Circuit => ({
    topology: 'open-drain-pullup',
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: amp({ outputStage: 'open-drain', ...overrides }),
    parts: { rPullup, rTiming: 100e3, cTiming: 10e-9, rTop: 1e6, rBottom: 1e6, rFeedback: 1e6 },
  });

  it('with a stiff pull-up it becomes the push-pull textbook circuit: T = 2·ln2·RC', () => {
    // Textbook single-supply astable with three equal resistors (DESIGN §5): T = 2·ln2·R·C.
    const r = analyzeCircuit(openDrain(1));
    const expected = 2 * Math.LN2 * 100e3 * 10e-9;
    expect(Math.abs(r.periodS / expected - 1)).toBeLessThan(1e-4);
    expect(r.states.high.sourceV).toBeNull(); // released: nothing drives the pin
  });

  it('the high level comes from the pull-up and its loads (hand derivation, Thevenin at the pin)', () => {
    // Released pin: V+ through rPullup, loaded by an external 10 kΩ to ground; the feedback and timing
    // resistors (1 MΩ and 100 kΩ) also load it. With them negligible against 10 kΩ: V ≈ 5·10k/(10k + 4.7k).
    const c = { ...openDrain(4.7e3), load: { resistanceOhm: 10e3, returnV: 0 } };
    const r = analyzeCircuit(c);
    const unloaded = (5 * 10e3) / (10e3 + 4.7e3);
    expect(r.output.highV).toBeLessThan(unloaded); // the network loads it a little more
    expect(r.output.highV).toBeGreaterThan(unloaded * 0.9);
    expect(r.output.lowV).toBeCloseTo(0, 3);
  });

  it('refuses a push-pull amplifier, and a push-pull topology refuses an open-drain one', () => {
    expect(() => analyzeCircuit({ ...openDrain(1e3), amplifier: ideal })).toThrow(/open-drain output stage/);
    expect(() =>
      analyzeCircuit({
        topology: 'two-resistor-feedback',
        supply: { positiveV: 5, negativeV: -5 },
        amplifier: amp({ outputStage: 'open-drain' }),
        parts: { rTiming: 1e4, cTiming: 1e-8, rFeedback: 1e4, rGround: 1e4 },
      }),
    ).toThrow(/open-drain-pullup/);
  });
});
