/**
 * Text and number output for SVG documents. Everything the plots write goes
 * through here so escaping and coordinate rounding happen in one place.
 */

/** Escape text for use in XML character data and in double-quoted attribute values. */
export function escapeXml(text: string): string {
  let out = '';
  for (const ch of text) {
    const code = ch.codePointAt(0)!;
    if (ch === '&') out += '&amp;';
    else if (ch === '<') out += '&lt;';
    else if (ch === '>') out += '&gt;';
    else if (ch === '"') out += '&quot;';
    else if (ch === "'") out += '&apos;';
    // XML 1.0 forbids most C0 controls even as references; tabs and newlines
    // would only collapse to spaces in SVG text anyway, so replace them all.
    else if (code < 0x20 || code === 0xfffe || code === 0xffff) out += ' ';
    else out += ch;
  }
  return out;
}

/**
 * A coordinate with one decimal: a tenth of a pixel is below what a screen
 * shows, and a fixed rounding keeps the output byte-for-byte deterministic.
 */
export function px(value: number): string {
  const rounded = Math.round(value * 10) / 10;
  // Avoid "-0" in the output.
  return String(rounded === 0 ? 0 : rounded);
}

/**
 * Rough advance width of a string in the sans-serif fonts browsers pick.
 * Used only to lay out legends and labels so they do not collide; 0.6 em per
 * character is a common-practice average for proportional sans-serif faces.
 */
export function textWidthPx(text: string, fontSizePx: number): number {
  return [...text].length * fontSizePx * 0.6;
}
