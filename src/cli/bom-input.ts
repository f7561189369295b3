/**
 * A BOM file -> a POST /v1/bom-checks body.
 *
 * JSON: the request itself ({assemblies, options?}), an array of assemblies,
 * or one assembly. CSV: one row per BOM line with a header naming the columns
 * (refdes, value, and optionally partNumber, description, assembly); what every
 * assembly shares — roles, topology, amplifier, supply, spec, series ... —
 * comes from a JSON template (--assembly). Rows group into assemblies by the
 * `assembly` column; without one the file is a single assembly.
 */
import { basename, extname } from 'node:path';
import { parseCsv } from './csv.ts';
import { usageError } from './exit-codes.ts';
import { looksLikeJson, parseJson } from './input.ts';

type Json = Record<string, unknown>;

const COLUMN_NAMES: Record<string, 'refdes' | 'value' | 'partNumber' | 'description' | 'assembly'> = {
  refdes: 'refdes',
  designator: 'refdes',
  designators: 'refdes',
  reference: 'refdes',
  value: 'value',
  partnumber: 'partNumber',
  part: 'partNumber',
  description: 'description',
  assembly: 'assembly',
  board: 'assembly',
};

const isObject = (x: unknown): x is Json => typeof x === 'object' && x !== null && !Array.isArray(x);

export function bomFormat(text: string, source: string, declared: string | undefined): 'csv' | 'json' {
  if (declared === 'csv' || declared === 'json') return declared;
  if (declared !== undefined) throw usageError(`--format must be csv or json, not ${declared}`);
  const ext = extname(source).toLowerCase();
  if (ext === '.csv') return 'csv';
  if (ext === '.json') return 'json';
  return looksLikeJson(text) ? 'json' : 'csv';
}

export function assembliesFromJson(value: unknown): { assemblies: unknown[]; options?: Json } {
  if (Array.isArray(value)) return { assemblies: value };
  if (isObject(value) && Array.isArray(value.assemblies)) return { assemblies: value.assemblies, ...(isObject(value.options) ? { options: value.options } : {}) };
  if (isObject(value) && Array.isArray(value.lines)) return { assemblies: [value] };
  throw usageError('a JSON BOM is {"assemblies": [...]}, an array of assemblies, or one assembly with "lines"');
}

export function assembliesFromCsv(text: string, source: string, template: unknown, id: string | undefined): unknown[] {
  if (!isObject(template)) throw usageError('a CSV BOM needs --assembly <file.json>: roles, topology, amplifier, supply and spec shared by its assemblies');
  let rows: string[][];
  try {
    rows = parseCsv(text);
  } catch (err) {
    throw usageError(`${source} is not readable CSV: ${(err as Error).message}`);
  }
  if (rows.length < 2) throw usageError(`${source} has no BOM lines (a header row, then one row per line)`);
  const columns = rows[0].map((h) => COLUMN_NAMES[h.trim().toLowerCase().replace(/[\s_-]/g, '')]);
  if (!columns.includes('refdes') || !columns.includes('value')) throw usageError(`${source} needs a header with refdes and value columns`);
  const fallbackId = id ?? (source === '-' ? 'bom' : basename(source, extname(source)));
  const byAssembly = new Map<string, Json[]>();
  for (const row of rows.slice(1)) {
    const line: Json = {};
    let assembly = fallbackId;
    columns.forEach((name, i) => {
      const cell = (row[i] ?? '').trim();
      if (name === undefined || cell === '') return;
      if (name === 'assembly') assembly = cell;
      else line[name] = cell;
    });
    if (line.refdes === undefined) continue; // a line without a designator cannot fill a role
    if (!byAssembly.has(assembly)) byAssembly.set(assembly, []);
    byAssembly.get(assembly)!.push(line);
  }
  return [...byAssembly].map(([assemblyId, lines]) => ({ ...template, id: assemblyId, lines }));
}

export function bomRequest(text: string, source: string, format: 'csv' | 'json', template: unknown, id: string | undefined, options: Json): Json {
  const parsed = format === 'json' ? assembliesFromJson(parseJson(text, source)) : { assemblies: assembliesFromCsv(text, source, template, id) };
  const merged = { ...parsed.options, ...options };
  return { assemblies: parsed.assemblies, ...(Object.keys(merged).length > 0 ? { options: merged } : {}) };
}
