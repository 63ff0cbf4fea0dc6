import { createRequire } from 'node:module';
import path from 'node:path';
import { parseDesign } from '@/engine';
import { BASE_FONT, sheetFontFiles } from './fonts';
import { userTextRuns, utcStamp } from './format';
import { COLOR, type Content, type ContentObject, contentWidth, PAGE_MARGINS, STYLES } from './layout';
import { wordmarkGlyph } from './plots/glyphs';
import { jobSection, secondLayerSection } from './secondLayerSections';
import { layoutSection } from './layoutSection';
import { plotsSection } from './plotsSection';
import { installShapingCache } from './shapingCache';
import {
  beltsSection,
  cautionsBox,
  checksTable,
  driveSection,
  inputsSection,
  keyFigures,
  limitsSection,
  partsSection,
  stiffnessSection,
  titleBlock,
} from './sections';
import type { SheetData, SheetInput } from './types';

export type { SheetInput } from './types';

interface PdfMakeServer {
  setFonts(fonts: unknown): void;
  setUrlAccessPolicy(policy: (url: string) => boolean): void;
  setLocalAccessPolicy(policy: (path: string) => boolean): void;
  createPdf(doc: unknown): { getBuffer(): Promise<Buffer> };
}

const require = createRequire(import.meta.url);
const pdfmake = require('pdfmake') as PdfMakeServer;

/** A pdfmake document definition (the sheet's own loose shape). */
export interface SheetDocDefinition extends ContentObject {
  content: Content[];
  header: (currentPage: number, pageCount: number) => Content;
  footer: (currentPage: number, pageCount: number) => Content;
}

function assertSheetInput(input: SheetInput): void {
  if (!/^[0-9a-f]{64}$/i.test(input.fingerprint)) throw new Error('[renderSheet] fingerprint must be 64 hex digits (SHA-256)');
  if (input.paper !== 'A4' && input.paper !== 'LETTER')
    throw new Error(`[renderSheet] paper must be A4 or LETTER, got ${String(input.paper)}`);
  if (!Number.isInteger(input.revisionNumber) || input.revisionNumber < 1)
    throw new Error('[renderSheet] revisionNumber must be a positive integer');
  utcStamp(input.approval.approvedAt);
  if (input.result?.mechanism !== input.mechanism) {
    throw new Error(
      `[renderSheet] mechanism ${String(input.mechanism)} does not match the frozen result's ${String(input.result?.mechanism)}`,
    );
  }
}

function header(input: SheetInput, width: number): (currentPage: number) => Content {
  return () => ({
    margin: [PAGE_MARGINS[0], 20, PAGE_MARGINS[2], 0],
    stack: [
      {
        columns: [
          { svg: wordmarkGlyph(22), width: 22 },
          {
            width: 'auto',
            stack: [
              { text: 'Gantrywright', bold: true, fontSize: 12.5, color: COLOR.ink },
              { text: 'DESIGN SHEET', fontSize: 6, bold: true, color: COLOR.accent, characterSpacing: 1.2 },
            ],
            margin: [6, 1, 0, 0],
          },
          {
            width: '*',
            alignment: 'right',
            stack: [
              { text: userTextRuns(input.designName, true), bold: true, fontSize: 8.5 },
              {
                text: `Revision ${input.revisionNumber}  ·  approved ${utcStamp(input.approval.approvedAt).slice(0, 10)}`,
                fontSize: 7,
                color: COLOR.muted,
              },
            ],
            margin: [0, 2, 0, 0],
          },
        ],
      },
      { canvas: [{ type: 'line', x1: 0, y1: 5, x2: width, y2: 5, lineWidth: 0.8, lineColor: COLOR.ink }] },
    ],
  });
}

