/**
 * Plain inputs and outputs of the BOM checks (SI base units, fractions 0..1).
 * The HTTP layer converts the wire body into these; nothing here knows about
 * fastify or JSON.
 */
import type { Strays } from '../circuit/strays.ts';
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { InlineAmplifier } from '../amplifiers/resolve.ts';
import type { CoreError } from '../errors.ts';
import type { Catalogue } from '../parts/catalogue.ts';
import type { SeriesName } from '../parts/series.ts';
import type { ComponentKind } from '../parts/value-parse.ts';
import type { SpreadFigures } from './spread.ts';

/** One row of a bill of materials, as the PLM system carries it. */
export interface BomLine {
  refdes: string;
  /** The value column as written ("3K3 1% 0603", "10nF 50V C0G 5%"); empty when the cell is empty. */
  value: string;
  partNumber?: string;
  description?: string;
}

export interface BomSupply {
  /** Nominal positive rail, V. */
  positiveV: number;
  /** Nominal negative rail, V (0 for a single supply). */
  negativeV: number;
  /** Regulation band of both rails, fraction (0.05 = each rail ±5 %); 0 = exact. */
  tolerance: number;
}

export interface BomTemperatureRange {
  minC: number;
  maxC: number;
}

export interface BomSpec {
  frequencyHz: number;
  /** Allowed frequency deviation from frequencyHz, fraction (0.05 = ±5 %). */
  frequencyTolerance: number;
  /** Allowed duty-cycle range, fractions; absent = not specified. */
  dutyMin?: number;
  dutyMax?: number;
  /** Minimum fraction of boards inside the spec by Monte Carlo; absent = no yield rule. */
  minimumYield?: number;
}

/** Tolerances used for a line that states none (a warning says so). */
export interface AssumedTolerances {
  resistor: number;
  capacitor: number;
}

export interface BomAssembly {
  id: string;
  lines: readonly BomLine[];
  /** Topology role -> reference designator ("rTiming" -> "R12"). */
  roles: Readonly<Record<string, string>>;
  topology: string;
  /** An amplifier id (built-in or registered) or inline figures (limits already Infinity, not null). */
  amplifier: string | InlineAmplifier;
  supply: BomSupply;
  temperature?: BomTemperatureRange;
  /**
   * Years the board must keep its clock in spec: a class II/III timing capacitor ages over them by the
   * log-decade law, as in POST /v1/tolerance (default 0: no ageing).
   */
  serviceLifeYears?: number;
  spec: BomSpec;
  /** Id of the approved-parts catalogue to check against. */
  catalogue?: string;
  /** Declared preferred-number series: one for every role, or per role. */
  series?: SeriesName | Readonly<Record<string, SeriesName>>;
  assumedTolerance?: Partial<AssumedTolerances>;
  /** Board capacitance and leakage at the nodes (circuit/strays.ts); every analysis of the assembly includes them. */
  strays?: Strays;
}

export type BomRuleSeverity = 'error' | 'warning' | 'caution' | 'info';

export type BomFigureValue = number | string | boolean | null;

/** One rule finding. `figures` carries the numbers behind the message in SI units. */
export interface BomRuleResult {
  code: string;
  severity: BomRuleSeverity;
  message: string;
  refdes?: string;
  role?: string;
  figures: Record<string, BomFigureValue>;
  /** What the value text was read as, in words (value-read only). */
  understood?: string[];
}

export interface BomAssemblyResult {
  id: string;
  /** Position of the assembly in the request (results of a stream come in this order). */
  index: number;
  pass: boolean;
  counts: Record<BomRuleSeverity, number>;
  rules: BomRuleResult[];
}

/** How a batch is judged and how much work the spec rules do. */
export interface BomCheckOptions {
  /** 'worst-case' skips Monte Carlo even where a minimum yield is given (the yield rule then says so). */
  mode: 'full' | 'worst-case';
  /** Severity at and above which an assembly fails: 'error' (default) or 'warning' (stricter). */
  failOn: 'error' | 'warning';
  monteCarloSamples: number;
  /** Seed of the Monte Carlo generator, so a BOM revision re-checks to the same figures. */
  seed: number;
  /**
   * Longest one assembly's analysis may take, ms (absent: no limit). A Monte Carlo projected past it from
   * the time of its first samples is not run: the yield rule says why and how many samples would fit.
   */
  monteCarloBudgetMs?: number;
}

/** What the evaluation needs from outside: pure lookups injected by the caller. */
export interface BomCheckContext {
  lookupAmplifier: (id: string) => AmplifierModel | undefined;
  /** Resolves a catalogue id; throws CoreError('unknown-reference') when there is none. */
  lookupCatalogue?: (id: string) => Catalogue;
  options: BomCheckOptions;
  /** Monotonic clock, ms, for options.monteCarloBudgetMs (default performance.now; tests inject one). */
  clock?: () => number;
  /**
   * Tolerance-analysis figures of designs already checked in this batch, by their
   * inputs: PLM batches carry many revisions whose timing parts are identical.
   * Give a fresh Map per batch (or none to recompute every assembly).
   */
  spreadCache?: Map<string, SpreadFigures | CoreError>;
}

/** A BOM line read for the role it fills. */
export interface BomLineReading {
  refdes: string;
  role: string;
  kind: ComponentKind;
  valueText: string;
  partNumber?: string;
  /** ohm or farad; undefined when the text gave no value. */
  value?: number;
  tolerance?: number;
  toleranceSource?: 'text' | 'description' | 'catalogue' | 'code' | 'assumed';
  ratedVoltageV?: number;
  /** Canonical dielectric code ("C0G", "X7R", "ELECTROLYTIC"). */
  dielectricCode?: string;
  tempcoPpmPerK?: number;
  packageCode?: string;
  understood: string[];
  unparsed: string[];
  notes: string[];
}
