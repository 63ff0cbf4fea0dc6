import { requireNumber } from './errors';
import { generalizedEigen3, type Sym3 } from './linalg';
import { zeroRow } from './zeroRow';

// Structural modes beside the belt modes (docs/models/structural-modes.md): gantry beam bending, gantry yaw and
// the cross shaft's twist, and the map of the lowest of all modes.

/** Typical section data of a common aluminium T-slot profile used as a gantry beam. */
export interface TypicalBeam {
  /** Key, e.g. "20x20". */
  id: string;
  /** Plain words for the Design desk and the sheet. */
  label: string;
  /** Square size the profile is picked for when the design leaves the beam to its frame size [mm]. */
  extrusionMm: number;
  /** Second moment of area about the axis the beam bends about in the XY plane [mm⁴]. */
  secondMomentMm4: number;
  /** Young's modulus [GPa]. */
  modulusGPa: number;
  /** Mass per metre [kg/m]. */
  massKgPerM: number;
}

/**
 * Typical values for common aluminium T-slot profiles (6060/6063 alloy, E ≈ 69 GPa). Makers' catalogues differ
 * by several per cent (slot shape, wall thickness); these are round figures for a first estimate, from memory of
 * such catalogues, and the Design desk labels them "typical" and asks for the maker's figure.
 */
export const TYPICAL_GANTRY_BEAMS: readonly TypicalBeam[] = Object.freeze([
  { id: '20x20', label: '20 × 20 mm profile', extrusionMm: 20, secondMomentMm4: 6900, modulusGPa: 69, massKgPerM: 0.5 },
  {
    id: '20x40',
    label: '20 × 40 mm profile, 40 mm side along Y',
    extrusionMm: 0,
    secondMomentMm4: 46000,
    modulusGPa: 69,
    massKgPerM: 0.85,
  },
  { id: '30x30', label: '30 × 30 mm profile', extrusionMm: 30, secondMomentMm4: 28000, modulusGPa: 69, massKgPerM: 0.85 },
  { id: '40x40', label: '40 × 40 mm profile', extrusionMm: 40, secondMomentMm4: 95000, modulusGPa: 69, massKgPerM: 1.5 },
]);

/**
 * The typical square profile closest to a frame's extrusion size (what a gantry beam defaults to).
 * @param extrusionMm - frame profile size [mm]
 * @returns the typical beam
 */
export function typicalGantryBeam(extrusionMm: number): TypicalBeam {
  const square = TYPICAL_GANTRY_BEAMS.filter((b) => b.extrusionMm > 0);
  return square.reduce((best, b) => (Math.abs(b.extrusionMm - extrusionMm) < Math.abs(best.extrusionMm - extrusionMm) ? b : best));
}

/** One side's integral of {@link beamEffectiveMassShare} on a span normalised to 1: q²(c²p³/3 − 2c·p⁵/5 + p⁷/7), c = 1 − q². */
function shareIntegral(p: number, q: number): number {
  // Powers by multiplication: the bending map calls this twice per grid column, and ** of a fraction is a pow call.
  const q2 = q * q;
  const c = 1 - q2;
  const p2 = p * p;
  const p3 = p2 * p;
  const p5 = p3 * p2;
  return q2 * ((c * c * p3) / 3 - (2 * c * p5) / 5 + (p5 * p2) / 7);
}

/**
 * Share of a uniform simply supported beam's mass that moves with a point load at distance a from one support,
 * by Rayleigh's method with the static deflection of that load as the mode shape:
 * m_eff/m = (1/L)·∫(y/y_a)² dx = (I₁ + I₂)/(4·L·a⁴·b⁴), b = L − a, with I₁ = b²(c²a³/3 − 2c·a⁵/5 + a⁷/7),
 * c = L² − b², and I₂ the same with a and b swapped. At mid-span this is 17/35.
 * @param args.spanMm - distance between the supports L [mm]
 * @param args.positionMm - load position a from one support (default L/2) [mm]
 * @returns effective mass share [-]
 * @see Lord Rayleigh, The Theory of Sound (1877), energy method; 17/35 at mid-span as in S. S. Rao, Mechanical
 *   Vibrations (effective mass of a beam; from memory); docs/models/structural-modes.md
 */
export function beamEffectiveMassShare(args: { spanMm: number; positionMm?: number }): number {
  const s = 'beamEffectiveMassShare';
  const l = requireNumber(s, 'spanMm', args?.spanMm, 0, Infinity, true);
  const a0 = requireNumber(s, 'positionMm', args?.positionMm ?? l / 2, 0, l);
  // Normalised to L = 1; a load right at a support moves nothing, so keep it a hair inside.
  const a = Math.min(1 - 1e-3, Math.max(1e-3, a0 / l));
  const b = 1 - a;
  const ab2 = a * a * b * b;
  return (shareIntegral(a, b) + shareIntegral(b, a)) / (4 * ab2 * ab2);
}

