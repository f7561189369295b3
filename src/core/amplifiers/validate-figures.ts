/**
 * The ONE validation of an amplifier figure set, used for inline amplifiers in
 * requests and for registrations (PUT /v1/amplifiers/{id}) alike, so that
 * nothing can be stored that a request would refuse. Two stages:
 * 1. each figure against its table entry (type, physical range, "no limit");
 * 2. derived quantities: figures that are each in range but together leave the
 *    part without an output swing or without a common-mode range.
 * Every failure is a CoreError('invalid-value') naming the figure's pointer.
 */
import { CoreError } from '../errors.ts';
import { AMPLIFIER_FIGURE_ENTRIES, describeRange, type NumberFigure } from './figures-table.ts';
import type { AmplifierFigures } from './model.ts';

function invalid(message: string, pointer: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

/** Is `v` an accepted value of the figure `d` (finite in range, 0 where allowed, or its "no limit" value)? */
export function figureValueInRange(d: NumberFigure, v: number): boolean {
  if (typeof v !== 'number' || Number.isNaN(v)) return false;
  if (!Number.isFinite(v)) return d.unlimited !== undefined && v === d.unlimited.value;
  if (v === 0 && d.zeroAllowed) return true;
  if (d.minExclusive ? !(v > d.min) : !(v >= d.min)) return false;
  return v <= d.max;
}

export function validateFigures(amp: AmplifierFigures, pointer: string): void {
  const values = amp as unknown as Record<string, unknown>;
  for (const [name, d] of AMPLIFIER_FIGURE_ENTRIES) {
    const v = values[name];
    const at = `${pointer}/${name}`;
    if (d.kind === 'choice') {
      if (typeof v !== 'string' || !d.choices.includes(v)) invalid(`${name} must be one of ${d.choices.join(', ')}`, at);
      continue;
    }
    if (!figureValueInRange(d, v as number)) {
      invalid(`${name} must be ${describeRange(d)}${d.unlimited ? '' : ' (a finite number)'}; got ${String(v)}`, at);
    }
  }
  checkDerived(amp, pointer);
}

/** Combinations of in-range figures that describe no working part. */
function checkDerived(amp: AmplifierFigures, pointer: string): void {
  if (amp.supplyMaxV < amp.supplyMinV) invalid('supplyMaxV must not be below supplyMinV', `${pointer}/supplyMaxV`);
  // At the largest rated supply the output must have some swing left between its headrooms
  // (an open-drain output has no high headroom: the pull-up sets the high level).
  const headroomV = (amp.outputStage === 'open-drain' ? 0 : amp.outputHeadroomHighV) + amp.outputHeadroomLowV;
  if (!(headroomV < amp.supplyMaxV)) {
    invalid(
      `the output headrooms add up to ${headroomV} V, which leaves no output swing at the largest rated supply span (supplyMaxV ${amp.supplyMaxV} V)`,
      `${pointer}/${amp.outputStage === 'open-drain' ? 'outputHeadroomLowV' : 'outputHeadroomHighV'}`,
    );
  }
  // Likewise the input common-mode range must not be empty at the largest rated supply.
  const cmV = amp.inputCommonModeLowMarginV + amp.inputCommonModeHighMarginV;
  if (Number.isFinite(cmV) && !(cmV < amp.supplyMaxV)) {
    invalid(
      `the input common-mode margins add up to ${cmV} V, which leaves no common-mode range at the largest rated supply span (supplyMaxV ${amp.supplyMaxV} V)`,
      `${pointer}/inputCommonModeHighMarginV`,
    );
  }
}
