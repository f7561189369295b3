/**
 * Rules on what a line's value text says: what was understood (always
 * reported, so a reviewer sees how the text was read), whether a value was
 * found, what was left over, and which tolerance had to be assumed.
 */
import { formatValue } from '../../parts/value-parse.ts';
import { BOM_RULES } from '../codes.ts';
import { at, ruleResult } from '../rule.ts';
import type { AssumedTolerances, BomLineReading, BomRuleResult } from '../types.ts';

function percent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(6))} %`;
}

/** value-read (info) when a value was found, value-unreadable (error) when not. */
export function valueReadRule(line: BomLineReading): BomRuleResult {
  if (line.value === undefined) {
    const why = line.notes.length > 0 ? `: ${line.notes.join('; ')}` : '';
    const text = line.valueText.trim() === '' ? 'The value cell is empty' : `No ${line.kind} value could be read from "${line.valueText}"`;
    return ruleResult(BOM_RULES.valueUnreadable, `${text}${why}`, { valueText: line.valueText, kind: line.kind }, at(line));
  }
  const result = ruleResult(
    BOM_RULES.valueRead,
    `"${line.valueText}" read as ${formatValue(line.value, line.kind)}${line.tolerance !== undefined ? ` ±${percent(line.tolerance)}` : ''}`,
    {
      valueText: line.valueText,
      kind: line.kind,
      value: line.value,
      tolerance: line.tolerance,
      toleranceSource: line.toleranceSource,
      ratedVoltageV: line.ratedVoltageV,
      dielectric: line.dielectricCode,
      tempcoPpmPerK: line.tempcoPpmPerK,
      packageCode: line.packageCode,
    },
    at(line),
  );
  result.understood = [...line.understood];
  return result;
}

/** Tokens of the value column nobody understood: a typo or an attribute the checks cannot see. */
export function leftoverTextRule(line: BomLineReading): BomRuleResult | undefined {
  if (line.value === undefined || line.unparsed.length === 0) return undefined;
  return ruleResult(
    BOM_RULES.valueTextLeftover,
    `Part of "${line.valueText}" was not understood: ${line.unparsed.map((t) => `"${t}"`).join(', ')}`,
    { valueText: line.valueText, unparsed: line.unparsed.join(' ') },
    at(line),
  );
}

/** Default tolerances for lines that state none: conservative figures of common practice. */
export const DEFAULT_ASSUMED_TOLERANCES: Readonly<AssumedTolerances> = Object.freeze({ resistor: 0.05, capacitor: 0.1 });

/** Fills in the tolerance of a line that states none and says so (the worst case uses it). */
export function assumeToleranceRule(line: BomLineReading, assumed: AssumedTolerances): BomRuleResult | undefined {
  if (line.value === undefined || line.tolerance !== undefined) return undefined;
  line.tolerance = assumed[line.kind];
  line.toleranceSource = 'assumed';
  return ruleResult(
    BOM_RULES.toleranceAssumed,
    `No tolerance is stated for ${line.refdes}; the checks assume ±${percent(line.tolerance)} for a ${line.kind}`,
    { assumedTolerance: line.tolerance },
    at(line),
  );
}
