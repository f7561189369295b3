/**
 * POST /v1/bom-checks: batches of assemblies (BOM lines + role map + spec) in,
 * one verdict per assembly out. The schema checks the request's STRUCTURE
 * (a wrong type or unknown field is a 400 for the whole request); everything a
 * BOM can get wrong in content — unknown topology, amplifier, series or
 * catalogue, a designator that is not on the BOM, unreadable value text, a
 * circuit that cannot oscillate — fails only its own assembly, with rules.
 */
import { Type, type Static } from 'typebox';
import { BOM_RULE_CODES, MAX_ASSEMBLIES_PER_BATCH, TOPOLOGY_IDS } from '../../core/index.ts';
import { SERIES_NAMES } from '../../core/parts/index.ts';
import { SERVICE_LIFE_LIMIT_YEARS } from '../../core/tolerance/index.ts';
import { AmplifierSpec, FrequencyHz, ref } from './common.ts';
import { Strays } from './circuit.ts';

export const MAX_LINES_PER_ASSEMBLY = 500;
export const MAX_MONTE_CARLO_SAMPLES = 20_000;

const Fraction = (description: string, options: Record<string, unknown> = {}) => Type.Number({ minimum: 0, maximum: 1, description, ...options });

export const BomLine = Type.Object(
  {
    refdes: Type.String({
      minLength: 1,
      maxLength: 400,
      description: 'Reference designator, or several that share the line ("R3, R7" or "R3 R7"); compared trimmed and case-blind',
    }),
    value: Type.Union([Type.String({ maxLength: 200 }), Type.Null()], {
      description:
        'The value column as the BOM carries it: IEC 60062 RKM ("4K7", "R47", "4n7"), numeric codes ("103", "4702"), EIA-96 ("01C"), SI form ("10nF"), with tolerance, voltage, dielectric, tempco and package in any order ("3K3 1% 0603", "10nF 50V C0G 5%", "4u7/16V X5R", "103 K"). Empty or null: no value.',
    }),
    partNumber: Type.Optional(Type.String({ maxLength: 80, description: "The owner's part number; looked up in the catalogue when one is named" })),
    description: Type.Optional(
      Type.String({ maxLength: 1000, description: 'Free text; tolerance, voltage, dielectric, tempco and package missing from the value are read from it' }),
    ),
  },
  { $id: 'BomLine', additionalProperties: false, description: 'One BOM line as the BOM carries it' },
);

export const BomSupply = Type.Object(
  {
    positiveV: Type.Number({ description: 'Nominal positive rail relative to ground, V' }),
    negativeV: Type.Optional(Type.Number({ default: 0, description: 'Nominal negative rail relative to ground, V (0 for a single supply)' })),
    tolerance: Type.Optional(
      Type.Number({ minimum: 0, maximum: 0.5, default: 0, description: 'Regulation band of both rails as a fraction (0.05: each rail ±5 %); the checks run at both ends' }),
    ),
  },
  { $id: 'BomSupply', additionalProperties: false, description: 'The board\'s rails and their regulation band' },
);

export const BomTemperatureRange = Type.Object(
  {
    minC: Type.Number({ minimum: -273.15, maximum: 1000, description: 'Lowest ambient temperature, °C' }),
    maxC: Type.Number({ minimum: -273.15, maximum: 1000, description: 'Highest ambient temperature, °C' }),
  },
  { $id: 'BomTemperatureRange', additionalProperties: false, description: 'Ambient temperature range of the board, °C' },
);

export const BomSpec = Type.Object(
  {
    frequencyHz: FrequencyHz('Target frequency, Hz'),
    frequencyTolerance: Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, description: 'Allowed deviation from frequencyHz as a fraction (0.05 = ±5 %)' }),
    dutyMin: Type.Optional(Fraction('Lowest allowed duty cycle, fraction of the period high')),
    dutyMax: Type.Optional(Fraction('Highest allowed duty cycle, fraction of the period high')),
    minimumYield: Type.Optional(Fraction('Minimum fraction of boards inside the spec (Monte Carlo); omit for no yield rule')),
  },
  { $id: 'BomSpec', additionalProperties: false, description: 'What the clock must meet for the assembly to pass' },
);

