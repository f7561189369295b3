/**
 * A JSON reader for large bodies that works chunk by chunk as the bytes arrive
 * and reads the sample arrays of a scope capture straight into Float64Arrays.
 *
 * Why not JSON.parse: a 60 MB capture read the usual way exists four times at
 * once — the socket chunks, the decoded string, JavaScript arrays of boxed
 * doubles and the Float64Arrays the core wants — which put the peak at over
 * five times the body. Here each chunk is parsed and dropped as it arrives, and
 * a route names the arrays (JSON pointers) that hold samples, so those never
 * become JavaScript arrays: the peak is the samples themselves plus one chunk.
 * Parsing in small steps also keeps the event loop answering while a large
 * body streams in.
 *
 * It accepts exactly RFC 8259 JSON and gives the same values as JSON.parse
 * (numbers are correctly rounded: Clinger's exact fast path, else Number()).
 * Like the small-body path (json-body.ts, body-guards.ts) it refuses nesting
 * deeper than a limit and prototype-poisoning keys, naming the field.
 *
 * A sample array must hold numbers or null (null: a sample the scope could
 * not give, read as NaN and refused later by the capture analysis with its
 * index) — the same rule the schema states for those fields. In the parsed
 * body the array is left as [] so that schema validation of everything else
 * proceeds unchanged; the samples are found with `sampleArraysOf(body)`.
 */
import { HttpProblem } from './problem.ts';

/** Samples by JSON pointer, for bodies read by this parser. */
const SAMPLE_ARRAYS = new WeakMap<object, Map<string, Float64Array>>();

export function sampleArraysOf(body: unknown): ReadonlyMap<string, Float64Array> | undefined {
  return body !== null && typeof body === 'object' ? SAMPLE_ARRAYS.get(body) : undefined;
}

/** Grows by fixed blocks, so a long array is never copied while it grows; one exact copy at the end. */
class SampleBlocks {
  private static readonly BLOCK = 1 << 16;
  private readonly blocks: Float64Array[] = [];
  private current = new Float64Array(SampleBlocks.BLOCK);
  private used = 0;
  length = 0;

  push(x: number): void {
    if (this.used === SampleBlocks.BLOCK) {
      this.blocks.push(this.current);
      this.current = new Float64Array(SampleBlocks.BLOCK);
      this.used = 0;
    }
    this.current[this.used++] = x;
    this.length++;
  }

  finish(): Float64Array {
    const out = new Float64Array(this.length);
    let at = 0;
    for (const block of this.blocks) {
      out.set(block, at);
      at += block.length;
    }
    out.set(this.current.subarray(0, this.used), at);
    this.blocks.length = 0;
    return out;
  }
}

interface Frame {
  kind: 'object' | 'array' | 'samples';
  value: Record<string, unknown> | unknown[] | SampleBlocks;
  pointer: string;
  /** Object frames: the key whose value comes next. */
  key: string | undefined;
  /** Array frames: index of the next element. */
  index: number;
}

const enum Expect {
  /** A value (top level, after ':' or after '[' / ','). */
  Value,
  /** After '{': a key or '}'. */
  KeyOrEnd,
  /** After ',' in an object: a key. */
  Key,
  Colon,
  /** After a value inside a container: ',' or its closing bracket. */
  CommaOrEnd,
  /** After '[': a value or ']'. */
  ValueOrEnd,
  /** After the top-level value: only whitespace. */
  Nothing,
}

const enum Token {
  None,
  String,
  Number,
  Literal,
}

// Exact powers of ten in binary64 (10^22 is the largest exact one).
const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);
const LITERALS: Record<number, { text: string; value: unknown }> = {
  0x74: { text: 'true', value: true },
  0x66: { text: 'false', value: false },
  0x6e: { text: 'null', value: null },
};
const MAX_NUMBER_BYTES = 1024;

