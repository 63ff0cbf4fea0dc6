/** A pdfmake content node; pdfmake ships no types for 0.3, so the sheet keeps its own loose shape. */
export type Content = string | ContentObject | Content[];
export interface ContentObject {
  [key: string]: unknown;
}

export const COLOR = {
  ink: '#1d2430',
  muted: '#5b6472',
  rule: '#9aa3b0',
  hairline: '#d5d9e0',
  headFill: '#eef1f5',
  groupFill: '#f6f7f9',
  accent: '#0072B2',
  cautionFill: '#fff8d6',
  cautionEdge: '#1d2430',
} as const;

export const PAGE_MARGINS: [number, number, number, number] = [40, 62, 40, 46];

/** Printable width for the paper: A4 595.28 pt, US Letter 612 pt wide. */
export function contentWidth(paper: 'A4' | 'LETTER'): number {
  return (paper === 'A4' ? 595.28 : 612) - PAGE_MARGINS[0] - PAGE_MARGINS[2];
}

export const STYLES: Record<string, ContentObject> = {
  title: { fontSize: 20, bold: true, color: COLOR.ink },
  subtitle: { fontSize: 9.5, color: COLOR.muted },
  h1: { fontSize: 11.5, bold: true, color: COLOR.ink },
  h2: { fontSize: 8.5, bold: true, color: COLOR.ink, margin: [0, 8, 0, 3] },
  label: { fontSize: 6.5, color: COLOR.muted },
  th: { bold: true, fontSize: 7, color: COLOR.ink },
  note: { fontSize: 7, color: COLOR.muted },
  num: { alignment: 'right' },
};

/** Thin rules between rows, a stronger rule under the header and at the end; no vertical rules. */
export const TABLE_LAYOUT: ContentObject = {
  hLineWidth: (i: number, node: { table: { body: unknown[]; headerRows?: number } }) =>
    i === 0 || i === node.table.body.length || i === (node.table.headerRows ?? 0) ? 0.8 : 0.3,
  vLineWidth: () => 0,
  hLineColor: (i: number, node: { table: { body: unknown[]; headerRows?: number } }) =>
    i === 0 || i === node.table.body.length || i === (node.table.headerRows ?? 0) ? COLOR.rule : COLOR.hairline,
  paddingLeft: () => 4,
  paddingRight: () => 4,
  paddingTop: () => 1.9,
  paddingBottom: () => 1.9,
};

/** A numbered section heading with a rule under it; kept with what follows. */
export function heading(number: string, title: string): Content {
  return {
    stack: [
      { text: [{ text: `${number}  `, color: COLOR.accent }, title], style: 'h1' },
      { canvas: [{ type: 'line', x1: 0, y1: 2, x2: 120, y2: 2, lineWidth: 1.2, lineColor: COLOR.accent }] },
    ],
    margin: [0, 14, 0, 6],
    headlineLevel: 1,
  };
}

/**
 * Content kept on one page: moved whole to the next page when it does not fit. Headings inside lose their
 * headline level: the block already keeps them with their content, and pdfmake loses an unbreakable block's
 * content when a page break is forced on a node inside it.
 */
export function block(...content: Content[]): ContentObject {
  const plain = content.map((c) => {
    if (typeof c !== 'object' || Array.isArray(c) || c.headlineLevel === undefined) return c;
    const { headlineLevel: _dropped, ...rest } = c;
    return rest;
  });
  return { stack: plain, unbreakable: true };
}

/** Table header cell. */
export function th(text: string, alignment: 'left' | 'right' | 'center' = 'left'): ContentObject {
  return { text, style: 'th', alignment, fillColor: COLOR.headFill };
}

/** Right-aligned numeric cell. */
export function numCell(text: string, bold = false): ContentObject {
  return { text, alignment: 'right', bold };
}

/** A table of the sheet's layout with a repeated header row. */
export function table(widths: (number | string)[], header: Content[], rows: Content[][], extra: ContentObject = {}): ContentObject {
  return {
    table: { headerRows: 1, widths, body: [header, ...rows], dontBreakRows: true },
    layout: TABLE_LAYOUT,
    ...extra,
  };
}

/** A group heading row spanning `span` columns inside a table. */
export function groupRow(title: string, span: number): Content[] {
  const first: ContentObject = { text: title, bold: true, colSpan: span, fillColor: COLOR.groupFill, color: COLOR.accent, fontSize: 7.5 };
  return [first, ...Array.from({ length: span - 1 }, () => ({}))];
}
