import { solveBeltPath, type PathElement, type SolvedPath } from './beltPath';
import type { Mechanism } from './types';

/** Body a pulley or clamp rides on. */
export type Body = 'frame' | 'gantry' | 'carriage';

/** What an element of a belt path is. */
export type ElementKind = 'drive' | 'idler' | 'clamp';

/** Motor variable of the stiffness model: 'B2' is the second synchronised Y motor of a cartesian stage. */
export type MotorVar = 'A' | 'B' | 'B2';

/** One pulley or clamp of a loop, placed relative to the body it rides. */
export interface LayoutElement {
  /** Unique id within the layout, e.g. "A.motor", "A.gantryRight". */
  id: string;
  /** Plain-words name for the sheet and the drawing. */
  label: string;
  kind: ElementKind;
  body: Body;
  /**
   * Position on its body [mm]: frame → absolute plan coordinates; gantry → absolute X, Y relative to the gantry
   * belt line (the carriage centre line); carriage → relative to the carriage centre.
   */
  baseXMm: number;
  baseYMm: number;
  /** Pitch radius [mm]; 0 for a clamp. */
  radiusMm: number;
  /** Tooth count (0 for a clamp; a smooth idler keeps the idler size of the design). */
  teeth: number;
  /** +1 belt runs counter-clockwise round it, −1 clockwise. */
  sense: 1 | -1;
  /** Motor variable of a drive pulley. */
  motor?: MotorVar;
  /** Wrap the layout is drawn for; used to tell a sound geometry from one turned inside out by a tiny frame. */
  expectedWrapRad?: number;
}

/** One belt (a cut length clamped at both ends) and the pulleys it passes, in belt order. */
export interface LayoutLoop {
  /** "A", "B", "H", "X", "YL", "YR". */
  id: string;
  label: string;
  /** Elements from the first clamp to the last. */
  elements: LayoutElement[];
  /** Share of this belt's mass each motor coordinate carries (engine.md §4: the loop's mass adds to its motor). */
  massShare: { a: number; b: number };
}

/** A mechanism's belt layout derived from the frame. */
export interface BeltLayout {
  mechanism: Mechanism;
  loops: LayoutLoop[];
  /** Frame outer size and profile [mm]. */
  outerXMm: number;
  outerYMm: number;
  extrusionMm: number;
  /** Motor variables of the stiffness model and the motor coordinate (0 = A, 1 = B) each drives. */
  motorVars: { id: MotorVar; coordinate: 0 | 1 }[];
}

/** The design data the layout needs. */
export interface LayoutInput {
  mechanism: Mechanism;
  yMotors: 1 | 2;
  frame: { outerXMm: number; outerYMm: number; extrusionMm: number; carriageXMm: number; carriageYMm: number; gantryYMm: number };
  belt: { pitchMm: number };
  pulley: { driveTeeth: number; idlerTeeth: number };
}

const HALF_PI = Math.PI / 2;

function mirrorLoop(
  loop: LayoutLoop,
  outerXMm: number,
  id: string,
  label: string,
  rename: Record<string, string>,
  motor: MotorVar,
): LayoutLoop {
  return {
    id,
    label,
    massShare: loop.massShare,
    elements: loop.elements.map((e) => ({
      ...e,
      id: `${id}.${rename[e.id.split('.')[1]] ?? e.id.split('.')[1]}`,
      label: rename[`label:${e.label}`] ?? e.label,
      baseXMm: e.body === 'carriage' ? -e.baseXMm : outerXMm - e.baseXMm,
      sense: (e.sense === 1 ? -1 : 1) as 1 | -1,
      motor: e.motor ? motor : undefined,
    })),
  };
}

/**
 * Places every pulley, idler and clamp of a mechanism's belt layout from the frame (see src/engine/README.md
 * "Layouts"). Belt lines run along the inside faces of the frame and along the gantry's centre line, and each
 * pulley is offset from its belt lines by its own pitch radius, so every span is parallel to an axis and every
 * wrap is a quarter or half turn: span lengths are then exactly affine in the carriage position.
 * @param d - mechanism, Y motor count, frame [mm], belt pitch [mm], pulley teeth
 * @returns the layout
 */
