import { solveBeltPath, type PathElement, type SolvedPath } from './beltPath';
import type { Mechanism } from './types';

/** Body a pulley or clamp rides on. */
export type Body = 'frame' | 'gantry' | 'carriage';

/** What an element of a belt path is. */
export type ElementKind = 'drive' | 'idler' | 'clamp';

/** Motor variable of the stiffness model: 'B2' is the second synchronised Y motor of a cartesian stage. */
export type MotorVar = 'A' | 'B' | 'B2';

/**
 * Belt level: 1 is the lower, 2 the upper. Crossed belts use both (one belt each); the H belt uses level 1; on a
 * cartesian stage the Y loops are level 1 (frame sides) and the X loop level 2 (on top of the gantry).
 */
export type BeltLevel = 1 | 2;

/**
 * Flange and running allowance outside a pulley's pitch circle, in belt pitches (from memory, common practice: a
 * 20-tooth idler for 2 mm pitch belt has a flange about 18 mm across, 2.6 mm outside its 12.7 mm pitch circle).
 * Pulleys on one level keep their flanges apart, and a passing belt keeps this much from a body it passes.
 */
export const FLANGE_PITCHES = 1.25;

/** Radius of an idler bolt or a motor shaft [mm] (5 mm shafts and M5 bolts, common practice). */
export const SHAFT_RADIUS_MM = 2.5;

/**
 * Flange allowance outside the pitch circle [mm].
 * @param pitchMm - belt pitch [mm]
 * @returns allowance [mm]
 */
export function flangeMarginMm(pitchMm: number): number {
  return FLANGE_PITCHES * pitchMm;
}

const LEVEL_WORDS: Record<Mechanism, Record<BeltLevel, string>> = {
  corexy: { 1: 'lower level', 2: 'upper level' },
  hbot: { 1: 'belt level', 2: 'upper level' },
  cartesian: { 1: 'frame-side level', 2: 'gantry level' },
};

/**
 * Plain words for a belt level of a mechanism (docs/models/belt-layout.md "Levels").
 * @param mechanism - mechanism key
 * @param level - belt level
 * @returns e.g. "lower level"
 */
export function levelName(mechanism: Mechanism, level: BeltLevel): string {
  return LEVEL_WORDS[mechanism][level];
}

/** One pulley or clamp of a loop, placed relative to the body it rides. */
export interface LayoutElement {
  /** Unique id within the layout, e.g. "A.motor", "A.gantryRight". */
  id: string;
  /** Short name on the drawings and in the span table, e.g. "A2" (belt, then place in belt order); "" for a clamp. */
  tag: string;
  /** Plain-words name for the sheet and the drawing, starting with the tag, e.g. "A2 motor A pulley, back-right corner". */
  label: string;
  kind: ElementKind;
  body: Body;
  /**
   * Position on its body [mm]: frame → absolute plan coordinates; gantry → absolute X, Y relative to the gantry
   * belt line (the carriage centre line); carriage → relative to the carriage centre. In an upright loop one of the
   * two is a height (see {@link LoopPlane}).
   */
  baseXMm: number;
  baseYMm: number;
  /** Pitch radius [mm]; 0 for a clamp. */
  radiusMm: number;
  /** Tooth count (0 for a clamp; a smooth idler keeps the idler size of the design). */
  teeth: number;
  /** +1 belt runs counter-clockwise round it, −1 clockwise. */
  sense: 1 | -1;
  /** Belt level the element sits on (its belt's level). */
  level: BeltLevel;
  /** Idlers of different belts stacked on one bolt share this id (each on its own bearings). */
  stackId?: string;
  /** Motor variable of a drive pulley. */
  motor?: MotorVar;
  /** Wrap the layout is drawn for; used to tell a sound geometry from one turned inside out by a tiny frame. */
  expectedWrapRad?: number;
}

/**
 * How a loop lies. 'flat': in a horizontal belt level, pulley axes vertical, the path is drawn in plan as solved.
 * 'upright': in a vertical plane, pulley axes horizontal (the cartesian Y loops on their cross shaft and the X loop
 * on the gantry); the solver's across coordinate is then a height z = sign·(across − zeroMm) above the lower run,
 * and in plan the loop is one line at `atMm` (frame X for loops along Y; offset behind the gantry centre line for
 * a loop along X on the gantry).
 */
