// Walks a pdfmake document definition and lists every character with the font file pdfmake will draw it with.
import { fontFile } from '../../../../server/sheet/fonts';

interface Inherited {
  font: string;
  bold: boolean;
  italics: boolean;
}

/** One character of the sheet and the font file (family + style) it is drawn with. */
export interface PlacedChar {
  char: string;
  file: string;
  where: string;
}

type Node = unknown;
type Styles = Record<string, Record<string, unknown>>;

function applyStyle(base: Inherited, node: Record<string, unknown>, styles: Styles): Inherited {
  const out = { ...base };
  const names = node.style === undefined ? [] : Array.isArray(node.style) ? node.style : [node.style];
  for (const name of names) {
    const st = styles[String(name)];
    if (!st) continue;
    if (typeof st.font === 'string') out.font = st.font;
    if (typeof st.bold === 'boolean') out.bold = st.bold;
    if (typeof st.italics === 'boolean') out.italics = st.italics;
  }
  if (typeof node.font === 'string') out.font = node.font;
  if (typeof node.bold === 'boolean') out.bold = node.bold;
  if (typeof node.italics === 'boolean') out.italics = node.italics;
  return out;
}

function decodeXml(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#(\d+);/g, (_, d) => String.fromCodePoint(Number(d)))
    .replace(/&amp;/g, '&');
}

/** Characters of every <text> element of an SVG string, with the family and weight svg-to-pdfkit picks. */
export function svgChars(svg: string, fallbackFont: string, where: string): PlacedChar[] {
  const out: PlacedChar[] = [];
  const re = /<text\b([^>]*)>([\s\S]*?)<\/text>/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(svg)) !== null) {
    const attrs = m[1];
    const family = /font-family="([^"]*)"/.exec(attrs)?.[1].split(',')[0].trim().replace(/['"]/g, '') || fallbackFont;
    const bold = /font-weight="bold"/.test(attrs);
    const italics = /font-style="italic"/.test(attrs);
    const content = decodeXml(m[2].replace(/<[^>]+>/g, ''));
    for (const char of Array.from(content)) out.push({ char, file: fontFile(family, bold, italics), where: `${where} svg` });
  }
  if (/<tspan|<textPath/.test(svg)) throw new Error('docText: tspan/textPath not handled by this walker');
  return out;
}

/** Every character of a doc definition (content, header and footer of a few pages), with its font file. */
export function docChars(doc: Record<string, unknown>): PlacedChar[] {
  const styles = (doc.styles ?? {}) as Styles;
  const base = applyStyle({ font: 'Roboto', bold: false, italics: false }, (doc.defaultStyle ?? {}) as Record<string, unknown>, styles);
  const out: PlacedChar[] = [];

  const walk = (node: Node, inh: Inherited, where: string): void => {
    if (node === null || node === undefined) return;
    if (typeof node === 'string' || typeof node === 'number') {
      for (const char of Array.from(String(node)).filter((c) => c !== '\n'))
        out.push({ char, file: fontFile(inh.font, inh.bold, inh.italics), where });
      return;
    }
    if (Array.isArray(node)) {
      node.forEach((n, i) => walk(n, inh, `${where}[${i}]`));
      return;
    }
    if (typeof node !== 'object') return;
    const obj = node as Record<string, unknown>;
    const here = applyStyle(inh, obj, styles);
    if (obj.text !== undefined) walk(obj.text, here, `${where}.text`);
    if (obj.stack !== undefined) walk(obj.stack, here, `${where}.stack`);
    if (obj.columns !== undefined) walk(obj.columns, here, `${where}.columns`);
    if (obj.ul !== undefined) walk(obj.ul, here, `${where}.ul`);
    if (obj.ol !== undefined) walk(obj.ol, here, `${where}.ol`);
    if (obj.table !== undefined) walk((obj.table as { body: unknown }).body, here, `${where}.table`);
    if (typeof obj.svg === 'string') out.push(...svgChars(obj.svg, typeof obj.font === 'string' ? obj.font : 'Roboto', where));
  };

  walk(doc.content, base, 'content');
  for (const key of ['header', 'footer'] as const) {
    const fn = doc[key];
    if (typeof fn === 'function') {
      for (const [page, count] of [
        [1, 12],
        [12, 12],
      ])
        walk(fn(page, count, { width: 600, height: 800 }), base, `${key}(${page})`);
    } else if (fn) {
      walk(fn, base, key);
    }
  }
  return out;
}
