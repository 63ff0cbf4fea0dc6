import { buildBeltLayout, fitLoopModel, SHAFT_RADIUS_MM, type BeltLayout, type Body, type LayoutInput, type LoopModel } from './beltLayout';
import { requireNumber } from './errors';
import type { InputIssue } from './errors';

/** The design data travel depends on: the layout's inputs plus the clearance at each end stop. */
export interface TravelInput extends LayoutInput {
  frame: LayoutInput['frame'] & { clearanceMm: number };
}

/** Usable travel and where it starts, in frame coordinates. */
export interface TravelInfo {
  /** Usable carriage travel along X and Y [mm] (≤ 0 when the frame is too small). */
  xMm: number;
  yMm: number;
  /** Carriage centre at travel position (0, 0), in frame coordinates from the frame's outer front-left corner [mm]. */
  originXMm: number;
  originYMm: number;
  /** What stops the carriage at each end, for the sheet. */
  limitedBy: { xLow: string; xHigh: string; yLow: string; yHigh: string };
  /** False when the pulleys do not fit the frame at all (the layout turns inside out at mid-frame). */
  sound: boolean;
  /** Layout and its affine models at mid-frame, reused by the evaluator. */
  layout: BeltLayout;
  models: LoopModel[];
}

/** A flat-loop pulley with its flanged radius, for the clearance rules of {@link frameToTravel}. */
interface Disc {
  label: string;
  level: number;
  body: Body;
  xMm: number;
  yMm: number;
  radiusMm: number;
}

function flatDiscs(layout: BeltLayout): Disc[] {
  const out: Disc[] = [];
  for (const loop of layout.loops) {
    if (loop.plane.kind !== 'flat') continue;
    for (const e of loop.elements) {
      if (e.kind === 'clamp') continue;
      out.push({ label: e.label, level: e.level, body: e.body, xMm: e.baseXMm, yMm: e.baseYMm, radiusMm: e.radiusMm });
    }
  }
  return out;
}

/**
 * Usable travel from the frame: the carriage centre may move while (1) the carriage keeps the clearance from the
 * frame's inner faces, (2) the gantry (depth = the larger of gantry beam and carriage depth) does the same in Y,
 * (3) every belt span that changes with position stays at least one clearance long, so no clamp or gantry
 * pulley runs into another pulley along its belt, (4) every pulley riding the gantry keeps the clearance from every
 * frame pulley — flange to flange on its own level, its bolt outside the other's flange on the other level — and
 * (5) the carriage body keeps the clearance from every pulley's flange (its clamps sit at the belt levels). Spans
 * are affine in position and the pairs of (4) and (5) keep a fixed offset across the motion, so each rule is one
 * interval and travel is their intersection (docs/models/belt-layout.md "Travel").
 * @param d - mechanism, frame [mm], belt pitch and width [mm], pulley teeth, Y motor count
 * @returns travel [mm] along X and Y with its origin and the limiting rule at each end
 */