export type LoopPlane = { kind: 'flat' } | { kind: 'upright'; runsAlong: 'x' | 'y'; atMm: number; zeroMm: number; sign: 1 | -1 };

/** One belt (a cut length clamped at both ends) and the pulleys it passes, in belt order. */
export interface LayoutLoop {
  /** "A", "B", "H", "X", "YL", "YR". */
  id: string;
  label: string;
  level: BeltLevel;
  plane: LoopPlane;
  /** Elements from the first clamp to the last. */
  elements: LayoutElement[];
  /** Share of this belt's mass each motor coordinate carries (docs/models/belt-layout.md: a loop's mass adds to its motor). */
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
  /** Flange allowance outside each pitch circle [mm] ({@link flangeMarginMm}). */
  flangeMm: number;
  /** Motor variables of the stiffness model and the motor coordinate (0 = A, 1 = B) each drives. */
  motorVars: { id: MotorVar; coordinate: 0 | 1 }[];
}

/** The design data the layout needs. */
export interface LayoutInput {
  mechanism: Mechanism;
  yMotors: 1 | 2;
  frame: { outerXMm: number; outerYMm: number; extrusionMm: number; carriageXMm: number; carriageYMm: number; gantryYMm: number };
  belt: { pitchMm: number; widthMm: number };
  pulley: { driveTeeth: number; idlerTeeth: number };
}

const HALF_PI = Math.PI / 2;

type Spec = Omit<LayoutElement, 'label' | 'level'> & { what: string };

function clamp(id: string, what: string, body: Body, x: number, y: number): Spec {
  return { id, tag: '', what, kind: 'clamp', body, baseXMm: x, baseYMm: y, radiusMm: 0, teeth: 0, sense: 1 };
}

function loopOf(
  id: string,
  label: string,
  level: BeltLevel,
  plane: LoopPlane,
  massShare: LayoutLoop['massShare'],
  specs: Spec[],
): LayoutLoop {
  return {
    id,
    label,
    level,
    plane,
    massShare,
    elements: specs.map(({ what, ...e }) => ({ ...e, level, label: e.tag ? `${e.tag} ${what}` : what })),
  };
}

/**
 * Mirror image of a loop about the frame's vertical centre line, on another level: ids, tags and words renamed,
 * senses flipped.
 */
function mirrorLoop(
  loop: LayoutLoop,
  outerXMm: number,
  to: { id: string; label: string; level: BeltLevel; plane: LoopPlane; motor: MotorVar },
  rename: Record<string, string>,
): LayoutLoop {
  const swap = (s: string) => s.replace(/\b(left|right)\b/g, (w) => (w === 'left' ? 'right' : 'left'));
  return {
    id: to.id,
    label: to.label,
    level: to.level,
    plane: to.plane,
    massShare: loop.massShare,
    elements: loop.elements.map((e) => {
      const local = e.id.split('.')[1];
      const tag = e.tag ? `${to.id}${e.tag.slice(loop.id.length)}` : '';
      const words = (e.tag ? e.label.slice(e.tag.length + 1) : e.label).replace(`motor ${loop.id}`, `motor ${to.id}`);
      return {
        ...e,
        id: `${to.id}.${rename[local] ?? local}`,
        tag,
        label: tag ? `${tag} ${swap(words)}` : swap(words),
        level: to.level,
        baseXMm: e.body === 'carriage' ? -e.baseXMm : outerXMm - e.baseXMm,
        sense: (e.sense === 1 ? -1 : 1) as 1 | -1,
        motor: e.motor ? to.motor : undefined,
      };
    }),
  };
}

const LEFT_RIGHT = {
  clampRight: 'clampLeft',
  clampLeft: 'clampRight',
  gantryRight: 'gantryLeft',
  gantryLeft: 'gantryRight',
  frontLeft: 'frontRight',
  frontRight: 'frontLeft',
};

