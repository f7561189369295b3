/**
 * One readable view per answer. The shapes below name only the fields a view
 * reads (the full shapes are the contract's); `--json` prints the answer as is.
 */
import { checksTable, figures, partUnit, percent, si, signedPercent, table } from './format.ts';

type Check = { code: string; severity: string; message: string };
type Part = { role: string; value: number; series?: string; partNumber?: string; arrangement?: string; tolerance?: number };

export interface AnalysisView {
  topology: string;
  model: string;
  amplifier: { id: string };
  frequencyHz: number;
  periodS: number;
  dutyCycle: number;
  timeHighS: number;
  timeLowS: number;
  firstEdgeS: number;
  thresholds: { upperV: number; lowerV: number; hysteresisV: number };
  output: { highV: number; lowV: number; swingV: number };
  capacitor: { minV: number; maxV: number };
  currents: { outputPeakSourceA: number; outputPeakSinkA: number; supplyAverageA: number };
  frequencyCeilingHz?: number | null;
  checks: Check[];
}

export function analysisView(a: AnalysisView): string {
  return [
    figures([
      ['topology', `${a.topology} (${a.amplifier.id})`],
      ['model', a.model],
      ['frequency', si(a.frequencyHz, 'Hz', 6)],
      ['period', si(a.periodS, 's')],
      ['duty cycle', percent(a.dutyCycle, 4)],
      ['time high / low', `${si(a.timeHighS, 's')} / ${si(a.timeLowS, 's')}`],
      ['first edge', si(a.firstEdgeS, 's')],
      ['thresholds', `${si(a.thresholds.lowerV, 'V')} .. ${si(a.thresholds.upperV, 'V')} (hysteresis ${si(a.thresholds.hysteresisV, 'V')})`],
      ['output', `${si(a.output.lowV, 'V')} .. ${si(a.output.highV, 'V')}`],
      ['capacitor', `${si(a.capacitor.minV, 'V')} .. ${si(a.capacitor.maxV, 'V')}`],
      ['output peak source / sink', `${si(a.currents.outputPeakSourceA, 'A')} / ${si(a.currents.outputPeakSinkA, 'A')}`],
      ['supply average', si(a.currents.supplyAverageA, 'A')],
      ['frequency ceiling', a.frequencyCeilingHz === undefined ? '—' : si(a.frequencyCeilingHz, 'Hz')],
    ]),
    checksTable(a.checks),
  ].join('\n');
}

function partsText(parts: readonly Part[]): string {
  return parts
    .map((p) => `${p.role} ${si(p.value, partUnit(p.role), 3)}${p.arrangement && p.arrangement !== 'single' ? ` (${p.arrangement})` : ''}${p.partNumber ? ` ${p.partNumber}` : p.series ? ` ${p.series}` : ''}`)
    .join('\n');
}

export interface DesignView {
  designs: {
    rank: number;
    topology: string;
    parts: Part[];
    predicted: { frequencyHz: number; dutyCycle: number; model: string };
    frequencyError: number;
    checks: Check[];
  }[];
  notes: string[];
}

export function designView(d: DesignView): string {
  const out = [
    table(
      ['rank', 'topology', 'parts', 'frequency', 'error', 'duty', 'checks'],
      d.designs.map((x) => [
        x.rank,
        x.topology,
        partsText(x.parts),
        si(x.predicted.frequencyHz, 'Hz', 6),
        signedPercent(x.frequencyError),
        percent(x.predicted.dutyCycle),
        x.checks.map((c) => `${c.severity}: ${c.code}`).join('\n') || 'none',
      ]),
    ),
  ];
  if (d.designs.length === 0) out.push('no design meets the request');
  for (const n of d.notes) out.push(`note: ${n}`);
  return out.join('\n');
}

type Choice = { value: number; error: number; series?: string; partNumber?: string; arrangement?: string } | null | undefined;

export interface SnapView {
  values: { label?: string; ideal: number; kind: string; nearest: NonNullable<Choice>; lower?: Choice; higher?: Choice; combination?: Choice }[];
  circuit?: {
    candidates: { topology: string; parts: Part[]; predicted: { frequencyHz: number; dutyCycle: number }; frequencyError: number; checks: Check[] }[];
  };
}

export function snapView(s: SnapView): string {
  const out: string[] = [];
  const unit = (kind: string) => (kind === 'capacitor' ? 'F' : kind === 'resistor' ? 'Ω' : '');
  const choice = (c: Choice, kind: string) =>
    c ? `${si(c.value, unit(kind), 3)} (${signedPercent(c.error)})${c.partNumber ? ` ${c.partNumber}` : ''}${c.arrangement && c.arrangement !== 'single' ? ` ${c.arrangement}` : ''}` : '—';
  if (s.values.length > 0) {
    out.push(
      table(
        ['value', 'ideal', 'nearest', 'lower', 'higher', 'combination'],
        s.values.map((v) => [v.label ?? v.kind, si(v.ideal, unit(v.kind)), choice(v.nearest, v.kind), choice(v.lower, v.kind), choice(v.higher, v.kind), choice(v.combination, v.kind)]),
      ),
    );
  }
  if (s.circuit) {
    out.push(
      table(
        ['topology', 'parts', 'frequency', 'error', 'duty'],
        s.circuit.candidates.map((c) => [c.topology, partsText(c.parts), si(c.predicted.frequencyHz, 'Hz', 6), signedPercent(c.frequencyError), percent(c.predicted.dutyCycle)]),
      ),
    );
  }
  return out.join('\n');
}

type Distribution = { p0_1: number; p50: number; p99_9: number; std: number } | null;