export function frameToTravel(d: TravelInput): TravelInfo {
  const W = d.frame.outerXMm;
  const D = d.frame.outerYMm;
  const e = d.frame.extrusionMm;
  const c = d.frame.clearanceMm;
  const cx = d.frame.carriageXMm;
  const cy = d.frame.carriageYMm;
  const hy = Math.max(cy, d.frame.gantryYMm);
  const layout = buildBeltLayout(d);
  const m = layout.flangeMm;
  let xLo = e + c + cx / 2;
  let xHi = W - e - c - cx / 2;
  let yLo = e + c + hy / 2;
  let yHi = D - e - c - hy / 2;
  const limitedBy = {
    xLow: 'carriage at the frame',
    xHigh: 'carriage at the frame',
    yLow: 'gantry at the frame',
    yHigh: 'gantry at the frame',
  };
  const models: LoopModel[] = [];
  let sound = true;
  for (const loop of layout.loops) {
    const fit = fitLoopModel(loop, W / 2, D / 2);
    models.push(fit.model);
    sound = sound && fit.sound;
    for (const s of fit.model.spans) {
      const what = `span ${s.from} – ${s.to}`;
      // Spans that depend on both coordinates do not occur in these layouts; they would need a polygon, not a box.
      if (s.gx !== 0 && s.gy === 0) {
        const bound = (c - s.l0Mm) / s.gx;
        if (s.gx > 0 && bound > xLo) [xLo, limitedBy.xLow] = [bound, what];
        if (s.gx < 0 && bound < xHi) [xHi, limitedBy.xHigh] = [bound, what];
      } else if (s.gy !== 0 && s.gx === 0) {
        const bound = (c - s.l0Mm) / s.gy;
        if (s.gy > 0 && bound > yLo) [yLo, limitedBy.yLow] = [bound, what];
        if (s.gy < 0 && bound < yHi) [yHi, limitedBy.yHigh] = [bound, what];
      }
    }
  }
  const discs = flatDiscs(layout);
  const gantry = discs.filter((p) => p.body === 'gantry');
  // (4) A gantry pulley keeps its X offset from a frame pulley: the pair forbids one band of the gantry's Y.
  for (const g of gantry) {
    for (const f of discs.filter((p) => p.body === 'frame')) {
      const need = (g.level === f.level ? g.radiusMm + f.radiusMm + 2 * m : Math.max(g.radiusMm, f.radiusMm) + m + SHAFT_RADIUS_MM) + c;
      const dx = g.xMm - f.xMm;
      if (Math.abs(dx) >= need) continue;
      const h = Math.sqrt(need * need - dx * dx);
      const at = f.yMm - g.yMm;
      const what = `${g.label} at ${f.label}`;
      if (at > D / 2 && at - h < yHi) [yHi, limitedBy.yHigh] = [at - h, what];
      if (at <= D / 2 && at + h > yLo) [yLo, limitedBy.yLow] = [at + h, what];
    }
  }
  // (5) The carriage keeps its Y offset from a gantry pulley: the pair forbids one band of the carriage's X.
  for (const g of gantry) {
    const reach = g.radiusMm + m + c;
    const ey = Math.max(0, Math.abs(g.yMm) - cy / 2);
    if (ey >= reach) continue;
    const h = Math.sqrt(reach * reach - ey * ey) + cx / 2;
    const what = `carriage at ${g.label}`;
    if (g.xMm > W / 2 && g.xMm - h < xHi) [xHi, limitedBy.xHigh] = [g.xMm - h, what];
    if (g.xMm <= W / 2 && g.xMm + h > xLo) [xLo, limitedBy.xLow] = [g.xMm + h, what];
  }
  // (5) A frame pulley inside the band the carriage sweeps over its X travel limits the carriage's Y instead
  // (a box test: conservative, and it only bites when a pulley reaches far into the frame).
  for (const f of discs.filter((p) => p.body === 'frame')) {
    const reach = f.radiusMm + m + c;
    if (f.xMm + reach <= xLo - cx / 2 || f.xMm - reach >= xHi + cx / 2) continue;
    const what = `carriage at ${f.label}`;
    if (f.yMm > D / 2 && f.yMm - reach - cy / 2 < yHi) [yHi, limitedBy.yHigh] = [f.yMm - reach - cy / 2, what];
    if (f.yMm <= D / 2 && f.yMm + reach + cy / 2 > yLo) [yLo, limitedBy.yLow] = [f.yMm + reach + cy / 2, what];
  }
  return { xMm: xHi - xLo, yMm: yHi - yLo, originXMm: xLo, originYMm: yLo, limitedBy, sound, layout, models };
}

/**
 * Frame outer size needed for a wanted travel. Every travel limit moves one-for-one with the outer size (the
 * right and back pulleys and faces sit at W − const, D − const), so the travel at a roomy reference frame gives
 * the constant exactly.
 * @param args.design - mechanism, frame (outer sizes ignored) [mm], belt pitch [mm], pulley teeth, Y motor count
 * @param args.travelXMm - wanted carriage travel along X [mm]
 * @param args.travelYMm - wanted carriage travel along Y [mm]
 * @returns outer frame size [mm]
 */
export function travelToFrame(args: { design: TravelInput; travelXMm: number; travelYMm: number }): { outerXMm: number; outerYMm: number } {
  const tx = requireNumber('travelToFrame', 'travelXMm', args?.travelXMm, 0, Infinity, true);
  const ty = requireNumber('travelToFrame', 'travelYMm', args?.travelYMm, 0, Infinity, true);
  const d = args.design;
  const ref = 4 * (d.frame.extrusionMm + d.frame.clearanceMm + d.frame.carriageXMm + d.frame.carriageYMm + d.frame.gantryYMm) + 2000;
  const t = frameToTravel({ ...d, frame: { ...d.frame, outerXMm: ref, outerYMm: ref } });
  return { outerXMm: tx + (ref - t.xMm), outerYMm: ty + (ref - t.yMm) };
}

/**
 * Cross-field rule of the schema: the frame must leave positive travel in X and Y for the chosen layout. Takes the
 * travel already worked out, so that an evaluation builds the belt layout once.
 * @param d - a structurally valid design
 * @param t - frameToTravel(d)
 * @returns issues at frame.outerXMm / frame.outerYMm (empty when travel is positive)
 */
export function travelIssues(d: TravelInput, t: TravelInfo): InputIssue[] {
  const issues: InputIssue[] = [];
  if (!t.sound || !(t.xMm > 0) || !(t.yMm > 0)) {
    const need = travelToFrame({ design: d, travelXMm: 1, travelYMm: 1 });
    if (!t.sound || !(t.xMm > 0)) {
      issues.push({
        path: 'frame.outerXMm',
        message: `the frame leaves no X travel for the carriage, clearances and pulleys: it must be larger than ${Math.ceil(need.outerXMm - 1)} mm`,
      });
    }
    if (!t.sound || !(t.yMm > 0)) {
      issues.push({
        path: 'frame.outerYMm',
        message: `the frame leaves no Y travel for the gantry, clearances and pulleys: it must be larger than ${Math.ceil(need.outerYMm - 1)} mm`,
      });
    }
  }
  return issues;
}