/**
 * Crossed belts (docs/models/belt-layout.md "Crossed belts"). Belt A on level 1, belt B its mirror image on
 * level 2. Each motor sits alone in its back corner and the belt wraps it half a turn; the two front corners
 * each carry one idler per level stacked on one bolt; each gantry end carries one toothed idler (turning the
 * belt toward the front) and one smooth idler (taking the return run from the motor) on different levels.
 */
function crossedLoops(g: Geometry): LayoutLoop[] {
  const { xl, xr, yf, yb, r, R, zI, zD, cx } = g;
  const a = loopOf('A', 'belt A', 1, { kind: 'flat' }, { a: 1, b: 0 }, [
    clamp('A.clampRight', 'carriage clamp, right', 'carriage', cx / 2, 0),
    {
      id: 'A.gantryRight',
      tag: 'A1',
      what: 'gantry idler, right end',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xr - 2 * R - r,
      baseYMm: r,
      radiusMm: r,
      teeth: zI,
      sense: 1,
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'A.motor',
      tag: 'A2',
      what: 'motor A pulley, back-right corner',
      kind: 'drive',
      body: 'frame',
      baseXMm: xr - R,
      baseYMm: yb - R,
      radiusMm: R,
      teeth: zD,
      sense: -1,
      motor: 'A',
      expectedWrapRad: Math.PI,
    },
    {
      id: 'A.frontRight',
      tag: 'A3',
      what: 'idler, front-right corner',
      kind: 'idler',
      body: 'frame',
      baseXMm: xr - r,
      baseYMm: yf + r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      stackId: 'front-right',
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'A.frontLeft',
      tag: 'A4',
      what: 'idler, front-left corner',
      kind: 'idler',
      body: 'frame',
      baseXMm: xl + r,
      baseYMm: yf + r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      stackId: 'front-left',
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'A.gantryLeft',
      tag: 'A5',
      what: 'gantry idler, left end',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xl + r,
      baseYMm: -r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      expectedWrapRad: HALF_PI,
    },
    clamp('A.clampLeft', 'carriage clamp, left', 'carriage', -cx / 2, 0),
  ]);
  const b = mirrorLoop(a, g.W, { id: 'B', label: 'belt B', level: 2, plane: { kind: 'flat' }, motor: 'B' }, LEFT_RIGHT);
  b.massShare = { a: 0, b: 1 };
  // The mirrored stack ids name the same corners: front-right holds A3 and B4, front-left A4 and B3.
  for (const e of b.elements) if (e.stackId) e.stackId = e.stackId === 'front-right' ? 'front-left' : 'front-right';
  return [a, b];
}

/**
 * The H belt (docs/models/belt-layout.md "H belt"), one level. The run between the two back gantry idlers passes
 * behind the carriage (two flange allowances behind its back face), so it never runs through it, and the front
 * and back idlers at each gantry end are apart by that offset plus their diameters.
 */
function hLoop(g: Geometry): LayoutLoop {
  const { xl, xr, yf, yb, r, R, zI, zD, cx, m } = g;
  const back = g.cy / 2 + 2 * m;
  return loopOf('H', 'belt H', 1, { kind: 'flat' }, { a: 0.5, b: 0.5 }, [
    clamp('H.clampRight', 'carriage clamp, right', 'carriage', cx / 2, 0),
    {
      id: 'H.gantryRightFront',
      tag: 'H1',
      what: 'gantry idler, right end, front',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xr - 3 * r,
      baseYMm: -r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'H.frontRight',
      tag: 'H2',
      what: 'idler, front-right corner',
      kind: 'idler',
      body: 'frame',
      baseXMm: xr - r,
      baseYMm: yf + r,
      radiusMm: r,
      teeth: zI,
      sense: 1,
      expectedWrapRad: Math.PI,
    },
    {
      id: 'H.motorB',
      tag: 'H3',
      what: 'motor B pulley, back-right corner',
      kind: 'drive',
      body: 'frame',
      baseXMm: xr - R,
      baseYMm: yb - R,
      radiusMm: R,
      teeth: zD,
      sense: 1,
      motor: 'B',
      expectedWrapRad: Math.PI,
    },
    {
      id: 'H.gantryRightBack',
      tag: 'H4',
      what: 'gantry idler, right end, back',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xr - 2 * R - r,
      baseYMm: back + r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'H.gantryLeftBack',
      tag: 'H5',
      what: 'gantry idler, left end, back',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xl + 2 * R + r,
      baseYMm: back + r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      expectedWrapRad: HALF_PI,
    },
    {
      id: 'H.motorA',
      tag: 'H6',
      what: 'motor A pulley, back-left corner',
      kind: 'drive',
      body: 'frame',
      baseXMm: xl + R,
      baseYMm: yb - R,
      radiusMm: R,
      teeth: zD,
      sense: 1,
      motor: 'A',
      expectedWrapRad: Math.PI,
    },
    {
      id: 'H.frontLeft',
      tag: 'H7',
      what: 'idler, front-left corner',
      kind: 'idler',
      body: 'frame',
      baseXMm: xl + r,
      baseYMm: yf + r,
      radiusMm: r,
      teeth: zI,
      sense: 1,
      expectedWrapRad: Math.PI,
    },
    {
      id: 'H.gantryLeftFront',
      tag: 'H8',
      what: 'gantry idler, left end, front',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xl + 3 * r,
      baseYMm: -r,
      radiusMm: r,
      teeth: zI,
      sense: -1,
      expectedWrapRad: HALF_PI,
    },
    clamp('H.clampLeft', 'carriage clamp, left', 'carriage', -cx / 2, 0),
  ]);
}

