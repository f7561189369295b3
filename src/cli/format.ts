/**
 * Readable output: figures with SI prefixes and tables (cli-table3). Only
 * shaping of what the service answered — no figure is computed here.
 */
import Table from 'cli-table3';
import { formatSi } from '../core/circuit/format.ts';

/** 4764.86, 'Hz' -> "4.765 kHz"; null -> "—" (no limit / not known on the wire). The prefixes are the core's. */
export function si(value: number | null | undefined, unit: string, digits = 4): string {
  if (value === null || value === undefined) return '—';
  return formatSi(value, unit, digits).trim();
}

export function percent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined) return '—';
  return `${Number((fraction * 100).toPrecision(digits))} %`;
}

export function signedPercent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined) return '—';
  const s = percent(fraction, digits);
  return fraction > 0 ? `+${s}` : s;
}

/** Unit of a part value by role name (rTiming -> Ω, cTiming -> F). */
export function partUnit(role: string): string {
  return role.startsWith('c') ? 'F' : role.startsWith('r') ? 'Ω' : '';
}

export function table(head: string[], rows: (string | number)[][]): string {
  const t = new Table({ head, style: { head: [], border: [] } });
  for (const r of rows) t.push(r.map(String));
  return t.toString();
}

/** Two columns: what, value. */
export function figures(rows: [string, string][]): string {
  const t = new Table({ style: { head: [], border: [] } });
  for (const r of rows) t.push(r);
  return t.toString();
}

interface CheckLike {
  code: string;
  severity: string;
  message: string;
}

export function checksTable(checks: readonly CheckLike[]): string {
  if (checks.length === 0) return 'checks: none';
  return table(
    ['severity', 'code', 'message'],
    checks.map((c) => [c.severity, c.code, c.message]),
  );
}
