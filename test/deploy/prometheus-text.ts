/**
 * A reader for the Prometheus text exposition format 0.0.4 (prometheus.io,
 * "Exposition formats", text-based format): `# HELP`, `# TYPE` and sample lines
 * `name{label="value",...} value`. Strict enough that a malformed line fails.
 */
export interface Sample {
  name: string;
  labels: Record<string, string>;
  value: number;
}

export interface Exposition {
  types: Map<string, string>;
  help: Map<string, string>;
  samples: Sample[];
}

const SAMPLE = /^([a-zA-Z_:][a-zA-Z0-9_:]*)(?:\{(.*)\})?\s+(\S+)(?:\s+-?\d+)?$/;
const LABEL = /([a-zA-Z_][a-zA-Z0-9_]*)="((?:[^"\\]|\\.)*)"\s*,?\s*/gy;

export function parseExposition(text: string): Exposition {
  const out: Exposition = { types: new Map(), help: new Map(), samples: [] };
  for (const line of text.split('\n')) {
    if (line.trim() === '') continue;
    if (line.startsWith('# HELP ')) {
      const [name, ...rest] = line.slice(7).split(' ');
      out.help.set(name, rest.join(' '));
      continue;
    }
    if (line.startsWith('# TYPE ')) {
      const [name, type] = line.slice(7).split(' ');
      if (!['counter', 'gauge', 'histogram', 'summary', 'untyped'].includes(type)) throw new Error(`bad TYPE line: ${line}`);
      out.types.set(name, type);
      continue;
    }
    if (line.startsWith('#')) continue;
    const match = SAMPLE.exec(line);
    if (!match) throw new Error(`not a sample line: ${line}`);
    const labels: Record<string, string> = {};
    const labelText = match[2] ?? '';
    LABEL.lastIndex = 0;
    let consumed = 0;
    for (let m = LABEL.exec(labelText); m; m = LABEL.exec(labelText)) {
      labels[m[1]] = m[2].replace(/\\n/g, '\n').replace(/\\"/g, '"').replace(/\\\\/g, '\\');
      consumed = LABEL.lastIndex;
    }
    if (consumed !== labelText.length) throw new Error(`bad labels: ${line}`);
    const raw = match[3];
    const value = raw === '+Inf' ? Infinity : raw === '-Inf' ? -Infinity : raw === 'NaN' ? NaN : Number(raw);
    if (Number.isNaN(value) && raw !== 'NaN') throw new Error(`bad value: ${line}`);
    out.samples.push({ name: match[1], labels, value });
  }
  return out;
}

export function find(exposition: Exposition, name: string, labels: Record<string, string> = {}): Sample[] {
  return exposition.samples.filter((s) => s.name === name && Object.entries(labels).every(([k, v]) => s.labels[k] === v));
}