const SeriesNameText = Type.String({ minLength: 1, maxLength: 16, description: `IEC 60063 series, case-insensitive: ${SERIES_NAMES.join(', ')}` });

export const BomAssembly = Type.Object(
  {
    id: Type.String({ minLength: 1, maxLength: 200, description: "The caller's id for the assembly (echoed in its result)" }),
    lines: Type.Array(ref(BomLine), { maxItems: MAX_LINES_PER_ASSEMBLY, description: 'BOM lines; only those the role map names are checked' }),
    roles: Type.Record(Type.String({ minLength: 1, maxLength: 64 }), Type.String({ minLength: 1, maxLength: 64 }), {
      maxProperties: 32,
      description: 'Topology role -> reference designator, e.g. {"rTiming": "R12", "cTiming": "C4"}',
    }),
    topology: Type.String({ minLength: 1, maxLength: 64, description: `Topology id: ${TOPOLOGY_IDS.join(', ')} (an unknown one fails this assembly only)` }),
    amplifier: ref(AmplifierSpec, 'The amplifier fitted on the board: an archetype or registered id, or inline figures (an unknown id fails this assembly only)'),
    supply: ref(BomSupply, 'The rails of the board and their regulation band'),
    strays: Type.Optional(ref(Strays, 'Board and input capacitance and leakage at the nodes (absent: none); every analysis of the assembly includes them')),
    temperature: Type.Optional(ref(BomTemperatureRange, 'Ambient range the board must work over (absent: no temperature drift is applied, tolerances alone)')),
    serviceLifeYears: Type.Optional(
      Type.Number({
        minimum: 0,
        maximum: SERVICE_LIFE_LIMIT_YEARS,
        description:
          'Years the board must keep its clock in spec (default 0: no ageing). A class II/III timing capacitor (its dielectric from the BOM line) loses capacitance by the log-decade law from the reference age of its marked value over these years, in the worst case (start and end of service) and the Monte Carlo yield (uniform age), as in POST /v1/tolerance',
      }),
    ),
    spec: ref(BomSpec, 'What the clock must meet for the assembly to pass'),
    catalogue: Type.Optional(Type.String({ minLength: 1, maxLength: 64, description: 'Id of a stored parts catalogue to check part numbers, values and status against' })),
    series: Type.Optional(
      Type.Union([SeriesNameText, Type.Record(Type.String({ minLength: 1, maxLength: 64 }), SeriesNameText, { maxProperties: 32 })], {
        description: 'The preferred-number series the design uses: one for every role ("E24"), or per role ({"rTiming": "E96", "cTiming": "E6"})',
      }),
    ),
    assumedTolerance: Type.Optional(
      Type.Object(
        {
          resistor: Type.Optional(Type.Number({ exclusiveMinimum: 0, maximum: 0.5, description: 'Tolerance assumed for resistors that state none (default 0.05)' })),
          capacitor: Type.Optional(Type.Number({ exclusiveMinimum: 0, maximum: 0.5, description: 'Tolerance assumed for capacitors that state none (default 0.1)' })),
        },
        { additionalProperties: false, description: 'Tolerances for lines whose value text states none' },
      ),
    ),
  },
  { $id: 'BomAssembly', additionalProperties: false, description: 'One board revision: its BOM lines, which line fills which role, and its spec' },
);

export const BomCheckOptions = Type.Object(
  {
    mode: Type.Optional(
      Type.Union([Type.Literal('full'), Type.Literal('worst-case')], {
        default: 'full',
        description: 'full: worst case and, where a minimum yield is given, Monte Carlo; worst-case: no Monte Carlo (faster)',
      }),
    ),
    failOn: Type.Optional(
      Type.Union([Type.Literal('error'), Type.Literal('warning')], { default: 'error', description: 'Lowest rule severity that fails an assembly' }),
    ),
    monteCarloSamples: Type.Optional(Type.Integer({ minimum: 50, maximum: MAX_MONTE_CARLO_SAMPLES, default: 500, description: 'Monte Carlo samples per assembly. An assembly whose yield run is projected (from the time of its first samples) past half the task deadline is not run: its yield rule is yield-not-evaluated, naming the cost per evaluation and the samples that would fit' })),
    seed: Type.Optional(Type.Integer({ minimum: 0, maximum: 2 ** 31 - 1, default: 1, description: 'Monte Carlo seed (same seed, same figures)' })),
  },
  { $id: 'BomCheckOptions', additionalProperties: false, description: 'How deeply to check and what fails an assembly' },
);

