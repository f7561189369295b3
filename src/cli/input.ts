/** Command input: a file path, or `-` for standard input. Unreadable input is a usage error (exit 2). */
import { readFile } from 'node:fs/promises';
import type { Readable } from 'node:stream';
import { usageError } from './exit-codes.ts';

export async function readSource(source: string, stdin: Readable): Promise<string> {
  if (source === '-') {
    const chunks: Buffer[] = [];
    for await (const chunk of stdin) chunks.push(typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer));
    return Buffer.concat(chunks).toString('utf8');
  }
  try {
    return await readFile(source, 'utf8');
  } catch (err) {
    throw usageError(`cannot read ${source}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
  }
}

export function parseJson(text: string, source: string): unknown {
  try {
    return JSON.parse(text);
  } catch (err) {
    throw usageError(`${source === '-' ? 'standard input' : source} is not valid JSON: ${(err as Error).message}`);
  }
}

export async function readJson(source: string, stdin: Readable): Promise<unknown> {
  return parseJson(await readSource(source, stdin), source);
}

/** Whether text looks like JSON rather than CSV (first non-blank character). */
export function looksLikeJson(text: string): boolean {
  const first = text.replace(/^\uFEFF/, '').trimStart()[0];
  return first === '{' || first === '[';
}