/**
 * First bending frequency of a simply supported beam carrying a point mass, by Rayleigh's method: the point's
 * static stiffness k = 3·E·I·L/(a²·b²) (48·E·I/L³ at mid-span) and the point mass plus the beam's effective
 * mass ({@link beamEffectiveMassShare}, 17/35 of the beam at mid-span): f = (1/2π)·√(k/m_eff). Euler–Bernoulli
 * beam, no shear deformation, rigid supports.
 * @param args.spanMm - distance between the supports L [mm]
 * @param args.secondMomentMm4 - second moment of area about the bending axis I [mm⁴]
 * @param args.modulusGPa - Young's modulus E [GPa]
 * @param args.beamMassKg - mass of the beam between the supports [kg]
 * @param args.pointMassKg - point mass on the beam (the carriage) [kg]
 * @param args.positionMm - distance of the point mass from one support (default mid-span) [mm]
 * @returns first bending frequency [Hz]
 * @see docs/models/structural-modes.md; W. C. Young & R. G. Budynas, Roark's Formulas for Stress and Strain
 *   (simply supported beam, point load deflection; from memory)
 */
export function beamBendingFrequencyHz(args: {
  spanMm: number;
  secondMomentMm4: number;
  modulusGPa: number;
  beamMassKg: number;
  pointMassKg: number;
  positionMm?: number;
}): number {
  const s = 'beamBendingFrequencyHz';
  const lMm = requireNumber(s, 'spanMm', args?.spanMm, 0, Infinity, true);
  const i = requireNumber(s, 'secondMomentMm4', args?.secondMomentMm4, 0, Infinity, true) * 1e-12;
  const e = requireNumber(s, 'modulusGPa', args?.modulusGPa, 0, Infinity, true) * 1e9;
  const mb = requireNumber(s, 'beamMassKg', args?.beamMassKg, 0);
  const mp = requireNumber(s, 'pointMassKg', args?.pointMassKg, 0);
  const aMm = requireNumber(s, 'positionMm', args?.positionMm ?? lMm / 2, 0, lMm);
  const l = lMm / 1000;
  const a = Math.min(l * (1 - 1e-3), Math.max(l * 1e-3, aMm / 1000));
  const b = l - a;
  const k = (3 * e * i * l) / (a * a * b * b);
  const m = mp + mb * beamEffectiveMassShare({ spanMm: lMm, positionMm: aMm });
  if (!(m > 0)) return Infinity;
  return Math.sqrt(k / m) / (2 * Math.PI);
}

/**
 * Torsional stiffness of a solid round shaft: k = G·J/L with J = π·d⁴/32.
 * @param args.diameterMm - shaft diameter d [mm]
 * @param args.lengthMm - twisted length L [mm]
 * @param args.shearModulusGPa - shear modulus G [GPa]
 * @returns torsional stiffness [N·m/rad]
 * @see J. M. Gere, Mechanics of Materials, torsion of circular bars (from memory); docs/models/structural-modes.md
 */
export function shaftTorsionStiffnessNmPerRad(args: { diameterMm: number; lengthMm: number; shearModulusGPa: number }): number {
  const s = 'shaftTorsionStiffnessNmPerRad';
  const d = requireNumber(s, 'diameterMm', args?.diameterMm, 0, Infinity, true) / 1000;
  const l = requireNumber(s, 'lengthMm', args?.lengthMm, 0, Infinity, true) / 1000;
  const g = requireNumber(s, 'shearModulusGPa', args?.shearModulusGPa, 0, Infinity, true) * 1e9;
  return (g * Math.PI * d ** 4) / 32 / l;
}

/** Mass data of the carriage and gantry for the yaw model, in the coordinates (x, y, φ). */
export interface YawMass {
  /** Mass moving along X [kg]. */
  xKg: number;
  /** Mass moving along Y (gantry and all it carries) [kg]. */
  yKg: number;
  /** Σ mᵢ·eᵢ of the point masses on the gantry about its mid-point (carriage, a motor at one end) [kg·m]. */
  couplingKgM: number;
  /** Moment of inertia of the gantry and what it carries about the vertical axis through its mid-point [kg·m²]. */
  yawInertiaKgM2: number;
}

/**
 * Mass matrix entries of a rigid gantry that may yaw: a uniform beam of mass m_g and span S (inertia m_g·S²/12)
 * plus point masses at offsets eᵢ from its mid-point.
 * @param args.xKg - mass moving along X [kg]
 * @param args.gantryKg - distributed gantry mass [kg]
 * @param args.spanMm - span between the two guide lines S [mm]
 * @param args.points - point masses on the gantry and their offsets from mid-span [kg, mm]
 * @returns the yaw mass data
 * @see docs/models/structural-modes.md
 */
