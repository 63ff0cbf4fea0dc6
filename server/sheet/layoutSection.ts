import { beltLegend } from '@/drawing/layoutPlan';
import { block, COLOR, type Content, type ContentObject } from './layout';
import { BELT_COLOURS, beltPathSvg, layoutPlanSvg, originPlanSvg } from './plots/layoutPlan';
import { safe, unitsOf } from './sections';
import type { SheetData } from './types';

function legendRow(data: SheetData): ContentObject {
  const dr = data.result.layout;
  const items = beltLegend(dr).map((b) => ({
    text: [
      { text: b.dashed ? '- - -  ' : '——  ', color: BELT_COLOURS[b.slot % BELT_COLOURS.length], bold: true },
      { text: b.text, color: COLOR.ink },
    ],
    fontSize: 7,
  }));
  return { stack: items, margin: [0, 2, 0, 0] };
}

/**
 * The belt section's drawings (after its tables): "Belt layout": the whole layout in plan with its levels, one small plan per belt with the pulleys named
 * as in the span table, and the travel origin with the parking position (docs/models/belt-layout.md "Drawings").
 * Results of engine 1.0 carry no levels or names; the section then says so and draws the plan alone.
 * @param data - the sheet's data
 * @param width - printable width [pt]
 * @returns sheet content
 */
export function layoutSection(data: SheetData, width: number): Content[] {
  const r = data.result;
  const dr = r.layout;
  const named = dr.parts.some((p) => p.tag);
  const twoLevels = (dr.levels?.length ?? 1) > 1;
  const planWidth = width * 0.62;
  const intro = named
    ? 'Plan seen from above at the parking position, front of the machine at the bottom. Pulleys carry the names of the span table; ' +
      'a dot marks idlers stacked on one bolt (one per level, each on its own bearings); motor pulleys are filled, with the motor outline dashed.' +
      (twoLevels ? ' Belts on the upper level are dashed, drawn over the lower where the two run one above the other.' : '')
    : 'This result was computed by an engine without belt levels or pulley names; the plan shows the pulleys only.';
  const content: Content[] = [
    block(
      { text: 'Belt layout', style: 'h2', margin: [0, 10, 0, 2] },
      { text: intro, style: 'note', margin: [0, 0, 0, 4] },
      {
        columns: [
          { width: planWidth, svg: layoutPlanSvg(dr, planWidth, 300) },
          {
            width: '*',
            stack: [
              { text: 'Belts', style: 'label' },
              legendRow(data),
              { text: 'Pulleys', style: 'label', margin: [0, 6, 0, 1] },
              ...dr.parts.filter((p) => p.kind !== 'clamp' && p.tag).map((p) => safe(p.label, { fontSize: 6.5, margin: [0, 0, 0, 0.5] })),
            ],
          },
        ],
        columnGap: 10,
      },
    ),
  ];
  if (!named) return content;
  const cols = dr.belts.length >= 3 ? 3 : 2;
  const cell = (width - (cols - 1) * 10) / cols;
  const cells: Content[] = dr.belts.map(
    (b) =>
      ({
        width: cell,
        stack: [
          safe(`${b.label ?? `belt ${b.id}`}${b.level ? `, ${dr.levels?.find((l) => l.level === b.level)?.label ?? ''}` : ''}`, {
            bold: true,
            fontSize: 7,
            margin: [0, 0, 0, 2],
          }),
          { svg: beltPathSvg(dr, b.id, cell, 190), width: cell },
        ],
      }) as ContentObject,
  );
  const rows: Content[] = [];
  for (let i = 0; i < cells.length; i += cols) rows.push({ columns: cells.slice(i, i + cols), columnGap: 10, margin: [0, 0, 0, 6] });
  content.push(
    block(
      { text: 'Belt paths', style: 'h2', margin: [0, 8, 0, 2] },
      {
        text:
          'Each belt alone, from clamp to clamp; the names are those of the span table above.' +
          (dr.belts.some((b) => b.plane === 'upright')
            ? ' Upright loops (pulley axes horizontal) are drawn from the side, heights at 3 × scale: the gantry is clamped to the upper run ' +
              'of each Y loop, the carriage to the lower run of the X loop, and the other run returns past the clamps.'
            : ''),
        style: 'note',
        margin: [0, 0, 0, 4],
      },
      ...rows,
    ),
  );
  const park = r.parking;
  const u = unitsOf(data);
  const len = (mm: number) => u.q(mm, 'length', 'mm');
  const position = (xMm: number, yMm: number) => `X ${u.n(xMm, 'length', 'mm')}, Y ${u.n(yMm, 'length', 'mm')} ${u.label('length')}`;
  content.push(
    block(
      { text: 'Origin and parking position', style: 'h2', margin: [0, 8, 0, 2] },
      {
        columns: [
          { width: width * 0.45, svg: originPlanSvg(dr, r.travel, park, width * 0.45, 200, position) },
          {
            width: '*',
            stack: [
              {
                text:
                  `Travel (0, 0) is the carriage centre at its front-left limit; +X runs to the right and +Y toward the back, seen from above. ` +
                  `The carriage centre can travel ${len(r.travel.xMm)} in X and ${len(r.travel.yMm)} in Y.`,
                fontSize: 7.5,
              },
              {
                text: `Park the carriage at ${position(park.xMm, park.yMm)} from the origin (the centre of travel) to pluck the spans.`,
                fontSize: 7.5,
                bold: true,
                margin: [0, 4, 0, 0],
              },
            ],
          },
        ],
        columnGap: 12,
      },
    ),
  );
  return content;
}
