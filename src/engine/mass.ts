import { requireNumber } from './errors';
import type { Matrix2 } from './linalg';
import type { Mechanism } from './types';

/** Density of aluminium used for pulley estimates [kg/m³] (common handbook value, from memory). */
export const ALUMINIUM_DENSITY_KG_PER_M3 = 2700;

/** Axial length added to the belt width for flanges and hub when estimating a pulley [mm] (our estimate). */
export const PULLEY_EXTRA_WIDTH_MM = 4;

/**
 * Estimated inertia of a pulley as a solid aluminium cylinder of its pitch diameter and (belt width + 4 mm)
 * length: J = ½·m·r² = ½·ρ·π·r⁴·w. Used when the design leaves the pulley inertia out; bores and teeth make
 * real pulleys lighter, so the estimate errs on the heavy side.
 * @param args.teeth - tooth count [-]
 * @param args.pitchMm - belt pitch [mm]
 * @param args.beltWidthMm - belt width [mm]
 * @returns inertia about the axle [kg·m²]
 * @see solid-cylinder moment of inertia, any dynamics text (e.g. Meriam & Kraige, Dynamics, appendix; from memory)
 */
export function pulleyInertiaEstimateKgM2(args: { teeth: number; pitchMm: number; beltWidthMm: number }): number {
  const z = requireNumber('pulleyInertiaEstimateKgM2', 'teeth', args?.teeth, 0, 10000, true);
  const p = requireNumber('pulleyInertiaEstimateKgM2', 'pitchMm', args?.pitchMm, 0, 1000, true);
  const w = requireNumber('pulleyInertiaEstimateKgM2', 'beltWidthMm', args?.beltWidthMm, 0, 10000, true);
  const r = (z * p) / (2 * Math.PI) / 1000;
  const len = (w + PULLEY_EXTRA_WIDTH_MM) / 1000;
  return 0.5 * ALUMINIUM_DENSITY_KG_PER_M3 * Math.PI * r ** 4 * len;
}

/**
 * Moving mass along X and Y (format.md): X carries carriage + tool; Y also carries the gantry, and for a
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