export function gantryYawMass(args: {
  xKg: number;
  gantryKg: number;
  spanMm: number;
  points: { massKg: number; offsetMm: number }[];
}): YawMass {
  const sM = args.spanMm / 1000;
  let y = args.gantryKg;
  let c = 0;
  let j = (args.gantryKg * sM * sM) / 12;
  for (const p of args.points) {
    const e = p.offsetMm / 1000;
    y += p.massKg;
    c += p.massKg * e;
    j += p.massKg * e * e;
  }
  return { xKg: args.xKg, yKg: y, couplingKgM: c, yawInertiaKgM2: j };
}

/**
 * Lowest yaw mode of a rigid gantry on two guide lines held by the belt network: the generalised eigenproblem
 * K·u = ω²·M·u in the coordinates (x, y, φ) — carriage X, gantry Y at mid-span, gantry rotation about the vertical
 * axis — with K condensed from the belts and motors and M = [[m_x, 0, 0], [0, m_y, Σm·e], [0, Σm·e, J]]. A mode
 * counts as yaw when its rotation moves the gantry ends more than its translations move anything
 * (|φ|·S/2 > max(|x|, |y|)). The guides are taken to offer no resistance to yaw (conservative).
 * @param args.stiffness - condensed stiffness in (x [m], y [m], φ [rad]) [N/m, N/rad, N·m/rad]
 * @param args.mass - mass data (see {@link gantryYawMass})
 * @param args.halfSpanMm - half the span between the guide lines S/2 [mm]
 * @returns the yaw frequency [Hz], 0 when the belts do not hold yaw at all
 * @see docs/models/structural-modes.md; S. S. Rao, Mechanical Vibrations, multi-degree-of-freedom systems (from memory)
 */
export function yawModeFrequencyHz(args: { stiffness: Sym3; mass: YawMass; halfSpanMm: number }): number {
  const m = args.mass;
  const eig = generalizedEigen3(args.stiffness, { xx: m.xKg, xy: 0, xz: 0, yy: m.yKg, yz: m.couplingKgM, zz: m.yawInertiaKgM2 });
  const half = args.halfSpanMm / 1000;
  for (let i = 0; i < 3; i++) {
    const u = eig.vectors[i];
    if (Math.abs(u[2]) * half > Math.max(Math.abs(u[0]), Math.abs(u[1]))) {
      const lam = eig.values[i];
      return lam > 0 ? Math.sqrt(lam) / (2 * Math.PI) : 0;
    }
  }
  // No mode is dominated by rotation: report the highest (the yaw-like one for any sensible design).
  const lam = eig.values[2];
  return lam > 0 ? Math.sqrt(lam) / (2 * Math.PI) : 0;
}

/** Ids of the modes the result names. */
export type ModeId = 'belt' | 'gantry-bending' | 'gantry-yaw' | 'cross-shaft';

/** Plain words for each mode id, for the Design desk and the sheet. */
export const MODE_LABELS: Readonly<Record<ModeId, string>> = Object.freeze({
  belt: 'Belt mode (carriage on the belts)',
  'gantry-bending': 'Gantry beam bending',
  'gantry-yaw': 'Gantry yaw',
  'cross-shaft': 'Gantry yaw through the cross shaft',
});

/** One structural mode: its lowest frequency over the travel and where. */
export interface ModeReport {
  id: ModeId;
  label: string;
  frequencyHz: number;
  xMm: number;
  yMm: number;
}

/** The modes and the map of the lowest of them. */
export interface LowestModeMap {
  modes: ModeReport[];
  /** Lowest frequency of all modes at each grid point, [iy][ix] [Hz]. */
  lowestFrequencyHz: number[][];
  /** Which mode that is at each grid point, [iy][ix]. */
  lowestModeId: ModeId[][];
  lowest: { frequencyHz: number; modeId: ModeId; xMm: number; yMm: number };
  /** Per mode, its highest frequency over the points where it is the lowest mode (0 where it never is) [Hz]. */
  highestWhereLowestHz: Partial<Record<ModeId, number>>;
}

/** Running state of {@link lowestModeMap}'s pass over the rows. */
interface LowestPass {
  ids: ModeId[];
  maps: number[][][];
  nx: number;
  /** Lowest frequency and its mode (index into ids) at each point of the current row. */
  fBuf: Float64Array;
  kBuf: Int32Array;
  blank: number[];
  /** Per mode: its lowest frequency so far, where (flat index), and its highest where it is the lowest mode. */
  bestF: Float64Array;
  bestP: Int32Array;
  top: Float64Array;
  /** The lowest of all modes so far, its mode and where (flat index; −1 before any). */
  lowestHz: number;
  lowestId: ModeId;
  lowestP: number;
  frequencyRows: number[][];
  modeRows: ModeId[][];
}