export function buildBeltLayout(d: LayoutInput): BeltLayout {
  const W = d.frame.outerXMm;
  const D = d.frame.outerYMm;
  const e = d.frame.extrusionMm;
  const p = d.belt.pitchMm;
  const zD = d.pulley.driveTeeth;
  const zI = d.pulley.idlerTeeth;
  const rD = (zD * p) / (2 * Math.PI);
  const rI = (zI * p) / (2 * Math.PI);
  const cx = d.frame.carriageXMm;
  const gy = d.frame.gantryYMm;
  const xl = e;
  const xr = W - e;
  const yf = e;
  const yb = D - e;
  const base = { outerXMm: W, outerYMm: D, extrusionMm: e, mechanism: d.mechanism };

  if (d.mechanism === 'corexy') {
    // Loop A: motor in the back-right corner; the belt leaves the carriage to the right, climbs the right side
    // to the motor, runs along the back, down the whole left side, turns round a front-left idler and comes
    // back up to the gantry's left end. Loop B is its mirror image on another belt level.
    const a: LayoutLoop = {
      id: 'A',
      label: 'belt A',
      massShare: { a: 1, b: 0 },
      elements: [
        {
          id: 'A.clampRight',
          label: 'carriage clamp, right',
          kind: 'clamp',
          body: 'carriage',
          baseXMm: cx / 2,
          baseYMm: 0,
          radiusMm: 0,
          teeth: 0,
          sense: 1,
        },
        {
          id: 'A.gantryRight',
          label: 'gantry idler, right end',
          kind: 'idler',
          body: 'gantry',
          baseXMm: xr - rI,
          baseYMm: rI,
          radiusMm: rI,
          teeth: zI,
          sense: 1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'A.motor',
          label: 'motor A pulley, back-right corner',
          kind: 'drive',
          body: 'frame',
          baseXMm: xr - rD,
          baseYMm: yb - rD,
          radiusMm: rD,
          teeth: zD,
          sense: 1,
          motor: 'A',
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'A.backLeft',
          label: 'idler, back-left corner',
          kind: 'idler',
          body: 'frame',
          baseXMm: xl + rI,
          baseYMm: yb - rI,
          radiusMm: rI,
          teeth: zI,
          sense: 1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'A.frontLeft',
          label: 'idler, front-left corner',
          kind: 'idler',
          body: 'frame',
          baseXMm: xl + rI,
          baseYMm: yf + rI,
          radiusMm: rI,
          teeth: zI,
          sense: 1,
          expectedWrapRad: Math.PI,
        },
        {
          id: 'A.gantryLeft',
          label: 'gantry idler, left end',
          kind: 'idler',
          body: 'gantry',
          baseXMm: xl + 3 * rI,
          baseYMm: -rI,
          radiusMm: rI,
          teeth: zI,
          sense: -1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'A.clampLeft',
          label: 'carriage clamp, left',
          kind: 'clamp',
          body: 'carriage',
          baseXMm: -cx / 2,
          baseYMm: 0,
          radiusMm: 0,
          teeth: 0,
          sense: 1,
        },
      ],
    };
    const b = mirrorLoop(
      a,
      W,
      'B',
      'belt B',
      {
        clampRight: 'clampLeft',
        clampLeft: 'clampRight',
        gantryRight: 'gantryLeft',
        gantryLeft: 'gantryRight',
        backLeft: 'backRight',
        frontLeft: 'frontRight',
        'label:carriage clamp, right': 'carriage clamp, left',
        'label:carriage clamp, left': 'carriage clamp, right',
        'label:gantry idler, right end': 'gantry idler, left end',
        'label:gantry idler, left end': 'gantry idler, right end',
        'label:motor A pulley, back-right corner': 'motor B pulley, back-left corner',
        'label:idler, back-left corner': 'idler, back-right corner',
        'label:idler, front-left corner': 'idler, front-right corner',
      },
      'B',
    );
    b.massShare = { a: 0, b: 1 };
    return {
      ...base,
      loops: [a, b],
      motorVars: [
        { id: 'A', coordinate: 0 },
        { id: 'B', coordinate: 1 },
      ],
    };
  }

  if (d.mechanism === 'hbot') {
    // One belt: carriage → right gantry end → down to a front-right idler → up the whole right side to motor B
    // (back-right) → back down to the gantry's right end → along the gantry to its left end → up to motor A
    // (back-left) → down the whole left side to a front-left idler → up to the gantry's left end → carriage.
    // The runs along the gantry pull its two ends unequally: that is the racking moment.
    const r2 = xr;
    const r1 = r2 - 2 * rI;
    const r3 = r2 - 2 * rD;
    const l2 = xl;
    const l1 = l2 + 2 * rD;
    const l3 = l2 + 2 * rI;
    const h: LayoutLoop = {
      id: 'H',
      label: 'belt H',
      massShare: { a: 0.5, b: 0.5 },
      elements: [
        {
          id: 'H.clampRight',
          label: 'carriage clamp, right',
          kind: 'clamp',
          body: 'carriage',
          baseXMm: cx / 2,
          baseYMm: 0,
          radiusMm: 0,
          teeth: 0,
          sense: 1,
        },
        {
          id: 'H.gantryRightFront',
          label: 'gantry idler, right end, front',
          kind: 'idler',
          body: 'gantry',
          baseXMm: r1 - rI,
          baseYMm: -rI,
          radiusMm: rI,
          teeth: zI,
          sense: -1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'H.frontRight',
          label: 'idler, front-right corner',
          kind: 'idler',
          body: 'frame',
          baseXMm: r1 + rI,
          baseYMm: yf + rI,
          radiusMm: rI,
          teeth: zI,
          sense: 1,
          expectedWrapRad: Math.PI,
        },
        {
          id: 'H.motorB',
          label: 'motor B pulley, back-right corner',
          kind: 'drive',
          body: 'frame',
          baseXMm: r2 - rD,
          baseYMm: yb - rD,
          radiusMm: rD,
          teeth: zD,
          sense: 1,
          motor: 'B',
          expectedWrapRad: Math.PI,
        },
        {
          id: 'H.gantryRightBack',
          label: 'gantry idler, right end, back',
          kind: 'idler',
          body: 'gantry',
          baseXMm: r3 - rI,
          baseYMm: rI,
          radiusMm: rI,
          teeth: zI,
          sense: -1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'H.gantryLeftBack',
          label: 'gantry idler, left end, back',
          kind: 'idler',
          body: 'gantry',
          baseXMm: l1 + rI,
          baseYMm: rI,
          radiusMm: rI,
          teeth: zI,
          sense: -1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'H.motorA',
          label: 'motor A pulley, back-left corner',
          kind: 'drive',
          body: 'frame',
          baseXMm: l2 + rD,
          baseYMm: yb - rD,
          radiusMm: rD,
          teeth: zD,
          sense: 1,
          motor: 'A',
          expectedWrapRad: Math.PI,
        },
        {
          id: 'H.frontLeft',
          label: 'idler, front-left corner',
          kind: 'idler',
          body: 'frame',
          baseXMm: l2 + rI,
          baseYMm: yf + rI,
          radiusMm: rI,
          teeth: zI,
          sense: 1,
          expectedWrapRad: Math.PI,
        },
        {
          id: 'H.gantryLeftFront',
          label: 'gantry idler, left end, front',
          kind: 'idler',
          body: 'gantry',
          baseXMm: l3 + rI,
          baseYMm: -rI,
          radiusMm: rI,
          teeth: zI,
          sense: -1,
          expectedWrapRad: HALF_PI,
        },
        {
          id: 'H.clampLeft',
          label: 'carriage clamp, left',
          kind: 'clamp',
          body: 'carriage',
          baseXMm: -cx / 2,
          baseYMm: 0,
          radiusMm: 0,
          teeth: 0,
          sense: 1,
        },
      ],
    };
    return {
      ...base,
      loops: [h],
      motorVars: [
        { id: 'A', coordinate: 0 },
        { id: 'B', coordinate: 1 },
      ],
    };
  }

  // Cartesian: the X motor and its idler ride the gantry ends; the Y belts run along both frame sides from a
  // back drive pulley to a front idler and are clamped to the gantry's back and front faces. One Y motor turns
  // both back pulleys through a cross shaft, or each side has its own synchronised motor.
  const x: LayoutLoop = {
    id: 'X',
    label: 'belt X',
    massShare: { a: 1, b: 0 },
    elements: [
      {
        id: 'X.clampRight',
        label: 'carriage clamp, right',
        kind: 'clamp',
        body: 'carriage',
        baseXMm: cx / 2,
        baseYMm: 0,
        radiusMm: 0,
        teeth: 0,
        sense: 1,
      },
      {
        id: 'X.idler',
        label: 'X idler, gantry right end',
        kind: 'idler',
        body: 'gantry',
        baseXMm: xr - rI,
        baseYMm: rI,
        radiusMm: rI,
        teeth: zI,
        sense: 1,
        expectedWrapRad: Math.PI,
      },
      {
        id: 'X.motor',
        label: 'motor X pulley, gantry left end',
        kind: 'drive',
        body: 'gantry',
        baseXMm: xl + rD,
        baseYMm: rD,
        radiusMm: rD,
        teeth: zD,
        sense: 1,
        motor: 'A',
        expectedWrapRad: Math.PI,
      },
      {
        id: 'X.clampLeft',
        label: 'carriage clamp, left',
        kind: 'clamp',
        body: 'carriage',
        baseXMm: -cx / 2,
        baseYMm: 0,
        radiusMm: 0,
        teeth: 0,
        sense: 1,
      },
    ],
  };
  const xs = xl + 2 * rD;
  const yl: LayoutLoop = {
    id: 'YL',
    label: 'belt Y, left side',
    massShare: { a: 0, b: 1 },
    elements: [
      {
        id: 'YL.clampBack',
        label: 'gantry clamp, left end, back face',
        kind: 'clamp',
        body: 'gantry',
        baseXMm: xs,
        baseYMm: gy / 2,
        radiusMm: 0,
        teeth: 0,
        sense: 1,
      },
      {
        id: 'YL.drive',
        label: 'Y drive pulley, back-left corner',
        kind: 'drive',
        body: 'frame',
        baseXMm: xl + rD,
        baseYMm: yb - rD,
        radiusMm: rD,
        teeth: zD,
        sense: 1,
        motor: 'B',
        expectedWrapRad: Math.PI,
      },
      {
        id: 'YL.idler',
        label: 'Y idler, front-left corner',
        kind: 'idler',
        body: 'frame',
        baseXMm: xl + rI,
        baseYMm: yf + rI,
        radiusMm: rI,
        teeth: zI,
        sense: 1,
        expectedWrapRad: Math.PI,
      },
      {
        id: 'YL.clampFront',
        label: 'gantry clamp, left end, front face',
        kind: 'clamp',
        body: 'gantry',
        baseXMm: xl + 2 * rI,
        baseYMm: -gy / 2,
        radiusMm: 0,
        teeth: 0,
        sense: 1,
      },
    ],
  };
  const yr = mirrorLoop(
    yl,
    W,
    'YR',
    'belt Y, right side',
    {
      'label:gantry clamp, left end, back face': 'gantry clamp, right end, back face',
      'label:Y drive pulley, back-left corner': 'Y drive pulley, back-right corner',
      'label:Y idler, front-left corner': 'Y idler, front-right corner',
      'label:gantry clamp, left end, front face': 'gantry clamp, right end, front face',
    },
    d.yMotors === 2 ? 'B2' : 'B',
  );
  const motorVars: BeltLayout['motorVars'] = [
    { id: 'A', coordinate: 0 },
    { id: 'B', coordinate: 1 },
  ];
  if (d.yMotors === 2) motorVars.push({ id: 'B2', coordinate: 1 });
  return { ...base, loops: [x, yl, yr], motorVars };
}