export const BomCheckRequest = Type.Object(
  {
    assemblies: Type.Array(ref(BomAssembly), {
      minItems: 1,
      maxItems: MAX_ASSEMBLIES_PER_BATCH,
      description: `Assemblies to check, 1 to ${MAX_ASSEMBLIES_PER_BATCH}; each passes or fails on its own`,
    }),
    options: Type.Optional(ref(BomCheckOptions, 'How deeply to check and what fails an assembly (absent: every option at its default)')),
  },
  { $id: 'BomCheckRequest', additionalProperties: false, description: 'A batch of assemblies to check' },
);

export const BomRule = Type.Object(
  {
    code: Type.String({ description: `Stable rule code: ${BOM_RULE_CODES.join(', ')}; checks the analysis adds later arrive as analysis-<code>` }),
    severity: Type.Union([Type.Literal('error'), Type.Literal('warning'), Type.Literal('caution'), Type.Literal('info')], {
      description: 'error: the board will not meet its spec or work as intended; warning: it works with reduced margin; caution: safety note; info: for the record',
    }),
    message: Type.String({ description: 'What was found, in words with the figures' }),
    refdes: Type.Optional(Type.String({ description: 'The designator the rule is about' })),
    role: Type.Optional(Type.String({ description: 'The topology role that designator fills' })),
    figures: Type.Record(Type.String(), Type.Union([Type.Number(), Type.String(), Type.Boolean(), Type.Null()]), {
      description: 'The figures behind the message, SI units (null: no limit / not known)',
    }),
    understood: Type.Optional(Type.Array(Type.String(), { description: 'value-read only: what the value text was read as, in words' })),
  },
  { $id: 'BomRule', additionalProperties: false, description: 'One rule result for an assembly' },
);

const Counts = Type.Object(
  {
    error: Type.Integer({ description: 'Rule results of severity error' }),
    warning: Type.Integer({ description: 'Rule results of severity warning' }),
    caution: Type.Integer({ description: 'Rule results of severity caution' }),
    info: Type.Integer({ description: 'Rule results of severity info' }),
  },
  { additionalProperties: false, description: 'Rule results by severity' },
);

export const BomCheckResult = Type.Object(
  {
    id: Type.String({ description: 'The assembly id from the request' }),
    index: Type.Integer({ minimum: 0, description: 'Position of the assembly in the request' }),
    pass: Type.Boolean({ description: 'False when any rule at or above options.failOn severity fired' }),
    counts: Counts,
    rules: Type.Array(ref(BomRule), { description: 'Every rule result for the assembly (passing checks report as info)' }),
  },
  { $id: 'BomCheckResult', additionalProperties: false, description: 'The verdict on one assembly' },
);

export const BomCheckResponse = Type.Object(
  {
    results: Type.Array(ref(BomCheckResult), { description: 'One result per assembly, in request order' }),
    summary: Type.Object(
      {
        assemblies: Type.Integer({ description: 'Assemblies checked' }),
        passed: Type.Integer({ description: 'Assemblies with pass true' }),
        failed: Type.Integer({ description: 'Assemblies with pass false' }),
      },
      { additionalProperties: false, description: 'Totals over the batch' },
    ),
  },
  { $id: 'BomCheckResponse', additionalProperties: false, description: 'Verdicts on a batch of assemblies' },
);

export type BomCheckRequestBody = Static<typeof BomCheckRequest>;
export type BomAssemblyBody = Static<typeof BomAssembly>;

export const BOM_SCHEMAS = [BomLine, BomSupply, BomTemperatureRange, BomSpec, BomAssembly, BomCheckOptions, BomCheckRequest, BomRule, BomCheckResult, BomCheckResponse];