export interface ToleranceView {
  model: string;
  nominal: { frequencyHz: number; dutyCycle: number };
  worstCase: { frequencyMinHz: number; frequencyMaxHz: number; dutyMin: number; dutyMax: number; withinSpec: boolean | null; latchedCorners: number };
  monteCarlo: { samples: number; seed: number; frequencyHz: Distribution; yield: number | null; latched: number } | null;
  sensitivities: { role: string; sensitivity: number; varianceShare: number }[];
}

export function toleranceView(t: ToleranceView): string {
  const rows: [string, string][] = [
    ['model', t.model],
    ['nominal', `${si(t.nominal.frequencyHz, 'Hz', 6)}, duty ${percent(t.nominal.dutyCycle, 4)}`],
    ['worst case', `${si(t.worstCase.frequencyMinHz, 'Hz', 5)} .. ${si(t.worstCase.frequencyMaxHz, 'Hz', 5)}, duty ${percent(t.worstCase.dutyMin)} .. ${percent(t.worstCase.dutyMax)}`],
    ['worst case within spec', t.worstCase.withinSpec === null ? '— (no spec)' : t.worstCase.withinSpec ? 'yes' : 'no'],
  ];
  const mc = t.monteCarlo;
  if (mc) {
    rows.push(['Monte Carlo', `${mc.samples} samples, seed ${mc.seed}${mc.latched > 0 ? `, ${mc.latched} latched` : ''}`]);
    const f = mc.frequencyHz;
    if (f) rows.push(['frequency p0.1 / p50 / p99.9', `${si(f.p0_1, 'Hz', 5)} / ${si(f.p50, 'Hz', 5)} / ${si(f.p99_9, 'Hz', 5)} (σ ${si(f.std, 'Hz', 3)})`]);
    rows.push(['yield', mc.yield === null ? '— (no spec)' : percent(mc.yield, 4)]);
  }
  const out = [figures(rows)];
  if (t.sensitivities.length > 0) {
    out.push(
      table(
        ['part', 'd ln f / d ln x', 'variance share'],
        t.sensitivities.map((s) => [s.role, s.sensitivity.toFixed(3), percent(s.varianceShare)]),
      ),
    );
  }
  return out.join('\n');
}

export interface FitView {
  verdict: { agreesWithNominal: boolean; statement: string };
  explanations: { rank: number; score: number; causes: { text: string }[] }[];
  estimates: { parameter: string; nominal: number; estimate: number; standardDeviation: number }[];
  warnings: string[];
}

export function fitView(f: FitView): string {
  const out = [`verdict: ${f.verdict.statement}`];
  if (f.explanations.length > 0) {
    out.push(table(['rank', 'score', 'explanation'], f.explanations.map((e) => [e.rank, e.score.toFixed(3), e.causes.map((c) => c.text).join('\n')])));
  }
  out.push(
    table(
      ['parameter', 'nominal', 'estimate', 'σ'],
      f.estimates.map((e) => [e.parameter, e.nominal.toPrecision(4), e.estimate.toPrecision(4), e.standardDeviation.toPrecision(2)]),
    ),
  );
  for (const w of f.warnings) out.push(`warning: ${w}`);
  return out.join('\n');
}

export interface BomResultView {
  id: string;
  pass: boolean;
  counts: { error: number; warning: number; caution: number; info: number };
  rules: { code: string; severity: string; refdes?: string }[];
}

export function bomView(results: readonly BomResultView[]): string {
  const passed = results.filter((r) => r.pass).length;
  return [
    table(
      ['assembly', 'verdict', 'errors', 'warnings', 'rules'],
      results.map((r) => [
        r.id,
        r.pass ? 'pass' : 'FAIL',
        r.counts.error,
        r.counts.warning,
        r.rules
          .filter((x) => x.severity === 'error' || x.severity === 'warning')
          .map((x) => `${x.code}${x.refdes ? ` (${x.refdes})` : ''}`)
          .join('\n'),
      ]),
    ),
    `${results.length} assemblies: ${passed} passed, ${results.length - passed} failed`,
  ].join('\n');
}

export function amplifierListView(body: { amplifiers: { id: string; name: string; technologyClass: string; figuresBasis: string; source: string }[] }): string {
  return table(
    ['id', 'name', 'class', 'figures', 'source'],
    body.amplifiers.map((a) => [a.id, a.name, a.technologyClass, a.figuresBasis, a.source]),
  );
}

/** Any flat record (an amplifier) as a two-column table; nested values as JSON. */
export function recordView(record: Record<string, unknown>): string {
  return figures(Object.entries(record).map(([k, v]) => [k, v === null ? '—' : typeof v === 'string' ? v : JSON.stringify(v)]));
}

export function catalogueListView(body: { catalogues: { id: string; name?: string; version: number; partCounts: { total: number } }[] }): string {
  if (body.catalogues.length === 0) return 'no catalogues';
  return table(
    ['id', 'name', 'version', 'parts'],
    body.catalogues.map((c) => [c.id, c.name ?? '', c.version, c.partCounts.total]),
  );
}

export interface CatalogueView {
  id: string;
  name?: string;
  version: number;
  etag: string;
  parts: { kind: string; valueSi: number; tolerance: number; partNumber: string; dielectric?: string; status: string }[];
}

export function catalogueView(c: CatalogueView): string {
  return [
    `${c.id}${c.name ? ` — ${c.name}` : ''} (version ${c.version}, ETag ${c.etag})`,
    table(
      ['part number', 'kind', 'value', 'tolerance', 'dielectric', 'status'],
      c.parts.map((p) => [p.partNumber, p.kind, si(p.valueSi, p.kind === 'capacitor' ? 'F' : 'Ω', 3), percent(p.tolerance), p.dielectric ?? '', p.status]),
    ),
  ].join('\n');
}
