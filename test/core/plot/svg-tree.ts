/**
 * A small, strict XML reader for the tests: enough of XML 1.0 (W3C
 * Recommendation, 5th ed.) to reject what a real parser rejects in our output
 * (unbalanced or mismatched tags, unquoted or duplicate attributes, a raw "<"
 * or "&" in text, unknown entities, more than one root) and to give the tests a
 * tree to query. Not a general parser: no DTDs, CDATA or processing
 * instructions other than the XML declaration.
 */

export interface XmlElement {
  name: string;
  attrs: Record<string, string>;
  children: (XmlElement | string)[];
}

const NAME = /^[A-Za-z_:][-A-Za-z0-9_:.]*/;
const PREDEFINED: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function decodeEntities(text: string, where: number): string {
  return text.replace(/&([^;&<\s]*);?/g, (whole, body: string) => {
    if (!whole.endsWith(';')) throw new Error(`bare "&" at ${where}`);
    if (body in PREDEFINED) return PREDEFINED[body];
    const num = /^#(?:x([0-9a-fA-F]+)|([0-9]+))$/.exec(body);
    if (num) return String.fromCodePoint(num[1] ? parseInt(num[1], 16) : parseInt(num[2], 10));
    throw new Error(`unknown entity &${body}; at ${where}`);
  });
}

function parseAttributes(source: string, where: number): Record<string, string> {
  const attrs: Record<string, string> = {};
  let rest = source;
  while (rest.trim() !== '') {
    const m = /^\s+([A-Za-z_:][-A-Za-z0-9_:.]*)\s*=\s*(?:"([^"<]*)"|'([^'<]*)')/.exec(rest);
    if (!m) throw new Error(`malformed attributes near ${where}: ${JSON.stringify(rest.slice(0, 40))}`);
    if (m[1] in attrs) throw new Error(`duplicate attribute ${m[1]} at ${where}`);
    attrs[m[1]] = decodeEntities(m[2] ?? m[3], where);
    rest = rest.slice(m[0].length);
  }
  return attrs;
}

/** Parse or throw with the position of the first error. */
export function parseXml(xml: string): XmlElement {
  let i = 0;
  if (xml.startsWith('<?xml')) i = xml.indexOf('?>') + 2;
  const stack: XmlElement[] = [];
  let root: XmlElement | undefined;
  while (i < xml.length) {
    if (xml[i] !== '<') {
      const end = xml.indexOf('<', i);
      const raw = xml.slice(i, end === -1 ? xml.length : end);
      if (stack.length === 0) {
        if (raw.trim() !== '') throw new Error(`text outside the root element at ${i}`);
      } else {
        stack[stack.length - 1].children.push(decodeEntities(raw, i));
      }
      i = end === -1 ? xml.length : end;
      continue;
    }
    if (xml.startsWith('<!--', i)) {
      const end = xml.indexOf('-->', i);
      if (end === -1) throw new Error(`unterminated comment at ${i}`);
      i = end + 3;
      continue;
    }
    const close = xml.indexOf('>', i);
    if (close === -1) throw new Error(`unterminated tag at ${i}`);
    const tag = xml.slice(i + 1, close);
    if (tag.startsWith('/')) {
      const name = tag.slice(1).trim();
      const open = stack.pop();
      if (!open || open.name !== name) throw new Error(`</${name}> at ${i} does not close <${open?.name ?? 'nothing'}>`);
    } else {
      const selfClosing = tag.endsWith('/');
      const body = selfClosing ? tag.slice(0, -1) : tag;
      const nameMatch = NAME.exec(body);
      if (!nameMatch) throw new Error(`bad tag name at ${i}`);
      const element: XmlElement = { name: nameMatch[0], attrs: parseAttributes(body.slice(nameMatch[0].length), i), children: [] };
      if (stack.length > 0) stack[stack.length - 1].children.push(element);
      else if (root) throw new Error(`second root element at ${i}`);
      else root = element;
      if (!selfClosing) stack.push(element);
    }
    i = close + 1;
  }
  if (stack.length > 0) throw new Error(`<${stack[stack.length - 1].name}> is never closed`);
  if (!root) throw new Error('no root element');
  return root;
}

export function findAll(root: XmlElement, test: (el: XmlElement) => boolean): XmlElement[] {
  const out: XmlElement[] = [];
  const walk = (el: XmlElement) => {
    if (test(el)) out.push(el);
    for (const child of el.children) if (typeof child !== 'string') walk(child);
  };
  walk(root);
  return out;
}

export function hasClass(el: XmlElement, name: string): boolean {
  return (el.attrs.class ?? '').split(/\s+/).includes(name);
}

export function byClass(root: XmlElement, name: string): XmlElement[] {
  return findAll(root, (el) => hasClass(el, name));
}

export function textOf(el: XmlElement): string {
  return el.children.map((c) => (typeof c === 'string' ? c : textOf(c))).join('');
}

/** Every <text> element's content, in document order. */
export function allTexts(root: XmlElement): string[] {
  return findAll(root, (el) => el.name === 'text').map(textOf);
}