/**
 * Cartesian (docs/models/belt-layout.md "Cartesian"): every loop is upright. The X loop stands on the gantry in a
 * plane just behind the carriage (clamps on the carriage's back face, the return run above the clamped one); the
 * Y loops stand along the frame sides on the cross shaft (or one motor each), the gantry clamped to their upper run.
 * The solver's coordinates are unchanged from a flat drawing of the same loops, so lengths and wraps are the same.
 */
function cartesianLoops(g: Geometry, yMotors: 1 | 2): LayoutLoop[] {
  const { xl, xr, yf, yb, r, R, zI, zD, cx, m } = g;
  const xPlane = g.cy / 2 + m + g.w / 2;
  const x = loopOf('X', 'belt X', 2, { kind: 'upright', runsAlong: 'x', atMm: xPlane, zeroMm: 0, sign: 1 }, { a: 1, b: 0 }, [
    clamp('X.clampRight', 'carriage clamp, right, back face', 'carriage', cx / 2, 0),
    {
      id: 'X.idler',
      tag: 'X1',
      what: 'X idler, gantry right end',
      kind: 'idler',
      body: 'gantry',
      baseXMm: xr - r,
      baseYMm: r,
      radiusMm: r,
      teeth: zI,
      sense: 1,
      expectedWrapRad: Math.PI,
    },
    {
      id: 'X.motor',
      tag: 'X2',
      what: 'motor X pulley, gantry left end',
      kind: 'drive',
      body: 'gantry',
      baseXMm: xl + R,
      baseYMm: R,
      radiusMm: R,
      teeth: zD,
      sense: 1,
      motor: 'A',
      expectedWrapRad: Math.PI,
    },
    clamp('X.clampLeft', 'carriage clamp, left, back face', 'carriage', -cx / 2, 0),
  ]);
  const yl = loopOf('YL', 'belt Y, left side', 1, { kind: 'upright', runsAlong: 'y', atMm: xl, zeroMm: xl, sign: 1 }, { a: 0, b: 1 }, [
    clamp('YL.clampBack', 'gantry clamp, left end, back face', 'gantry', xl + 2 * R, g.gy / 2),
    {
      id: 'YL.drive',
      tag: 'YL1',
      what: 'Y drive pulley, back-left corner',
      kind: 'drive',
      body: 'frame',
      baseXMm: xl + R,
      baseYMm: yb - R,
      radiusMm: R,
      teeth: zD,
      sense: 1,
      motor: 'B',
      expectedWrapRad: Math.PI,
    },
    {
      id: 'YL.idler',
      tag: 'YL2',
      what: 'Y idler, front-left corner',
      kind: 'idler',
      body: 'frame',
      baseXMm: xl + r,
      baseYMm: yf + r,
      radiusMm: r,
      teeth: zI,
      sense: 1,
      expectedWrapRad: Math.PI,
    },
    clamp('YL.clampFront', 'gantry clamp, left end, front face', 'gantry', xl + 2 * r, -g.gy / 2),
  ]);
  const yr = mirrorLoop(
    yl,
    g.W,
    {
      id: 'YR',
      label: 'belt Y, right side',
      level: 1,
      plane: { kind: 'upright', runsAlong: 'y', atMm: xr, zeroMm: xr, sign: -1 },
      motor: yMotors === 2 ? 'B2' : 'B',
    },
    {},
  );
  return [x, yl, yr];
}

