import { levelName, planPosition, solveLoop, type BeltLayout, type LoopState } from './beltLayout';
import { requireNumber, throwInputError } from './errors';
import { frameToTravel, type TravelInput } from './frame';
import type { LayoutBelt, LayoutDrawing, LayoutPart } from './types';

const DEG = 180 / Math.PI;

/** The design data the drawing needs besides the layout. */
export interface DrawingInput {
  layout: BeltLayout;
  /** Each loop solved at the parking position, in layout order. */
  states: LoopState[];
  frame: { outerXMm: number; outerYMm: number; extrusionMm: number; carriageXMm: number; carriageYMm: number; gantryYMm: number };
  beltWidthMm: number;
  /** Carriage centre where the drawing shows it (the parking position in a result), frame coordinates [mm]. */
  parkXMm: number;
  parkYMm: number;
  /** Travel origin (carriage centre at travel (0, 0)) and travel [mm]. */
  origin: { xMm: number; yMm: number };
  travel: { xMm: number; yMm: number };
}

/**
 * Plan drawing of the layout at the parking position: every pulley and clamp with its tag, level, axis and the
 * parts stacked on its bolt; every belt's spans in plan, and upright loops also in their own plane.
 * @param p - layout, solved loops, frame [mm], belt width [mm], parking and travel [mm]
 * @returns the drawing data of the result
 */
export function layoutDrawing(p: DrawingInput): LayoutDrawing {
  const { layout, states } = p;
  const stacks = new Map<string, string[]>();
  for (const loop of layout.loops)
    for (const e of loop.elements) if (e.stackId) stacks.set(e.stackId, [...(stacks.get(e.stackId) ?? []), e.id]);
  const parts: LayoutPart[] = [];
  const belts: LayoutBelt[] = [];
  layout.loops.forEach((loop, i) => {
    const st = states[i];
    const drive = loop.elements.find((e) => e.kind === 'drive');
    const upright = loop.plane.kind === 'upright' ? loop.plane : null;
    const axis: LayoutPart['axis'] = upright ? (upright.runsAlong === 'y' ? 'x' : 'y') : 'vertical';
    loop.elements.forEach((e, j) => {
      const at = planPosition(loop, e, p.parkXMm, p.parkYMm);
      const coord = e.motor ? layout.motorVars.find((v) => v.id === e.motor)!.coordinate : null;
      parts.push({
        id: e.id,
        tag: e.tag,
        label: e.label,
        belt: loop.id,
        kind: e.kind,
        body: e.body,
        toothed: e.kind === 'clamp' ? false : e.sense === (drive ? drive.sense : 1),
        xMm: at.xMm,
        yMm: at.yMm,
        zMm: at.zMm,
        level: e.level,
        axis,
        stackedWith: e.stackId ? stacks.get(e.stackId)!.filter((id) => id !== e.id) : [],
        radiusMm: e.radiusMm,
        teeth: e.teeth,
        motor: coord === null ? null : coord === 0 ? 'A' : 'B',
        wrapDeg: j > 0 && j < loop.elements.length - 1 ? st.path.wraps[j - 1].wrapRad * DEG : 0,
      });
    });
    const segments = st.path.spans.map((s) => {
      if (!upright) return { x1Mm: s.x1Mm, y1Mm: s.y1Mm, x2Mm: s.x2Mm, y2Mm: s.y2Mm };
      if (upright.runsAlong === 'y') return { x1Mm: upright.atMm, y1Mm: s.y1Mm, x2Mm: upright.atMm, y2Mm: s.y2Mm };
      const y = p.parkYMm + upright.atMm;
      return { x1Mm: s.x1Mm, y1Mm: y, x2Mm: s.x2Mm, y2Mm: y };
    });
    const belt: LayoutBelt = { id: loop.id, label: loop.label, level: loop.level, plane: upright ? 'upright' : 'flat', segments };
    if (upright) {
      const z = (across: number) => upright.sign * (across - upright.zeroMm);
      belt.elevation = {
        along: upright.runsAlong,
        segments: st.path.spans.map((s) =>
          upright.runsAlong === 'y'
            ? { u1Mm: s.y1Mm, z1Mm: z(s.x1Mm), u2Mm: s.y2Mm, z2Mm: z(s.x2Mm) }
            : { u1Mm: s.x1Mm, z1Mm: z(s.y1Mm - p.parkYMm), u2Mm: s.x2Mm, z2Mm: z(s.y2Mm - p.parkYMm) },
        ),
      };
    }
    belts.push(belt);
  });
  const levelIds = [...new Set(layout.loops.map((l) => l.level))].sort();
  return {
    frame: { outerXMm: p.frame.outerXMm, outerYMm: p.frame.outerYMm, extrusionMm: p.frame.extrusionMm },
    carriage: { xMm: p.parkXMm, yMm: p.parkYMm, widthMm: p.frame.carriageXMm, depthMm: p.frame.carriageYMm },
    gantry: { yMm: p.parkYMm, depthMm: p.frame.gantryYMm, fromXMm: p.frame.extrusionMm, toXMm: p.frame.outerXMm - p.frame.extrusionMm },
    travel: { fromXMm: p.origin.xMm, fromYMm: p.origin.yMm, toXMm: p.origin.xMm + p.travel.xMm, toYMm: p.origin.yMm + p.travel.yMm },
    levels: levelIds.map((level) => ({
      level,
      label: levelName(layout.mechanism, level),
      belts: layout.loops.filter((l) => l.level === level).map((l) => l.id),
    })),
    beltWidthMm: p.beltWidthMm,
    flangeMm: layout.flangeMm,
    parts,
    belts,
  };
}

/**
 * The layout drawing with the carriage anywhere in its travel, for the Design desk's "move the carriage" view
 * and for the geometric checks of the layout over the whole travel.
 * @param args.design - a validated design (mechanism, frame, belt, pulleys, Y motors)
 * @param args.xMm - carriage position along the X travel, 0 … travel X [mm]
 * @param args.yMm - carriage position along the Y travel, 0 … travel Y [mm]
 * @returns the drawing with the carriage and gantry at that position
 */
export function layoutDrawingAt(args: { design: TravelInput; xMm: number; yMm: number }): LayoutDrawing {
  const s = 'layoutDrawingAt';
  if (!args || typeof args.design !== 'object' || args.design === null) throwInputError(s, 'is required', 'design');
  const t = frameToTravel(args.design);
  const x = requireNumber(s, 'xMm', args.xMm, 0, Math.max(0, t.xMm) + 1e-9);
  const y = requireNumber(s, 'yMm', args.yMm, 0, Math.max(0, t.yMm) + 1e-9);
  const cx = t.originXMm + x;
  const cy = t.originYMm + y;
  return layoutDrawing({
    layout: t.layout,
    states: t.layout.loops.map((loop) => solveLoop(loop, cx, cy)),
    frame: args.design.frame,
    beltWidthMm: args.design.belt.widthMm,
    parkXMm: cx,
    parkYMm: cy,
    origin: { xMm: t.originXMm, yMm: t.originYMm },
    travel: { xMm: t.xMm, yMm: t.yMm },
  });
}