/**
 * Plan position of a layout element for a carriage centre at (cxc, cyc) in frame coordinates.
 * @param el - layout element
 * @param cxcMm - carriage centre X in frame coordinates [mm]
 * @param cycMm - carriage (and gantry belt line) centre Y in frame coordinates [mm]
 * @returns element centre [mm]
 */
export function elementPosition(el: LayoutElement, cxcMm: number, cycMm: number): { xMm: number; yMm: number } {
  if (el.body === 'frame') return { xMm: el.baseXMm, yMm: el.baseYMm };
  if (el.body === 'gantry') return { xMm: el.baseXMm, yMm: el.baseYMm + cycMm };
  return { xMm: el.baseXMm + cxcMm, yMm: el.baseYMm + cycMm };
}

/** The belt between two load-bearing nodes (a clamp or a drive pulley): it acts as one spring EA/L. */
export interface LoopPiece {
  /** Element id the piece starts at. */
  from: string;
  /** Element id the piece ends at. */
  to: string;
  /** Spans plus idler arcs [mm]; the drive pulleys' arcs belong to no piece (the teeth hold the belt there). */
  lengthMm: number;
}

/** A loop solved at one carriage position. */
export interface LoopState {
  path: SolvedPath;
  pieces: LoopPiece[];
  /** Motor variable at each interior node between consecutive pieces (length pieces − 1). */
  nodeMotors: MotorVar[];
  /** Positions of the elements [mm]. */
  positions: { id: string; xMm: number; yMm: number }[];
  /** True when every wrap matches the layout's intent (the geometry is not turned inside out). */
  sound: boolean;
}

