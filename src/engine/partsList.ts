import { levelName, type BeltLayout, type LayoutElement, type LayoutLoop } from './beltLayout';
import type { BeltReport, CheckQuantity, PartsListRow } from './types';

/** Belt allowance at each clamp for cutting the belt [mm] (common practice: a clamp grips 10–20 mm). */
export const CLAMP_ALLOWANCE_MM = 15;

/** The design numbers a parts list prints. */
export interface PartsInput {
  layout: BeltLayout;
  belts: BeltReport[];
  yMotors: 1 | 2;
  beltPitchMm: number;
  beltWidthMm: number;
  driveTeeth: number;
  idlerTeeth: number;
  stepAngleDeg: number;
  holdingTorqueNm: number;
  ratedCurrentA: number;
}

/** A measured number of a spec: the quantity for readers in either unit system, and its metric words. */
type Measured = { q: CheckQuantity; text: string };
type Piece = string | Measured;

const mm = (value: number, digits: number): Measured => ({ q: { value, kind: 'lengthMm' }, text: `${value.toFixed(digits)} mm` });

/**
 * One row from its specification pieces: `spec` is the pieces in metric words (for programs and older readers),
 * `specParts` keeps the measured numbers as quantities so a reader sees them in their unit system. Belt pitch and
 * width stay text: they are the trade's names of a belt size, not measurements to convert.
 */
function row(item: string, quantity: number, pieces: Piece[]): PartsListRow {
  const spec = pieces.map((s) => (typeof s === 'string' ? s : s.text)).join('');
  const specParts = pieces.map((s) => (typeof s === 'string' ? s : s.q));
  return { item, quantity, spec, specParts };
}

interface Placed {
  loop: LayoutLoop;
  el: LayoutElement;
  toothed: boolean;
}

/**
 * Parts the layout needs, for ordering and for assembly: the motors; every pulley and idler as it sits — toothed
 * or smooth, size, tag, belt level, corner or body, and whether it shares a bolt with another (stacked idlers,
 * each on its own bearings); one belt per loop with its cut length; the cross shaft of a single-motor cartesian
 * Y drive (docs/models/belt-layout.md "Parts").
 * @param p - layout, belt reports and the design's part data
 * @returns rows {item, quantity, spec, specParts} (lengths in mm)
 */
export function partsList(p: PartsInput): PartsListRow[] {
  const rows: PartsListRow[] = [];
  const mech = p.layout.mechanism;
  const dPitch = (z: number) => mm((z * p.beltPitchMm) / Math.PI, 2);
  const size = (z: number): Piece[] => [`${z} teeth, ${p.beltPitchMm} mm pitch, for ${p.beltWidthMm} mm belt, pitch diameter `, dPitch(z)];
  const motors = mech === 'cartesian' ? 1 + p.yMotors : 2;
  rows.push(
    row('Stepper motor', motors, [
      `${p.stepAngleDeg}° step, holding torque `,
      { q: { value: p.holdingTorqueNm, kind: 'torqueNm' }, text: `${p.holdingTorqueNm} N·m` },
      ' at ',
      { q: { value: p.ratedCurrentA, kind: 'currentA' }, text: `${p.ratedCurrentA} A` },
      ' rated',
    ]),
  );
  const placed: Placed[] = [];
  for (const loop of p.layout.loops) {
    const drive = loop.elements.find((e) => e.kind === 'drive');
    const toothSense = drive ? drive.sense : 1;
    for (const el of loop.elements)
      if (el.kind !== 'clamp') placed.push({ loop, el, toothed: el.kind === 'drive' || el.sense === toothSense });
  }
  const where = (x: Placed) => `${x.el.label}, ${levelName(mech, x.el.level)} (${x.loop.label})`;
  const axis = (x: Placed) =>
    x.loop.plane.kind === 'flat' ? 'axis vertical' : x.loop.plane.runsAlong === 'y' ? 'axis along X' : 'axis along Y';
  const shaft = (x: Placed): string => {
    if (x.el.kind !== 'drive') return `on its own bolt and bearings, ${axis(x)}`;
    if (mech === 'cartesian' && x.loop.id !== 'X' && p.yMotors === 1) return `on the Y cross shaft, ${axis(x)}`;
    const motor = x.el.label.match(/motor (\w)/)?.[1];
    return `${motor ? `on the shaft of motor ${motor}` : 'on the shaft of its own Y motor'}, ${axis(x)}`;
  };
  for (const x of placed.filter((q) => q.el.kind === 'drive')) {
    rows.push(row(`Drive pulley ${x.el.tag}`, 1, [...size(x.el.teeth), `; ${where(x)}; ${shaft(x)}`]));
  }
  const done = new Set<string>();
  for (const x of placed.filter((q) => q.el.kind === 'idler')) {
    if (done.has(x.el.id)) continue;
    const kind = x.toothed ? 'Toothed idler' : 'Smooth idler';
    const back = x.toothed ? '' : ' (runs on the belt back)';
    const spec: Piece[] = x.toothed ? size(x.el.teeth) : ['belt-line diameter ', dPitch(x.el.teeth), `, for ${p.beltWidthMm} mm belt`];
    const mates = x.el.stackId ? placed.filter((q) => q.el.stackId === x.el.stackId && q.el.kind === 'idler') : [x];
    mates.forEach((q) => done.add(q.el.id));
    if (mates.length === 1) {
      rows.push(row(`${kind} ${x.el.tag}${back}`, 1, [...spec, `; ${where(x)}; ${shaft(x)}`]));
      continue;
    }
    const same = mates.every((q) => q.toothed === x.toothed);
    rows.push(
      row(`${same ? kind : 'Idler'} ${mates.map((q) => q.el.tag).join(' + ')}, stacked`, mates.length, [
        ...spec,
        `; ${mates.length} idlers stacked on one bolt, each on its own bearings (they turn opposite ways), ${axis(x)}: ` +
          mates.map(where).join('; '),
      ]),
    );
  }
  const runsOn = (l: LayoutLoop): string => {
    const on = `runs on the ${levelName(mech, l.level)}`;
    if (l.plane.kind === 'flat') return on;
    return l.plane.runsAlong === 'y'
      ? `${on}, upright (pulley axes along X): the upper run is clamped to the gantry, the lower run returns below it`
      : `${on}, upright (pulley axes along Y) behind the carriage: the lower run is clamped to the carriage, the upper run returns above it`;
  };
  for (const b of p.belts) {
    const loop = p.layout.loops.find((l) => l.id === b.id);
    rows.push(
      row(`Belt, ${b.label}`, 1, [
        `${p.beltPitchMm} mm pitch, ${p.beltWidthMm} mm wide, cut `,
        mm(b.cutLengthMm, 0),
        ` (${b.loopTeeth} teeth on the pitch line + `,
        mm(CLAMP_ALLOWANCE_MM, 0),
        ` at each clamp)${loop ? `; ${runsOn(loop)}` : ''}`,
      ]),
    );
  }
  if (mech === 'cartesian' && p.yMotors === 1) {
    const len = p.layout.outerXMm - 2 * p.layout.extrusionMm;
    rows.push(
      row('Y cross shaft', 1, ['joins both Y drive pulleys (YL1, YR1) along the back, about ', mm(len, 0), ' long, with two bearings']),
    );
  }
  return rows;
}
