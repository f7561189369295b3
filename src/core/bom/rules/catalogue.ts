/**
 * Rules against the owner's approved-parts catalogue. A part number identifies
 * the physical part that will be bought, so a matched catalogue entry also
 * supplies the attributes the value text leaves out (tolerance, dielectric,
 * voltage, tempco); where both give a tolerance the looser one is used, which
 * covers whichever of the two is true.
 */
import type { Catalogue, CataloguePart } from '../../parts/catalogue.ts';
import { formatValue } from '../../parts/value-parse.ts';
import { BOM_RULES } from '../codes.ts';
import { at, ruleResult } from '../rule.ts';
import type { BomLineReading, BomRuleResult } from '../types.ts';

const VALUE_MATCH_REL = 1e-9;

interface CatalogueIndex {
  byPartNumber: Map<string, CataloguePart>;
  /** Parts of each kind sorted by value, for value lookups without a part number. */
  byKind: Record<CataloguePart['kind'], CataloguePart[]>;
}

// Built once per catalogue object: a batch of thousands of assemblies shares one catalogue.
const indexes = new WeakMap<Catalogue, CatalogueIndex>();

function indexOf(catalogue: Catalogue): CatalogueIndex {
  let index = indexes.get(catalogue);
  if (!index) {
    const byPartNumber = new Map<string, CataloguePart>();
    for (const p of catalogue.parts) if (!byPartNumber.has(p.partNumber.trim())) byPartNumber.set(p.partNumber.trim(), p);
    const sorted = (kind: CataloguePart['kind']) => catalogue.parts.filter((p) => p.kind === kind).sort((a, b) => a.value - b.value);
    index = { byPartNumber, byKind: { resistor: sorted('resistor'), capacitor: sorted('capacitor') } };
    indexes.set(catalogue, index);
  }
  return index;
}

function sameValue(a: number, b: number): boolean {
  return Math.abs(a - b) <= VALUE_MATCH_REL * Math.max(Math.abs(a), Math.abs(b));
}

/** Parts of a kind whose value equals `value` (bisection on the sorted list). */
function partsWithValue(sorted: readonly CataloguePart[], value: number): CataloguePart[] {
  let lo = 0;
  let hi = sorted.length;
  const floor = value * (1 - VALUE_MATCH_REL);
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid].value < floor) lo = mid + 1;
    else hi = mid;
  }
  const out: CataloguePart[] = [];
  for (let i = lo; i < sorted.length && sameValue(sorted[i].value, value); i++) out.push(sorted[i]);
  return out;
}

function enrich(line: BomLineReading, part: CataloguePart): void {
  if (line.tolerance === undefined || part.tolerance > line.tolerance) {
    line.tolerance = part.tolerance;
    line.toleranceSource = 'catalogue';
    line.understood.push(`tolerance ±${Number((part.tolerance * 100).toPrecision(6))} % from catalogue part ${part.partNumber}`);
  }
  if (part.dielectric !== undefined && part.dielectric !== line.dielectricCode) {
    line.dielectricCode = part.dielectric;
    line.understood.push(`dielectric ${part.dielectric} from catalogue part ${part.partNumber}`);
  }
  if (part.ratedVoltageV !== undefined && (line.ratedVoltageV === undefined || part.ratedVoltageV < line.ratedVoltageV)) {
    line.ratedVoltageV = part.ratedVoltageV;
    line.understood.push(`rated voltage ${part.ratedVoltageV} V from catalogue part ${part.partNumber}`);
  }
  if (part.tempcoPpmPerK !== undefined && line.tempcoPpmPerK === undefined) {
    line.tempcoPpmPerK = part.tempcoPpmPerK;
    line.understood.push(`temperature coefficient ${part.tempcoPpmPerK} ppm/K from catalogue part ${part.partNumber}`);
  }
}

function statusRule(line: BomLineReading, parts: readonly CataloguePart[]): BomRuleResult | undefined {
  if (parts.length === 0 || parts.some((p) => p.status !== 'not-for-new-designs')) return undefined;
  return ruleResult(
    BOM_RULES.partNotForNewDesigns,
    `${parts.map((p) => p.partNumber).join(', ')} ${parts.length > 1 ? 'are' : 'is'} marked not-for-new-designs in the catalogue`,
    { partNumber: parts.map((p) => p.partNumber).join(', '), status: 'not-for-new-designs' },
    at(line),
  );
}

/** Checks a line against the catalogue and completes its attributes from the matched part. */
export function catalogueRules(line: BomLineReading, catalogue: Catalogue): BomRuleResult[] {
  const index = indexOf(catalogue);
  const rules: BomRuleResult[] = [];
  const partNumber = line.partNumber?.trim();
  if (partNumber) {
    const part = index.byPartNumber.get(partNumber);
    if (!part) {
      rules.push(ruleResult(BOM_RULES.partNumberUnlisted, `Part number ${partNumber} is not in catalogue '${catalogue.id}'`, { partNumber, catalogue: catalogue.id }, at(line)));
      return rules;
    }
    if (part.kind !== line.kind || (line.value !== undefined && !sameValue(part.value, line.value))) {
      rules.push(
        ruleResult(
          BOM_RULES.valueDisagreesWithCatalogue,
          part.kind !== line.kind
            ? `Catalogue part ${partNumber} is a ${part.kind}, but ${line.role} needs a ${line.kind}`
            : `The BOM says ${formatValue(line.value as number, line.kind)}, but catalogue part ${partNumber} is ${formatValue(part.value, part.kind)}`,
          { partNumber, catalogueValue: part.value, catalogueKind: part.kind, bomValue: line.value ?? null },
          at(line),
        ),
      );
      return rules;
    }
    enrich(line, part);
    const status = statusRule(line, [part]);
    if (status) rules.push(status);
    return rules;
  }
  if (line.value === undefined) return rules;
  const matches = partsWithValue(index.byKind[line.kind], line.value);
  if (matches.length === 0) {
    rules.push(
      ruleResult(
        BOM_RULES.valueNotInCatalogue,
        `No ${line.kind} of ${formatValue(line.value, line.kind)} is in catalogue '${catalogue.id}'`,
        { value: line.value, catalogue: catalogue.id },
        at(line),
      ),
    );
    return rules;
  }
  const status = statusRule(line, matches);
  if (status) rules.push(status);
  return rules;
}