/**
 * Solves one loop at a carriage position: spans, wraps, total length and the pieces between load-bearing nodes.
 * @param loop - layout loop
 * @param cxcMm - carriage centre X in frame coordinates [mm]
 * @param cycMm - carriage centre Y in frame coordinates [mm]
 * @returns the loop state
 */
export function solveLoop(loop: LayoutLoop, cxcMm: number, cycMm: number): LoopState {
  const positions = loop.elements.map((el) => ({ id: el.id, ...elementPosition(el, cxcMm, cycMm) }));
  const pe: PathElement[] = loop.elements.map((el, i) => ({
    id: el.id,
    xMm: positions[i].xMm,
    yMm: positions[i].yMm,
    radiusMm: el.radiusMm,
    sense: el.sense,
  }));
  const path = solveBeltPath(pe);
  const pieces: LoopPiece[] = [];
  const nodeMotors: MotorVar[] = [];
  let start = 0;
  let acc = 0;
  let sound = path.valid;
  for (let i = 0; i < loop.elements.length - 1; i++) {
    acc += path.spans[i].lengthMm;
    const next = loop.elements[i + 1];
    const isLast = i + 1 === loop.elements.length - 1;
    if (next.kind === 'drive' || isLast) {
      pieces.push({ from: loop.elements[start].id, to: next.id, lengthMm: acc });
      if (!isLast) nodeMotors.push(next.motor as MotorVar);
      start = i + 1;
      acc = 0;
    } else {
      acc += path.wraps[i].arcMm;
    }
  }
  for (let i = 1; i < loop.elements.length - 1; i++) {
    const exp = loop.elements[i].expectedWrapRad;
    if (exp !== undefined && Math.abs(path.wraps[i - 1].wrapRad - exp) > 0.35) sound = false;
  }
  for (const s of path.spans) if (!(s.lengthMm >= 0)) sound = false;
  return { path, pieces, nodeMotors, positions, sound };
}

