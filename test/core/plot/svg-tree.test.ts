import { describe, it, expect } from 'vitest';
import { parseXml, textOf } from './svg-tree.ts';

// The plot tests lean on this reader to reject malformed output, so it must
// itself reject what XML 1.0 (W3C Recommendation, 5th ed., §2.1, §2.4, §3.1) forbids.
describe('test XML reader', () => {
  it('reads well-formed markup and decodes the predefined entities', () => {
    const root = parseXml('<svg a="1"><text>x &lt; y &amp;&#x3bc;</text><g/></svg>');
    expect(root.attrs.a).toBe('1');
    expect(textOf(root)).toBe('x < y &μ');
  });

  it.each([
    ['unclosed element', '<svg><g></svg>'],
    ['mismatched close', '<svg><g></text></svg>'],
    ['bare ampersand', '<svg><text>a & b</text></svg>'],
    ['unknown entity', '<svg><text>&nbsp;</text></svg>'],
    ['unquoted attribute', '<svg width=10></svg>'],
    ['duplicate attribute', '<svg a="1" a="2"></svg>'],
    ['raw "<" in an attribute', '<svg a="<"></svg>'],
    ['two roots', '<svg></svg><svg></svg>'],
  ])('rejects %s', (_name, xml) => {
    expect(() => parseXml(xml)).toThrow();
  });
});