function footer(input: SheetInput, width: number): (currentPage: number, pageCount: number) => Content {
  return (currentPage, pageCount) => ({
    margin: [PAGE_MARGINS[0], 10, PAGE_MARGINS[2], 0],
    stack: [
      { canvas: [{ type: 'line', x1: 0, y1: 0, x2: width, y2: 0, lineWidth: 0.5, lineColor: COLOR.rule }] },
      {
        columns: [
          {
            width: '*',
            text: [
              { text: 'Fingerprint (SHA-256 of the frozen inputs and results)  ', color: COLOR.muted },
              { text: input.fingerprint.toLowerCase(), color: COLOR.ink },
            ],
            fontSize: 6.3,
          },
          { width: 70, text: `Page ${currentPage} of ${pageCount}`, alignment: 'right', fontSize: 7.5, bold: true },
        ],
        margin: [0, 4, 0, 0],
      },
    ],
  });
}

/**
 * Build the pdfmake document definition of a design sheet. Pure: the same input gives the same definition.
 * Exposed for tests (the glyph test walks it); production code calls `renderSheet`.
 */
export function buildSheetDoc(input: SheetInput): SheetDocDefinition {
  assertSheetInput(input);
  // The frozen document may leave optional fields out; the engine's schema fills the same defaults it computed with.
  const data: SheetData = { ...input, design: parseDesign(input.inputs), units: input.units ?? 'metric' };
  const width = contentWidth(input.paper);
  const approvedAt = new Date(input.approval.approvedAt);
  return {
    pageSize: input.paper,
    pageMargins: PAGE_MARGINS,
    info: {
      title: `${input.designName} — revision ${input.revisionNumber}`,
      author: input.designer.name,
      subject: 'Gantrywright design sheet',
      creator: 'Gantrywright',
      producer: 'Gantrywright',
      // Fixed dates make the bytes depend on the revision only: rendering the same approval twice gives the same file.
      creationDate: approvedAt,
      modDate: approvedAt,
    },
    defaultStyle: { font: BASE_FONT, fontSize: 8, color: COLOR.ink, lineHeight: 1.15 },
    styles: STYLES,
    header: header(input, width),
    footer: footer(input, width),
    pageBreakBefore: (node: { headlineLevel?: number; startPosition?: { verticalRatio?: number } }) =>
      (node.headlineLevel === 1 && (node.startPosition?.verticalRatio ?? 0) > 0.8) ||
      (node.headlineLevel === 2 && (node.startPosition?.verticalRatio ?? 0) > 0.88),
    // The maker's order: what to order, how to cut and tension the belts, the controller numbers; then the checks
    // and the engineering behind them for whoever wants to know why.
    content: [
      titleBlock(data, width),
      cautionsBox(data.result, width),
      keyFigures(data, width),
      ...partsSection(data),
      ...beltsSection(data),
      ...layoutSection(data, width),
      ...driveSection(data),
      ...checksTable(data),
      ...limitsSection(data),
      ...stiffnessSection(data),
      ...plotsSection(data, width),
      ...inputsSection(data),
      ...secondLayerSection(data, width, '9'),
      ...jobSection(data, width, '10'),
    ],
  };
}

/**
 * Render the design sheet of an approved revision to PDF bytes (A4 or US Letter), with Inter embedded
 * and no file or network access beyond the font folder. The same input always gives the same bytes
 * (the PDF dates are the approval time).
 * @param input - the frozen revision, its approval and fingerprint
 * @returns the PDF bytes
 * @throws Error "[renderSheet] …" for a malformed fingerprint, paper, revision number, date or mechanism;
 *   EngineInputError when the frozen inputs no longer pass the design schema
 */
export async function renderSheet(input: SheetInput): Promise<Buffer> {
  const doc = buildSheetDoc(input);
  // pdfmake is a process-wide singleton: set fonts and policies on every call so no other user of it can leave
  // the sheet with other fonts or with network or file access.
  const { dir, fonts } = sheetFontFiles();
  // Words shaped for an earlier sheet are not shaped again (shapingCache.ts).
  installShapingCache(fonts[BASE_FONT].normal);
  pdfmake.setFonts(fonts);
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy((p) => p.startsWith(dir + path.sep));
  return pdfmake.createPdf(doc).getBuffer();
}