/** Affine model of a loop's piece lengths over the carriage position: L = L0 + gx·cxc + gy·cyc. */
export interface LoopModel {
  loopId: string;
  /** Piece lengths at cxc = cyc = 0 (extrapolated) [mm] and their slopes [mm/mm]. */
  pieces: { from: string; to: string; l0Mm: number; gx: number; gy: number }[];
  nodeMotors: MotorVar[];
  /** Span lengths as affine functions, for the travel limits. */
  spans: { from: string; to: string; l0Mm: number; gx: number; gy: number }[];
}

/**
 * Fits the affine model of a loop's piece and span lengths from three solutions around (cxc, cyc). Exact for
 * the axis-parallel layouts of {@link buildBeltLayout}; the evaluator checks it at a far corner.
 * @param loop - layout loop
 * @param cxcMm - reference carriage centre X [mm]
 * @param cycMm - reference carriage centre Y [mm]
 * @returns the affine model and whether the reference geometry is sound
 */
export function fitLoopModel(loop: LayoutLoop, cxcMm: number, cycMm: number): { model: LoopModel; sound: boolean } {
  const s0 = solveLoop(loop, cxcMm, cycMm);
  const sx = solveLoop(loop, cxcMm + 1, cycMm);
  const sy = solveLoop(loop, cxcMm, cycMm + 1);
  const fit = (a: number, bx: number, by: number) => {
    const gx = bx - a;
    const gyv = by - a;
    // Snap slopes to the exact small integers they are, so that round-off does not leak into symmetry tests.
    const snap = (g: number) => (Math.abs(g - Math.round(g)) < 1e-7 ? Math.round(g) : g);
    const gxs = snap(gx);
    const gys = snap(gyv);
    return { l0Mm: a - gxs * cxcMm - gys * cycMm, gx: gxs, gy: gys };
  };
  const model: LoopModel = {
    loopId: loop.id,
    pieces: s0.pieces.map((pc, i) => ({ from: pc.from, to: pc.to, ...fit(pc.lengthMm, sx.pieces[i].lengthMm, sy.pieces[i].lengthMm) })),
    nodeMotors: s0.nodeMotors,
    spans: s0.path.spans.map((sp, i) => ({
      from: sp.from,
      to: sp.to,
      ...fit(sp.lengthMm, sx.path.spans[i].lengthMm, sy.path.spans[i].lengthMm),
    })),
  };
  return { model, sound: s0.sound && sx.sound && sy.sound };
}
