import type { BeltLayout } from './beltLayout';
import type { BeltReport } from './types';

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

/**
 * Parts the layout needs, for ordering: motors, drive pulleys, toothed and smooth idlers with sizes, one belt
 * per loop with its cut length, and the cross shaft of a single-motor cartesian Y drive.
 * @param p - layout, belt reports and the design's part data
 * @returns rows {item, quantity, spec}
 */
export function partsList(p: PartsInput): { item: string; quantity: number; spec: string }[] {
  const rows: { item: string; quantity: number; spec: string }[] = [];
  const dPitch = (z: number) => ((z * p.beltPitchMm) / Math.PI).toFixed(2);
  const motors = p.layout.mechanism === 'cartesian' ? 1 + p.yMotors : 2;
  rows.push({
    item: 'Stepper motor',
    quantity: motors,
    spec: `${p.stepAngleDeg}° step, holding torque ${p.holdingTorqueNm} N·m at ${p.ratedCurrentA} A rated`,
  });
  let drives = 0;
  let toothed = 0;
  let smooth = 0;
  for (const loop of p.layout.loops) {
    const drive = loop.elements.find((e) => e.kind === 'drive');
    const toothSense = drive ? drive.sense : 1;
    for (const e of loop.elements) {
      if (e.kind === 'drive') drives++;
      else if (e.kind === 'idler') {
        if (e.sense === toothSense) toothed++;
        else smooth++;
      }
    }
  }
  rows.push({
    item: 'Drive pulley',
    quantity: drives,
    spec: `${p.driveTeeth} teeth, ${p.beltPitchMm} mm pitch, for ${p.beltWidthMm} mm belt, pitch diameter ${dPitch(p.driveTeeth)} mm`,
  });
  if (toothed > 0) {
    rows.push({
      item: 'Toothed idler',
      quantity: toothed,
      spec: `${p.idlerTeeth} teeth, ${p.beltPitchMm} mm pitch, for ${p.beltWidthMm} mm belt, pitch diameter ${dPitch(p.idlerTeeth)} mm`,
    });
  }
  if (smooth > 0) {
    rows.push({
      item: 'Smooth idler (runs on the belt back)',
      quantity: smooth,
      spec: `belt-line diameter ${dPitch(p.idlerTeeth)} mm, for ${p.beltWidthMm} mm belt`,
    });
  }
  for (const b of p.belts) {
    rows.push({
      item: `Belt, ${b.label}`,
      quantity: 1,
      spec: `${p.beltPitchMm} mm pitch, ${p.beltWidthMm} mm wide, cut ${b.cutLengthMm.toFixed(0)} mm (${b.loopTeeth} teeth on the pitch line + ${CLAMP_ALLOWANCE_MM} mm at each clamp)`,
    });
  }
  if (p.layout.mechanism === 'cartesian' && p.yMotors === 1) {
    const len = p.layout.outerXMm - 2 * p.layout.extrusionMm;
    rows.push({
      item: 'Y cross shaft',
      quantity: 1,
      spec: `joins both Y drive pulleys, about ${len.toFixed(0)} mm long, with two bearings`,
    });
  }
  return rows;
}