/**
 * One row of the lowest-mode map, mode by mode: the same comparisons per point as a loop over the modes, one row
 * array at a time. Each mode's weakest point (the first within 1e-9 Hz of its lowest, rows first) is tracked in the
 * same pass; a row that is the same array as the one before cannot move it (the bending map repeats one row).
 */
function lowestModeRow(s: LowestPass, iy: number): void {
  const { maps, nx, fBuf, kBuf, bestF, bestP, ids, top } = s;
  fBuf.fill(Infinity);
  kBuf.fill(0);
  for (let k = 0; k < maps.length; k++) {
    const row = maps[k][iy];
    const fresh = iy === 0 || row !== maps[k][iy - 1];
    let bf = bestF[k];
    for (let ix = 0; ix < nx; ix++) {
      const v = row[ix];
      if (fresh && v < bf - 1e-9) {
        bf = v;
        bestP[k] = iy * nx + ix;
      }
      if (v < fBuf[ix]) {
        fBuf[ix] = v;
        kBuf[ix] = k;
      }
    }
    bestF[k] = bf;
  }
  const fr = s.blank.slice();
  const idr: ModeId[] = []; // filled in order: a packed array (src/engine/zeroRow.ts)
  let lowestHz = s.lowestHz;
  for (let ix = 0; ix < nx; ix++) {
    const f = fBuf[ix];
    const kf = kBuf[ix];
    const id = ids[kf];
    if (kf < top.length) top[kf] = Math.max(top[kf], f);
    fr[ix] = f;
    idr[ix] = id;
    if (f < lowestHz - 1e-9) {
      lowestHz = f;
      s.lowestId = id;
      s.lowestP = iy * nx + ix;
    }
  }
  s.lowestHz = lowestHz;
  s.frequencyRows.push(fr);
  s.modeRows.push(idr);
}

/**
 * Combines the per-point frequencies of each mode into the list of modes (each at its own weakest point) and the
 * map of the lowest mode. Each mode is computed with the rest of the machine rigid, so the true lowest frequency
 * of the coupled machine is somewhat lower where two modes are close (see the docs page).
 * @param args.xMm - grid X coordinates [mm]
 * @param args.yMm - grid Y coordinates [mm]
 * @param args.maps - per mode, its frequency at each grid point [iy][ix] (a mode that does not exist is left out) [Hz]
 * @returns modes, the lowest-mode map and its minimum
 */
export function lowestModeMap(args: { xMm: number[]; yMm: number[]; maps: Partial<Record<ModeId, number[][]>> }): LowestModeMap {
  const ids = (Object.keys(args.maps) as ModeId[]).filter((id) => args.maps[id]);
  const ny = args.yMm.length;
  const nx = args.xMm.length;
  const maps = ids.map((id) => args.maps[id]!);
  const pass: LowestPass = {
    ids,
    maps,
    nx,
    fBuf: new Float64Array(nx),
    kBuf: new Int32Array(nx),
    blank: zeroRow(nx),
    bestF: new Float64Array(maps.length).fill(Infinity),
    bestP: new Int32Array(maps.length),
    top: new Float64Array(ids.length),
    lowestHz: Infinity,
    lowestId: ids[0] ?? 'belt',
    lowestP: -1,
    frequencyRows: [],
    modeRows: [],
  };
  // One call per row: the row routine is optimised as an ordinary hot function rather than mid-loop.
  for (let iy = 0; iy < ny; iy++) lowestModeRow(pass, iy);
  const { bestF, bestP, top, lowestHz, lowestId, lowestP } = pass;
  const lowestFrequencyHz = pass.frequencyRows;
  const lowestModeId = pass.modeRows;
  const modes: ModeReport[] = ids.map((id, k) => ({
    id,
    label: MODE_LABELS[id],
    frequencyHz: bestF[k],
    xMm: args.xMm[bestP[k] % nx],
    yMm: args.yMm[Math.floor(bestP[k] / nx)],
  }));
  const lowest = {
    frequencyHz: lowestHz,
    modeId: lowestId,
    xMm: lowestP < 0 ? 0 : args.xMm[lowestP % nx],
    yMm: lowestP < 0 ? 0 : args.yMm[Math.floor(lowestP / nx)],
  };
  return {
    modes: modes.sort((a, b) => a.frequencyHz - b.frequencyHz),
    lowestFrequencyHz,
    lowestModeId,
    lowest,
    highestWhereLowestHz: Object.fromEntries(ids.map((id, k) => [id, top[k]])),
  };
}
