/**
 * A tiny strict XML 1.0 reader for the tests: elements, attributes, text, the five predefined entities
 * and numeric character references; a declaration at the start. Anything else (comments, CDATA, DTDs,
 * unknown entities, mismatched or unclosed tags, duplicate attributes, characters XML 1.0 forbids)
 * throws, so a report that a real parser would reject fails the test.
 */

export interface XmlElement {
  name: string;
  attrs: Record<string, string>;
  children: XmlElement[];
  text: string;
}

const PREDEFINED: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };
// XML 1.0 section 2.2, production [2] Char (from memory): tab, LF, CR, U+0020-U+D7FF, U+E000-U+FFFD, astral.
const FORBIDDEN = /[^\t\n\r\u0020-\ud7ff\ue000-\ufffd\u{10000}-\u{10ffff}]/u;
const NAME = /^[A-Za-z_][A-Za-z0-9_.:-]*/;

function decode(s: string): string {
  if (/[<]/.test(s)) throw new Error(`raw '<' in ${JSON.stringify(s)}`);
  return s.replace(/&([^;]*);|&/g, (m, ent: string | undefined) => {
    if (ent === undefined) throw new Error('bare &');
    if (ent in PREDEFINED) return PREDEFINED[ent]!;
    const num = /^#x([0-9A-Fa-f]+)$/.exec(ent) ?? /^#([0-9]+)$/.exec(ent);
    if (!num) throw new Error(`unknown entity ${m}`);
    return String.fromCodePoint(parseInt(num[1]!, ent.startsWith('#x') ? 16 : 10));
  });
}

/** Parses an XML document into its root element. */
export function parseXml(doc: string): XmlElement {
  if (FORBIDDEN.test(doc)) throw new Error('a character XML 1.0 forbids');
  let i = 0;
  const decl = /^<\?xml version="1\.0" encoding="UTF-8"\?>\s*/.exec(doc);
  if (decl) i = decl[0].length;
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  while (i < doc.length) {
    const lt = doc.indexOf('<', i);
    const text = decode(doc.slice(i, lt < 0 ? doc.length : lt));
    if (stack.length > 0) stack[stack.length - 1]!.text += text;
    else if (text.trim() !== '') throw new Error('text outside the root element');
    if (lt < 0) break;
    const gt = doc.indexOf('>', lt);
    if (gt < 0) throw new Error('unclosed tag');
    const tag = doc.slice(lt + 1, gt);
    i = gt + 1;
    if (tag.startsWith('/')) {
      const open = stack.pop();
      if (!open || open.name !== tag.slice(1)) throw new Error(`mismatched </${tag.slice(1)}>`);
      continue;
    }
    const selfClosing = tag.endsWith('/');
    const body = selfClosing ? tag.slice(0, -1) : tag;
    const name = NAME.exec(body)?.[0];
    if (!name) throw new Error(`bad tag <${tag}>`);
    const el: XmlElement = { name, attrs: {}, children: [], text: '' };
    let rest = body.slice(name.length);
    for (;;) {
      const a = /^\s+([A-Za-z_][A-Za-z0-9_.:-]*)="([^"]*)"/.exec(rest);
      if (!a) break;
      if (a[1]! in el.attrs) throw new Error(`duplicate attribute ${a[1]}`);
      el.attrs[a[1]!] = decode(a[2]!);
      rest = rest.slice(a[0].length);
    }
    if (rest.trim() !== '') throw new Error(`bad attributes in <${tag}>`);
    if (stack.length > 0) stack[stack.length - 1]!.children.push(el);
    else if (root === null) root = el;
    else throw new Error('two root elements');
    if (!selfClosing) stack.push(el);
  }
  if (stack.length > 0 || root === null) throw new Error('unclosed element or no root');
  return root;
}