function escapeSegment(segment: string): string {
  return segment.replace(/~/g, '~0').replace(/\//g, '~1');
}

function isWhitespace(c: number): boolean {
  return c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09;
}

/**
 * A JSON number's bytes -> its value, or NaN when they are not RFC 8259 number
 * syntax. Up to 15 significant digits and a decimal exponent within ±22 the
 * value is m·10^e or m/10^−e with both operands exact, so the one rounding is
 * the correct one (Clinger 1990); anything else goes to Number(), which also
 * rounds correctly.
 */
export function parseJsonNumber(bytes: Uint8Array, length: number): number {
  let i = 0;
  const negative = bytes[0] === 0x2d;
  if (negative) i++;
  if (i >= length) return Number.NaN;
  let mantissa = 0;
  let significant = 0;
  let scale = 0;
  const digit = (c: number): boolean => c >= 0x30 && c <= 0x39;
  if (bytes[i] === 0x30) i++;
  else if (digit(bytes[i])) {
    while (i < length && digit(bytes[i])) {
      if (significant < 15) {
        mantissa = mantissa * 10 + (bytes[i] - 0x30);
        if (mantissa !== 0) significant++;
      } else {
        significant++;
        scale++;
      }
      i++;
    }
  } else return Number.NaN;
  if (i < length && bytes[i] === 0x2e) {
    i++;
    if (i >= length || !digit(bytes[i])) return Number.NaN;
    while (i < length && digit(bytes[i])) {
      if (significant < 15) {
        mantissa = mantissa * 10 + (bytes[i] - 0x30);
        if (mantissa !== 0) significant++;
        scale--;
      } else significant++;
      i++;
    }
  }
  let exponent = 0;
  if (i < length && (bytes[i] === 0x65 || bytes[i] === 0x45)) {
    i++;
    let expNegative = false;
    if (i < length && (bytes[i] === 0x2b || bytes[i] === 0x2d)) expNegative = bytes[i++] === 0x2d;
    if (i >= length || !digit(bytes[i])) return Number.NaN;
    while (i < length && digit(bytes[i])) {
      exponent = Math.min(exponent * 10 + (bytes[i] - 0x30), 1e6);
      i++;
    }
    if (expNegative) exponent = -exponent;
  }
  if (i !== length) return Number.NaN;
  const e = scale + exponent;
  if (significant <= 15 && e >= -22 && e <= 22) {
    const value = e >= 0 ? mantissa * POW10[e] : mantissa / POW10[-e];
    return negative ? -value : value;
  }
  return Number(Buffer.from(bytes.buffer, bytes.byteOffset, length).toString('latin1')); // sign included

}

export interface StreamingJsonOptions {
  maxDepth: number;
  /** JSON pointers of arrays to read as samples (Float64Array). */
  samplePaths?: ReadonlySet<string>;
}

export class StreamingJsonParser {
  private readonly stack: Frame[] = [];
  private expect: Expect = Expect.Value;
  private token: Token = Token.None;
  private root: unknown = undefined;
  private readonly samples = new Map<string, Float64Array>();
  private offset = 0;
  // String token: raw byte pieces between the quotes, and whether any escape occurs.
  private stringPieces: Buffer[] = [];
  private stringEscaped = false;
  private afterBackslash = false;
  // Number token.
  private readonly numberBytes = new Uint8Array(MAX_NUMBER_BYTES);
  private numberLength = 0;
  // Literal token.
  private literal = '';
  private literalAt = 0;

  constructor(private readonly options: StreamingJsonOptions) {}

  write(chunk: Buffer): void {
    const n = chunk.length;
    let i = 0;
    while (i < n) {
      if (this.token === Token.String) {
        i = this.continueString(chunk, i);
        continue;
      }
      const c = chunk[i];
      if (this.token === Token.Number) {
        if ((c >= 0x30 && c <= 0x39) || c === 0x2e || c === 0x2d || c === 0x2b || c === 0x65 || c === 0x45) {
          if (this.numberLength === MAX_NUMBER_BYTES) this.fail('a number too long to read', i);
          this.numberBytes[this.numberLength++] = c;
          i++;
          continue;
        }
        this.finishNumber(i);
        continue; // the terminator is handled below in the next round
      }
      if (this.token === Token.Literal) {
        if (c !== this.literal.charCodeAt(this.literalAt)) this.fail(`an unexpected character in '${this.literal}'`, i);
        i++;
        if (++this.literalAt === this.literal.length) {
          this.token = Token.None;
          this.value(LITERALS[this.literal.charCodeAt(0)].value);
        }
        continue;
      }
      if (isWhitespace(c)) {
        i++;
        continue;
      }
      this.structural(c, i);
      i++;
    }
    this.offset += n;
  }

  /** The parsed body (sample arrays as [] placeholders; see sampleArraysOf). */
  end(): unknown {
    if (this.token === Token.Number) this.finishNumber(0);
    if (this.expect !== Expect.Nothing || this.token !== Token.None) {
      if (this.offset === 0) throw new HttpProblem(400, 'empty-body', 'The JSON body is empty', [{ pointer: '/', detail: 'body is empty' }]);
      this.fail('the body ends before the JSON value is complete', 0, true);
    }
    if (this.samples.size > 0 && this.root !== null && typeof this.root === 'object') SAMPLE_ARRAYS.set(this.root, this.samples);
    return this.root;
  }

  private fail(what: string, at: number, atEnd = false): never {
    const where = atEnd ? 'at the end of the body' : `at byte ${this.offset + at}`;
    const message = `The body is not valid JSON: ${what} ${where}`;
    throw new HttpProblem(400, 'malformed-body', message, [{ pointer: '/', detail: message }]);
  }

  private structural(c: number, at: number): void {
    switch (this.expect) {
      case Expect.Value:
      case Expect.ValueOrEnd:
        if (c === 0x5d && this.expect === Expect.ValueOrEnd) return this.close();
        return this.startValue(c, at);
      case Expect.KeyOrEnd:
        if (c === 0x7d) return this.close();
        if (c !== 0x22) this.fail('expected a key in double quotes or }', at);
        return this.startString();
      case Expect.Key:
        if (c !== 0x22) this.fail('expected a key in double quotes', at);
        return this.startString();
      case Expect.Colon:
        if (c !== 0x3a) this.fail("expected ':' after a key", at);
        this.expect = Expect.Value;
        return;
      case Expect.CommaOrEnd: {
        const top = this.stack[this.stack.length - 1];
        if (c === 0x2c) {
          this.expect = top.kind === 'object' ? Expect.Key : Expect.Value;
          return;
        }
        if ((c === 0x7d && top.kind === 'object') || (c === 0x5d && top.kind !== 'object')) return this.close();
        return this.fail(`expected ',' or '${top.kind === 'object' ? '}' : ']'}'`, at);
      }
      case Expect.Nothing:
        return this.fail('unexpected data after the JSON value', at);
    }
  }

  private startValue(c: number, at: number): void {
    if (c === 0x22) return this.startString();
    if (c === 0x7b || c === 0x5b) return this.open(c, at);
    if (c === 0x2d || (c >= 0x30 && c <= 0x39)) {
      this.token = Token.Number;
      this.numberBytes[0] = c;
      this.numberLength = 1;
      return;
    }
    const literal = LITERALS[c];
    if (literal) {
      this.token = Token.Literal;
      this.literal = literal.text;
      this.literalAt = 1;
      return;
    }
    this.fail(`unexpected character '${String.fromCharCode(c)}'`, at);
  }

  private childPointer(): string {
    const top = this.stack[this.stack.length - 1];
    if (!top) return '';
    return top.kind === 'object' ? `${top.pointer}/${escapeSegment(top.key ?? '')}` : `${top.pointer}/${top.index}`;
  }

  private open(c: number, at: number): void {
    if (this.stack.length >= this.options.maxDepth) {
      throw new HttpProblem(400, 'too-deeply-nested', `The JSON body nests arrays/objects deeper than ${this.options.maxDepth} levels (at byte ${this.offset + at}); refused`, [
        { pointer: '/', detail: `nesting deeper than ${this.options.maxDepth}` },
      ]);
    }
    const pointer = this.childPointer();
    if (this.stack[this.stack.length - 1]?.kind === 'samples') {
      throw new HttpProblem(400, 'validation', `Invalid request: ${pointer} must be a number or null`, [{ pointer, detail: 'must be a number or null' }]);
    }
    if (c === 0x7b) {
      this.stack.push({ kind: 'object', value: {}, pointer, key: undefined, index: 0 });
      this.expect = Expect.KeyOrEnd;
    } else {
      const samples = this.options.samplePaths?.has(pointer) === true;
      this.stack.push({ kind: samples ? 'samples' : 'array', value: samples ? new SampleBlocks() : [], pointer, key: undefined, index: 0 });
      this.expect = Expect.ValueOrEnd;
    }
  }

  private close(): void {
    const frame = this.stack.pop()!;
    let value: unknown = frame.value;
    if (frame.kind === 'samples') {
      this.samples.set(frame.pointer, (frame.value as SampleBlocks).finish());
      value = [];
    }
    this.value(value);
  }

  /** A complete value: into its container, or the root. */
  private value(v: unknown): void {
    const top = this.stack[this.stack.length - 1];
    if (!top) {
      this.root = v;
      this.expect = Expect.Nothing;
      return;
    }
    if (top.kind === 'samples') {
      if (typeof v === 'number') (top.value as SampleBlocks).push(v);
      else if (v === null) (top.value as SampleBlocks).push(Number.NaN);
      else {
        const pointer = `${top.pointer}/${top.index}`;
        throw new HttpProblem(400, 'validation', `Invalid request: ${pointer} must be a number or null`, [{ pointer, detail: 'must be a number or null' }]);
      }
      top.index++;
    } else if (top.kind === 'array') {
      (top.value as unknown[]).push(v);
      top.index++;
    } else {
      const key = top.key!;
      if (key === 'constructor' && v !== null && typeof v === 'object' && Object.prototype.hasOwnProperty.call(v, 'prototype')) {
        const pointer = `${top.pointer}/constructor/prototype`;
        throw new HttpProblem(400, 'validation', `Invalid request: ${pointer} is not an accepted field name`, [{ pointer, detail: 'is not an accepted field name' }]);
      }
      (top.value as Record<string, unknown>)[key] = v;
      top.key = undefined;
    }
    this.expect = Expect.CommaOrEnd;
  }

  private finishNumber(at: number): void {
    const value = parseJsonNumber(this.numberBytes, this.numberLength);
    this.token = Token.None;
    if (Number.isNaN(value)) this.fail(`'${Buffer.from(this.numberBytes.subarray(0, this.numberLength)).toString('latin1')}' is not a JSON number`, at);
    this.value(value);
  }

  private startString(): void {
    this.token = Token.String;
    this.stringPieces = [];
    this.stringEscaped = false;
    this.afterBackslash = false;
  }

  /** Scans string bytes from `from`; returns where to go on. */
  private continueString(chunk: Buffer, from: number): number {
    let i = from;
    const n = chunk.length;
    while (i < n) {
      const c = chunk[i];
      if (this.afterBackslash) this.afterBackslash = false;
      else if (c === 0x5c) {
        this.afterBackslash = true;
        this.stringEscaped = true;
      } else if (c === 0x22) {
        if (i > from) this.stringPieces.push(chunk.subarray(from, i));
        this.finishString(i);
        return i + 1;
      } else if (c < 0x20) this.fail('a control character inside a string', i);
      i++;
    }
    // The string goes on in the next chunk: keep a copy (the chunk is not ours to hold).
    if (n > from) this.stringPieces.push(Buffer.from(chunk.subarray(from, n)));
    return n;
  }

  private finishString(at: number): void {
    this.token = Token.None;
    const raw = this.stringPieces.length === 1 ? this.stringPieces[0].toString('utf8') : Buffer.concat(this.stringPieces).toString('utf8');
    this.stringPieces = [];
    let text = raw;
    if (this.stringEscaped) {
      try {
        text = JSON.parse(`"${raw}"`) as string;
      } catch {
        this.fail('an invalid escape in a string', at);
      }
    }
    const top = this.stack[this.stack.length - 1];
    if (top?.kind === 'object' && top.key === undefined && (this.expect === Expect.KeyOrEnd || this.expect === Expect.Key)) {
      if (text === '__proto__') {
        const pointer = `${top.pointer}/__proto__`;
        throw new HttpProblem(400, 'validation', `Invalid request: ${pointer} is not an accepted field name`, [{ pointer, detail: 'is not an accepted field name' }]);
      }
      top.key = text;
      this.expect = Expect.Colon;
      return;
    }
    this.value(text);
  }
}
