import { requireNumber } from './errors';
import type { Matrix2 } from './linalg';
import type { Mechanism } from './types';

/** Density of aluminium used for pulley estimates [kg/m³] (common handbook value, from memory). */
export const ALUMINIUM_DENSITY_KG_PER_M3 = 2700;

/** Belt section of a pulley: belt width plus this much [mm] (our estimate of common 2–3 mm pitch pulleys). */
export const PULLEY_BELT_SECTION_EXTRA_MM = 1;
/** Each of the two flanges: this much above the pitch circle [mm] and this thick [mm] (our estimate). */
export const PULLEY_FLANGE_RISE_MM = 2;
export const PULLEY_FLANGE_THICKNESS_MM = 1;
/** Hub of a drive pulley (the set-screw collar): at least this diameter [mm] and this long [mm] (our estimate). */
export const PULLEY_HUB_MIN_DIAMETER_MM = 16;
export const PULLEY_HUB_LENGTH_MM = 7;

/**
 * Estimated inertia of an aluminium pulley built of coaxial solid cylinders (docs/models/masses-and-inertia.md):
 * a belt section of the pitch diameter d and (belt width + 1 mm) length, two flanges of diameter d + 4 mm and
 * 1 mm thickness, and — for a drive pulley — a set-screw hub of diameter max(d + 4 mm, 16 mm) and 7 mm length.
 * Each cylinder adds ½·ρ·π·r⁴·length. Bore and tooth gaps are left out (they remove little inertia, which sits
 * at the rim); idlers carry bearings instead of a hub. For a 20-tooth 2 mm pulley on a 6 mm belt this is about
 * 3.4 times the old solid-cylinder figure, close to weighed pulleys.
 * @param args.teeth - tooth count [-]
 * @param args.pitchMm - belt pitch [mm]
 * @param args.beltWidthMm - belt width [mm]
 * @param args.hasHub - true for a drive pulley (default), false for an idler
 * @returns inertia about the axle [kg·m²]
 * @see solid-cylinder moment of inertia ½·m·r², any dynamics text (e.g. Meriam & Kraige, Dynamics, appendix; from memory)
 */
export function pulleyInertiaEstimateKgM2(args: { teeth: number; pitchMm: number; beltWidthMm: number; hasHub?: boolean }): number {
  const z = requireNumber('pulleyInertiaEstimateKgM2', 'teeth', args?.teeth, 0, 10000, true);
  const p = requireNumber('pulleyInertiaEstimateKgM2', 'pitchMm', args?.pitchMm, 0, 1000, true);
  const w = requireNumber('pulleyInertiaEstimateKgM2', 'beltWidthMm', args?.beltWidthMm, 0, 10000, true);
  const dMm = (z * p) / Math.PI;
  const disc = (diameterMm: number, lengthMm: number) =>
    0.5 * ALUMINIUM_DENSITY_KG_PER_M3 * Math.PI * (diameterMm / 2000) ** 4 * (lengthMm / 1000);
  const flangeMm = dMm + 2 * PULLEY_FLANGE_RISE_MM;
  let j = disc(dMm, w + PULLEY_BELT_SECTION_EXTRA_MM) + 2 * disc(flangeMm, PULLEY_FLANGE_THICKNESS_MM);
  if (args.hasHub !== false) j += disc(Math.max(flangeMm, PULLEY_HUB_MIN_DIAMETER_MM), PULLEY_HUB_LENGTH_MM);
  return j;
}

/**
 * Moving mass along X and Y (src/engine/README.md): X carries carriage + tool; Y also carries the gantry, and for a
 * cartesian stage the X motor, which rides the gantry. Crossed-belt motors sit on the frame.
 * @param args.mechanism - mechanism key
 * @param args.carriageKg - carriage mass [kg]
 * @param args.toolKg - tool mass [kg]
 * @param args.gantryKg - gantry mass [kg]
 * @param args.motorKg - mass of one motor [kg]
 * @returns moving mass along X and Y [kg]
 */
export function movingMassKg(args: { mechanism: Mechanism; carriageKg: number; toolKg: number; gantryKg: number; motorKg: number }): {
  xKg: number;
  yKg: number;
} {
  const x = args.carriageKg + args.toolKg;
  const y = x + args.gantryKg + (args.mechanism === 'cartesian' ? args.motorKg : 0);
  return { xKg: x, yKg: y };
}

/**
 * Effective mass along a direction: the kinetic energy of the carriage and of everything that moves at belt
 * speed, per ½v², T = ½(m_x·ux² + m_y·uy²)v² + ½Σ M_i·(K·u)_i²·v².
 * @param args.k - motor-to-carriage matrix K
 * @param args.xKg - moving mass along X [kg]
 * @param args.yKg - moving mass along Y [kg]
 * @param args.motorEquivalentKg - belt-line equivalent mass of each motor coordinate (rotor, pulleys, belt) [kg]
 * @param args.directionRad - direction θ [rad]
 * @returns effective mass along θ [kg]
 */
export function effectiveMassKg(args: {
  k: Matrix2;
  xKg: number;
  yKg: number;
  motorEquivalentKg: [number, number];
  directionRad: number;
}): number {
  const c = Math.cos(args.directionRad);
  const s = Math.sin(args.directionRad);
  const sa = args.k[0][0] * c + args.k[0][1] * s;
  const sb = args.k[1][0] * c + args.k[1][1] * s;
  return args.xKg * c * c + args.yKg * s * s + args.motorEquivalentKg[0] * sa * sa + args.motorEquivalentKg[1] * sb * sb;
}