interface Geometry {
  W: number;
  xl: number;
  xr: number;
  yf: number;
  yb: number;
  r: number;
  R: number;
  zI: number;
  zD: number;
  cx: number;
  cy: number;
  gy: number;
  w: number;
  m: number;
}

/**
 * Places every pulley, idler and clamp of a mechanism's belt layout from the frame, each on its belt level (see
 * docs/models/belt-layout.md). Belt lines run along the inside faces of the frame and along the gantry's centre
 * line, and each pulley is offset from its belt lines by its own pitch radius, so every span is parallel to an
 * axis and every wrap is a quarter or half turn: span lengths are then exactly affine in the carriage position.
 * @param d - mechanism, Y motor count, frame [mm], belt pitch and width [mm], pulley teeth
 * @returns the layout
 */
export function buildBeltLayout(d: LayoutInput): BeltLayout {
  const p = d.belt.pitchMm;
  const g: Geometry = {
    W: d.frame.outerXMm,
    xl: d.frame.extrusionMm,
    xr: d.frame.outerXMm - d.frame.extrusionMm,
    yf: d.frame.extrusionMm,
    yb: d.frame.outerYMm - d.frame.extrusionMm,
    zD: d.pulley.driveTeeth,
    zI: d.pulley.idlerTeeth,
    R: (d.pulley.driveTeeth * p) / (2 * Math.PI),
    r: (d.pulley.idlerTeeth * p) / (2 * Math.PI),
    cx: d.frame.carriageXMm,
    cy: d.frame.carriageYMm,
    gy: d.frame.gantryYMm,
    w: d.belt.widthMm,
    m: flangeMarginMm(p),
  };
  const base = { outerXMm: g.W, outerYMm: d.frame.outerYMm, extrusionMm: d.frame.extrusionMm, flangeMm: g.m, mechanism: d.mechanism };
  const ab: BeltLayout['motorVars'] = [
    { id: 'A', coordinate: 0 },
    { id: 'B', coordinate: 1 },
  ];
  if (d.mechanism === 'corexy') return { ...base, loops: crossedLoops(g), motorVars: ab };
  if (d.mechanism === 'hbot') return { ...base, loops: [hLoop(g)], motorVars: ab };
  const motorVars = d.yMotors === 2 ? [...ab, { id: 'B2' as const, coordinate: 1 as const }] : ab;
  return { ...base, loops: cartesianLoops(g, d.yMotors), motorVars };
}

/**
 * Where an element is seen in plan and at what height, for a carriage centre at (cxc, cyc): a flat loop's element
 * at its solved position (height 0 within its level); an upright loop's element on the loop's plan line, with its
 * height above the loop's lower run.
 * @param loop - the element's loop
 * @param el - layout element
 * @param cxcMm - carriage centre X in frame coordinates [mm]
 * @param cycMm - carriage centre Y in frame coordinates [mm]
 * @returns plan position and height [mm]
 */
export function planPosition(loop: LayoutLoop, el: LayoutElement, cxcMm: number, cycMm: number): { xMm: number; yMm: number; zMm: number } {
  const at = elementPosition(el, cxcMm, cycMm);
  const pl = loop.plane;
  if (pl.kind === 'flat') return { ...at, zMm: 0 };
  if (pl.runsAlong === 'y') return { xMm: pl.atMm, yMm: at.yMm, zMm: pl.sign * (at.xMm - pl.zeroMm) };
  return { xMm: at.xMm, yMm: cycMm + pl.atMm, zMm: pl.sign * (at.yMm - cycMm - pl.zeroMm) };
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
