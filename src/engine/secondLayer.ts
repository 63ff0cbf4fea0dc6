import type { LayoutLoop } from './beltLayout';
import { rotorTeeth } from './drive';
import { beltSpeedForPull, motorForcesN, motorForcesWithKit, type EnvelopeInput, type EnvelopeResult, type PullCurve } from './envelope';
import {
  biggestErrorTerm,
  carriageErrorMm,
  errorBudgetMap,
  loadAngleErrorMm,
  loadAngleLagMm,
  microstepDeadband,
  type ErrorBudgetResult,
} from './errorBudget';
import { excitation, type ExcitationResult, type ExcitationTarget } from './excitation';
import type { TravelInfo } from './frame';
import { gantryYawMap, yawSlopesMmPerRad } from './gantryYaw';
import { gridStride } from './gridSampling';
import { copperLossW, referenceMoveRmsTorqueNm, rmsTorqueNm, supplySizing, type HeatResult } from './heat';
import { scheduleJob, type DirectionLimits, type JobPoint, type JobResult } from './jobSchedule';
import { inverse2, multiply2, transpose2, type Matrix2 } from './linalg';
import type { DesignInput } from './schema';
import { shaftLoads, type LoadsResult, type PulleyLoadInput } from './shaftLoads';
import type { StiffnessInput, StiffnessResult } from './stiffness';
import {
  beamBendingFrequencyHz,
  gantryYawMass,
  lowestModeMap,
  MODE_LABELS,
  shaftTorsionStiffnessNmPerRad,
  typicalGantryBeam,
  type ModeId,
  type ModeReport,
} from './structuralModes';
import { vibrationControl, type ShapingResult } from './vibrationControl';

// The second layer of the evaluation (docs/models/): error budget, structural modes, vibration control,
// excitation, heat, shaft loads and job timing, each from numbers the first layer already has.

/** Structure data the result reports with the modes: the beam and shaft values used, typical or typed. */
export interface StructureInfo {
  gantryBeam: {
    spanMm: number;
    secondMomentMm4: number;
    modulusGPa: number;
    massKgPerM: number;
    /** Which values are the typical ones (the design left them empty), and for which profile. */
    typical: { secondMoment: boolean; modulus: boolean; mass: boolean; profile: string };
  };
  /** The cross shaft of a cartesian stage with one Y motor (null otherwise). */
  crossShaft: { diameterMm: number; lengthMm: number; shearModulusGPa: number; stiffnessNmPerRad: number } | null;
}

/** What the stiffness map needs from the structure: the yaw slopes and a cross shaft. */
export interface StructureStiffness {
  yawSlopesMmPerRad: number[][];
  shaft: StiffnessInput['shaft'];
  info: StructureInfo;
}

/** Distance between the Y guide lines: the gantry spans the frame's inside [mm]. */
function gantrySpanMm(d: DesignInput): number {
  return d.frame.outerXMm - 2 * d.frame.extrusionMm;
}

/**
 * Inputs the stiffness map takes from the structure: every belt piece's yaw slope (measured at the parking
 * position) and, on a cartesian stage with one Y motor, the cross shaft between the two Y drive pulleys.
 * @param d - validated design
 * @param t - travel and layout
 * @param pulleyRadiusM - drive pulley pitch radius [m]
 * @returns yaw slopes [mm/rad], the shaft [N/m at the belt] and the values used
 * @see docs/models/structural-modes.md
 */
export function structureStiffness(d: DesignInput, t: TravelInfo, pulleyRadiusM: number): StructureStiffness {
  const park = { x: t.originXMm + t.xMm / 2, y: t.originYMm + t.yMm / 2 };
  const beam = d.gantryBeam;
  const typ = typicalGantryBeam(d.frame.extrusionMm);
  const info: StructureInfo = {
    gantryBeam: {
      spanMm: gantrySpanMm(d),
      secondMomentMm4: beam.secondMomentMm4 ?? typ.secondMomentMm4,
      modulusGPa: beam.modulusGPa ?? typ.modulusGPa,
      massKgPerM: beam.massKgPerM ?? typ.massKgPerM,
      typical: {
        secondMoment: beam.secondMomentMm4 === null,
        modulus: beam.modulusGPa === null,
        mass: beam.massKgPerM === null,
        profile: typ.label,
      },
    },
    crossShaft: null,
  };
  let shaft: StiffnessInput['shaft'];
  if (d.mechanism === 'cartesian' && d.yMotors === 1) {
    const drives = t.layout.loops.flatMap((l) => l.elements.filter((e) => e.kind === 'drive' && l.id.startsWith('Y')));
    const xs = drives.map((e) => e.baseXMm);
    const length = xs.length >= 2 ? Math.max(...xs) - Math.min(...xs) : gantrySpanMm(d);
    const k = shaftTorsionStiffnessNmPerRad({
      diameterMm: d.crossShaft.diameterMm,
      lengthMm: length,
      shearModulusGPa: d.crossShaft.shearModulusGPa,
    });
    // The motor turns the left pulley; the right belt's pulley sits at the shaft's far end.
    const far = t.layout.loops.find((l) => l.id === 'YR');
    if (far) shaft = { loopId: far.id, stiffnessNPerM: k / (pulleyRadiusM * pulleyRadiusM) };
    info.crossShaft = {
      diameterMm: d.crossShaft.diameterMm,
      lengthMm: length,
      shearModulusGPa: d.crossShaft.shearModulusGPa,
      stiffnessNmPerRad: k,
    };
  }
  return { yawSlopesMmPerRad: yawSlopesMmPerRad(t.layout, park.x, park.y), shaft, info };
}

/** A belt as the second layer needs it: its loop, wraps at parking and its worst working tensions. */
export interface SecondLayerBelt {
  id: string;
  label: string;
  loop: LayoutLoop;
  /** Wrap of each interior element at the parking position, in loop order (element 1 … n − 2) [rad]. */
  wrapsRad: number[];
  /** Span labels and their pretension pluck frequency range over the travel [Hz]. */
  spans: { label: string; minHz: number; maxHz: number }[];
  /** Worst tight side over the travel and directions, and the largest pull a drive pulley transmits [N]. */
  worstTightN: number;
  peakPullN: number;
}

/** What the second layer takes from the first. */
export interface SecondLayerContext {
  d: DesignInput;
  k: Matrix2;
  t: TravelInfo;
  envIn: EnvelopeInput;
  env: EnvelopeResult;
  /** Index of the envelope's worst direction. */
  worstIndex: number;
  map: StiffnessResult;
  structure: StructureStiffness;
  /** Motors on each coordinate (cartesian Y: 1 or 2). */
  motorsOn: [number, number];
  /** Drive pulley pitch radius [m]. */
  pulleyRadiusM: number;
  /** Belt-line holding stiffness of one motor, k_θ/r² [N/m]. */
  motorStiffnessNPerM: number;
  /** Holding torque at the driven current, k_θ/N_r [N·m]. */
  holdingTorqueNm: number;
  /** Acceleration the design plans (or the worst direction's limit) [m/s²]. */
  plannedAccelMPerS2: number;
  belts: SecondLayerBelt[];
  motorLabels: { id: string; label: string }[];
}

/** The second-layer sections of the result. */
export interface SecondLayerResult {
  errorBudget: ErrorBudgetResult;
  modes: ModeReport[];
  /** Modes the belts do not hold at all, and why (the guides alone must). */
  modesNotHeld: { id: ModeId; label: string; message: string }[];
  lowest: { frequencyHz: number; modeId: ModeId; xMm: number; yMm: number };
  /** Lowest of all modes over the grid and which mode it is, [iy][ix]. */
  lowestMap: { frequencyHz: number[][]; modeId: ModeId[][] };
  structure: StructureInfo;
  shaping: ShapingResult;
  excitation: ExcitationResult;
  heat: HeatResult;
  loads: LoadsResult;
  job: JobResult | null;
}

const DEG = Math.PI / 180;
/**
 * The error map samples every 10th degree (a smooth maximum sampled at 10° is within 0.4 % of the true one); the
 * worst point is then checked in every direction.
 */
const ERROR_MAP_STRIDE = 10;

function isPositiveFinite(v: number): boolean {
  return Number.isFinite(v) && v > 0;
}

/**
 * Per envelope direction, the carriage force at the planned acceleration (capped at the direction's limit) and the
 * motors' load-angle lag as carriage error [N, N, mm]. In its own routine so that the section around it is not
 * compiled mid-loop.
 */
function directionForces(
  ctx: SecondLayerContext,
  kinv: Matrix2,
  r: number,
  nr: number,
): { forceXN: number[]; forceYN: number[]; loadAngleMm: number[] } {
  const { envIn, env } = ctx;
  const rMm = r * 1000;
  const forceXN: number[] = [];
  const forceYN: number[] = [];
  const loadAngleMm: number[] = [];
  const kitEnv = inverse2(transpose2(envIn.k));
  // What loadAngleErrorMm checks of its constant arguments; with them valid, a finite torque needs no check.
  const lagArgsValid = isPositiveFinite(ctx.holdingTorqueNm) && isPositiveFinite(nr) && isPositiveFinite(rMm);
  // One pass over the directions in scalars: direction cosines with exact zeros on the axes (as the envelope uses
  // them), then each motor's lag in turn.
  for (let i = 0; i < env.directionsDeg.length; i++) {
    const deg = env.directionsDeg[i];
    const a = Math.min(ctx.plannedAccelMPerS2, env.accelMaxMPerS2[i]);
    const cr = Math.cos(deg * DEG);
    const sr = Math.sin(deg * DEG);
    const c = Math.abs(cr) < 1e-12 ? 0 : cr;
    const s = Math.abs(sr) < 1e-12 ? 0 : sr;
    forceXN.push(envIn.xKg * a * c + envIn.frictionXN * Math.sign(c));
    forceYN.push(envIn.yKg * a * s + envIn.frictionYN * Math.sign(s));
    const f = motorForcesWithKit(envIn, kitEnv, deg * DEG, a);
    const tau0 = (f[0] * r) / ctx.motorsOn[0];
    const tau1 = (f[1] * r) / ctx.motorsOn[1];
    const lag0 =
      lagArgsValid && Number.isFinite(tau0)
        ? loadAngleLagMm(tau0, ctx.holdingTorqueNm, nr, rMm)
        : loadAngleErrorMm({ torqueNm: tau0, holdingTorqueNm: ctx.holdingTorqueNm, rotorTeeth: nr, pulleyRadiusMm: rMm });
    const lag1 =
      lagArgsValid && Number.isFinite(tau1)
        ? loadAngleLagMm(tau1, ctx.holdingTorqueNm, nr, rMm)
        : loadAngleErrorMm({ torqueNm: tau1, holdingTorqueNm: ctx.holdingTorqueNm, rotorTeeth: nr, pulleyRadiusMm: rMm });
    loadAngleMm.push(Math.hypot(kinv[0][0] * lag0 + kinv[0][1] * lag1, kinv[1][0] * lag0 + kinv[1][1] * lag1));
  }
  return { forceXN, forceYN, loadAngleMm };
}

function errorBudgetSection(ctx: SecondLayerContext): ErrorBudgetResult {
  const { d, k, env, map } = ctx;
  const kinv = inverse2(k);
  const r = ctx.pulleyRadiusM;
  const rMm = r * 1000;
  const nr = rotorTeeth(d.motor.stepAngleDeg);
  const { forceXN, forceYN, loadAngleMm } = directionForces(ctx, kinv, r, nr);
  // Friction each motor holds against at rest, worst combination of the guides' friction directions.
  const kit = inverse2(transpose2(k));
  const fricPull = [0, 1].map((m) => Math.abs(kit[m][0]) * d.frictionN.x + Math.abs(kit[m][1]) * d.frictionN.y);
  const bands = fricPull.map((p, m) =>
    microstepDeadband({
      frictionTorqueNm: (p * r) / ctx.motorsOn[m],
      holdingTorqueNm: ctx.holdingTorqueNm,
      rotorTeeth: nr,
      microsteps: d.driver.microsteps,
      pulleyRadiusMm: rMm,
    }),
  );
  const deadbandMm = carriageErrorMm(kinv, bands[0].deadbandMm, bands[1].deadbandMm);
  const runoutMm = carriageErrorMm(kinv, d.pulley.runoutMm, d.pulley.runoutMm);
  const dm: Matrix2 = [
    [1 / (ctx.motorStiffnessNPerM * ctx.motorsOn[0]), 0],
    [0, 1 / (ctx.motorStiffnessNPerM * ctx.motorsOn[1])],
  ];
  const cm = multiply2(multiply2(kinv, dm), transpose2(kinv));
  const grid = errorBudgetMap({
    xMm: map.xMm,
    yMm: map.yMm,
    kxxNPerM: map.kNPerM.xx,
    kxyNPerM: map.kNPerM.xy,
    kyyNPerM: map.kNPerM.yy,
    motorComplianceMPerN: cm,
    directionsDeg: env.directionsDeg,
    forceXN,
    forceYN,
    loadAngleMm,
    deadbandMm,
    runoutMm,
    mapStride: ERROR_MAP_STRIDE,
    gridStride: gridStride(map.xMm.length),
  });
  return {
    ...grid,
    biggest: biggestErrorTerm(grid.worst, {
      axialStiffnessN: d.belt.axialStiffnessN,
      accelMPerS2: ctx.plannedAccelMPerS2,
      holdingTorqueNm: d.motor.holdingTorqueNm,
      frictionXN: d.frictionN.x,
      frictionYN: d.frictionN.y,
      runoutMm: d.pulley.runoutMm,
    }),
    accelMPerS2: ctx.plannedAccelMPerS2,
    isSingleMicrostepEffective: bands.every((b) => b.isSingleMicrostepEffective),
    runoutPeriodMm: d.pulley.driveTeeth * d.belt.pitchMm,
  };
}

/** The modes' sections of the result, and each mode's highest frequency where it is the lowest (for the excitation). */
function modesSection(ctx: SecondLayerContext): {
  section: Pick<SecondLayerResult, 'modes' | 'modesNotHeld' | 'lowest' | 'lowestMap'>;
  highestWhereLowestHz: Partial<Record<ModeId, number>>;
} {
  const { d, t, map } = ctx;
  const beam = ctx.structure.info.gantryBeam;
  const carriageKg = d.masses.carriageKg + d.masses.toolKg;
  const along = (ix: number) => t.originXMm + map.xMm[ix] - d.frame.extrusionMm;
  const bendRow = map.xMm.map((_, ix) =>
    beamBendingFrequencyHz({
      spanMm: beam.spanMm,
      secondMomentMm4: beam.secondMomentMm4,
      modulusGPa: beam.modulusGPa,
      beamMassKg: (beam.massKgPerM * beam.spanMm) / 1000,
      pointMassKg: carriageKg,
      positionMm: Math.min(beam.spanMm, Math.max(0, along(ix))),
    }),
  );
  const maps: Partial<Record<ModeId, number[][]>> = {
    belt: map.lowestFrequencyHz,
    // Bending depends on the carriage's X only: every row is the same (read-only) array.
    'gantry-bending': map.yMm.map(() => bendRow),
  };
  const notHeld: SecondLayerResult['modesNotHeld'] = [];
  const yawId: ModeId = d.mechanism === 'cartesian' && d.yMotors === 1 ? 'cross-shaft' : 'gantry-yaw';
  if (map.yawAt) {
    const yaw = yawMap(ctx);
    if (yaw) maps[yawId] = yaw;
    else notHeld.push(yawNotHeld(d, yawId));
  }
  const r = lowestModeMap({ xMm: map.xMm, yMm: map.yMm, maps });
  return {
    section: {
      modes: r.modes,
      modesNotHeld: notHeld,
      lowest: r.lowest,
      lowestMap: { frequencyHz: r.lowestFrequencyHz, modeId: r.lowestModeId },
    },
    highestWhereLowestHz: r.highestWhereLowestHz,
  };
}

/** The gantry yaw mode over the grid, or null when the belts leave yaw unheld (checked first at the grid's centre). */
function yawMap(ctx: SecondLayerContext): number[][] | null {
  const { d, t, map } = ctx;
  const nx = map.xMm.length;
  const ny = map.yMm.length;
  const beam = ctx.structure.info.gantryBeam;
  const carriageKg = d.masses.carriageKg + d.masses.toolKg;
  const mid = d.frame.outerXMm / 2;
  const xMotor = t.layout.loops.flatMap((l) => l.elements).find((e) => e.kind === 'drive' && e.body === 'gantry');
  const massAt = (ix: number) =>
    gantryYawMass({
      xKg: ctx.envIn.xKg,
      gantryKg: d.masses.gantryKg,
      spanMm: beam.spanMm,
      points: [
        { massKg: carriageKg, offsetMm: t.originXMm + map.xMm[ix] - mid },
        ...(d.mechanism === 'cartesian' && xMotor ? [{ massKg: d.motor.massKg, offsetMm: xMotor.baseXMm - mid }] : []),
      ],
    });
  const args = { kNPerM: map.kNPerM, yawAt: map.yawAt!, halfSpanMm: beam.spanMm / 2, massAt };
  // A belt layout that leaves yaw unheld leaves it unheld everywhere: one point tells (the H loop's mechanism).
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const centre = gantryYawMap({
    ...args,
    kNPerM: pointStiffness(map, cx, cy),
    yawAt: () => map.yawAt!(cx, cy),
    nx: 1,
    ny: 1,
    massAt: () => massAt(cx),
  });
  if (!(centre[0][0] > 0)) return null;
  const yaw = gantryYawMap({ ...args, nx, ny, gridStride: gridStride(nx, true) });
  return yaw.some((row) => row.some((f) => !(f > 0))) ? null : yaw;
}

/** The map's condensed x/y stiffness of one grid point, as a 1 × 1 map. */
function pointStiffness(map: StiffnessResult, ix: number, iy: number): StiffnessResult['kNPerM'] {
  const p = iy * map.xMm.length + ix;
  return { xx: Float64Array.of(map.kNPerM.xx[p]), xy: Float64Array.of(map.kNPerM.xy[p]), yy: Float64Array.of(map.kNPerM.yy[p]) };
}

/** Why the belts leave the gantry's yaw to the guides. */
function yawNotHeld(d: DesignInput, yawId: ModeId): SecondLayerResult['modesNotHeld'][number] {
  return {
    id: yawId,
    label: MODE_LABELS[yawId],
    message:
      d.mechanism === 'hbot'
        ? 'The H belt does not hold the gantry square: the carriage can slide along X while the gantry turns without stretching any belt piece. Only the Y guides keep the gantry from turning (see the racking check).'
        : 'The belts do not hold the gantry square: only the Y guides keep it from turning.',
  };
}

function excitationSection(
  ctx: SecondLayerContext,
  modes: ModeReport[],
  highestWhereLowestHz: Partial<Record<ModeId, number>>,
): ExcitationResult {
  const { d, env } = ctx;
  let share = 0;
  let topBelt = 0;
  env.directionsDeg.forEach((_, i) => {
    const s = Math.max(Math.abs(env.speedShareA[i]), Math.abs(env.speedShareB[i]));
    share = Math.max(share, s);
    topBelt = Math.max(topBelt, env.speedMaxMPerS[i] * s);
  });
  const targets: ExcitationTarget[] = modes.map((m) => ({
    label: m.label,
    kind: 'mode',
    minHz: m.frequencyHz,
    maxHz: Math.max(highestWhereLowestHz[m.id] ?? 0, m.frequencyHz),
  }));
  for (const b of ctx.belts)
    for (const s of b.spans) targets.push({ label: `${b.label}: ${s.label}`, kind: 'span', minHz: s.minHz, maxHz: s.maxHz });
  const fullStepMm = (d.pulley.driveTeeth * d.belt.pitchMm) / (360 / d.motor.stepAngleDeg);
  return excitation({
    pitchMm: d.belt.pitchMm,
    fullStepMm,
    microsteps: d.driver.microsteps,
    beltSpeedPerCarriageSpeed: share,
    cruiseSpeedMPerS: d.cruiseSpeedMmPerS / 1000,
    topBeltSpeedMPerS: topBelt,
    stepRateLimitHz: d.controller.maxStepRateHz,
    targets,
  });
}

/** Pull floor of a sampled curve at a belt speed (what a motor still has at every speed up to this one) [N]. */
function floorAt(c: PullCurve, v: number): number {
  const a = Math.abs(v);
  if (a >= c.topMPerS) return a === c.topMPerS ? c.pullFloorN[c.pullFloorN.length - 1] : 0;
  const x = (a / c.topMPerS) * (c.pullFloorN.length - 1);
  const i = Math.floor(x);
  return c.pullFloorN[i] + (x - i) * (c.pullFloorN[i + 1] - c.pullFloorN[i]);
}

/**
 * The stage's limits at any angle, from the envelope input: each motor's pull is affine in the acceleration,
 * α·a + β (α and β worked out once per direction), and must stay within its lowest available pull up to its
 * belt speed.
 * @param envIn - envelope input
 * @returns acceleration [m/s²] and speed [m/s] limits along any direction
 */
export function directionLimits(envIn: EnvelopeInput): DirectionLimits {
  const kit = inverse2(transpose2(envIn.k));
  return {
    along(th) {
      const f0 = motorForcesWithKit(envIn, kit, th, 0);
      const f1 = motorForcesWithKit(envIn, kit, th, 1);
      const c = Math.cos(th);
      const s = Math.sin(th);
      const sh = [Math.abs(envIn.k[0][0] * c + envIn.k[0][1] * s), Math.abs(envIn.k[1][0] * c + envIn.k[1][1] * s)];
      const alpha = [f1[0] - f0[0], f1[1] - f0[1]];
      let speed = Infinity;
      for (let m = 0; m < 2; m++) {
        if (sh[m] > 1e-12) speed = Math.min(speed, beltSpeedForPull(envIn.pull[m], Math.abs(f0[m])) / sh[m]);
        else if (Math.abs(f0[m]) > envIn.pull[m].pullN[0]) speed = 0;
      }
      return {
        speedMPerS: Number.isFinite(speed) ? speed : 0,
        accelMPerS2(v) {
          let best = Infinity;
          for (let m = 0; m < 2; m++) {
            const p = floorAt(envIn.pull[m], v * sh[m]);
            if (Math.abs(f0[m]) > p) return 0;
            if (Math.abs(alpha[m]) > 1e-15) best = Math.min(best, (p - Math.sign(alpha[m]) * f0[m]) / Math.abs(alpha[m]));
          }
          return Math.max(0, best);
        },
      };
    },
  };
}

/** One move of the reference cycle: across the travel along a direction, rest to rest. */
function referenceMove(ctx: SecondLayerContext, deg: number, distanceMm: number) {
  const { envIn } = ctx;
  const th = deg * DEG;
  const lim = directionLimits(envIn).along(th);
  const speed = Math.min(envIn.cruiseMPerS, lim.speedMPerS);
  const accel = Math.min(ctx.plannedAccelMPerS2, speed > 0 ? lim.accelMPerS2(speed) : 0);
  const torques = (a: number) => motorForcesN(envIn, th, a).map((f, m) => (f * ctx.pulleyRadiusM) / ctx.motorsOn[m]);
  if (!(distanceMm > 0 && speed > 0 && accel > 0)) return null;
  const acc = torques(accel);
  const run = torques(0);
  const dec = torques(-accel);
  const timing = referenceMoveRmsTorqueNm({
    distanceMm,
    speedMmPerS: speed * 1000,
    accelMmPerS2: accel * 1000,
    accelTorqueNm: 0,
    cruiseTorqueNm: 0,
    decelTorqueNm: 0,
  });
  return {
    move: { directionDeg: deg, distanceMm, speedMPerS: speed, accelMPerS2: accel, moveS: timing.moveS },
    segments: [0, 1].map((m) => [
      { torqueNm: acc[m], timeS: timing.rampS },
      { torqueNm: run[m], timeS: timing.cruiseS },
      { torqueNm: dec[m], timeS: timing.rampS },
    ]),
  };
}

/** Each motor's highest mechanical power at the cruise speed over the envelope's directions [W] (its own routine: a loop). */
function mechanicalPowerW(ctx: SecondLayerContext): [number, number] {
  const { envIn, env } = ctx;
  const v = envIn.cruiseMPerS;
  let mechA = 0;
  let mechB = 0;
  const kit = inverse2(transpose2(envIn.k));
  for (let i = 0; i < env.directionsDeg.length; i++) {
    const f = motorForcesWithKit(envIn, kit, env.directionsDeg[i] * DEG, env.accelAtCruiseMPerS2[i]);
    mechA = Math.max(mechA, (Math.abs(f[0]) * Math.abs(env.speedShareA[i]) * v) / ctx.motorsOn[0]);
    mechB = Math.max(mechB, (Math.abs(f[1]) * Math.abs(env.speedShareB[i]) * v) / ctx.motorsOn[1]);
  }
  return [mechA, mechB];
}

function heatSection(ctx: SecondLayerContext): HeatResult {
  const { d } = ctx;
  const mech = mechanicalPowerW(ctx);
  // Reference cycle: across the whole X travel, then across the whole Y travel, back to back.
  const moves = [referenceMove(ctx, 0, ctx.t.xMm), referenceMove(ctx, 90, ctx.t.yMm)].filter((x) => x !== null);
  const rms = [0, 1].map((m) => rmsTorqueNm(moves.flatMap((x) => x.segments[m])));
  const copper = copperLossW({ currentRmsA: d.driver.currentRmsA, phaseResistanceOhm: d.motor.phaseResistanceOhm });
  const motors: HeatResult['motors'] = [];
  ctx.motorLabels.forEach((ml, m) => {
    for (let n = 0; n < ctx.motorsOn[m]; n++) {
      motors.push({
        id: ctx.motorsOn[m] > 1 ? `${ml.id}${n + 1}` : ml.id,
        label: ctx.motorsOn[m] > 1 ? `${ml.label} (${n === 0 ? 'left' : 'right'})` : ml.label,
        copperLossW: copper,
        mechanicalW: mech[m],
        rmsTorqueNm: rms[m],
        continuousTorqueNm: d.motor.holdingTorqueNm,
      });
    }
  });
  const supply = supplySizing({
    motors: motors.map((x) => ({ copperLossW: x.copperLossW, mechanicalW: x.mechanicalW })),
    supplyV: d.driver.supplyV,
  });
  return {
    motors,
    totalCopperLossW: motors.reduce((sum, x) => sum + x.copperLossW, 0),
    supply: { ...supply, supplyV: d.driver.supplyV },
    referenceMoves: moves.map((x) => x.move),
  };
}

function loadsSection(ctx: SecondLayerContext): LoadsResult {
  const pulleys: PulleyLoadInput[] = [];
  const t0 = ctx.d.pretensionN;
  for (const b of ctx.belts) {
    b.loop.elements.forEach((e, j) => {
      if (e.kind === 'clamp' || j === 0 || j === b.loop.elements.length - 1) return;
      const wrap = b.wrapsRad[j - 1] ?? 0;
      const tight = b.worstTightN;
      pulleys.push({
        id: e.id,
        label: `${b.label}: ${e.label}`,
        kind: e.kind === 'drive' ? 'drive' : 'idler',
        wrapRad: wrap,
        atPretensionN: [t0, t0],
        atPeakN: e.kind === 'drive' ? [tight, tight - b.peakPullN] : [tight, tight],
      });
    });
  }
  return shaftLoads({ pulleys, motorShaftRatingN: ctx.d.radialLoadRating.motorShaftN, idlerRatingN: ctx.d.radialLoadRating.idlerN });
}

/** A speed no stage reaches: "no cruise limit" for the job at the motors' limits [m/s]. */
const UNLIMITED_SPEED_M_PER_S = 1000;

function jobSection(ctx: SecondLayerContext, points: readonly JobPoint[]): JobResult {
  const d = ctx.d;
  const common = {
    points,
    limits: directionLimits(ctx.envIn),
    jerkMPerS3: d.controller.jerkMmPerS3 !== null ? d.controller.jerkMmPerS3 / 1000 : null,
    travel: { xMm: ctx.t.xMm, yMm: ctx.t.yMm },
  };
  const planned = scheduleJob({
    ...common,
    cruiseSpeedMPerS: ctx.envIn.cruiseMPerS,
    plannedAccelMPerS2: d.plannedAccelMmPerS2 !== null ? d.plannedAccelMmPerS2 / 1000 : null,
  });
  const fastest = scheduleJob({ ...common, cruiseSpeedMPerS: UNLIMITED_SPEED_M_PER_S, plannedAccelMPerS2: null });
  return { ...planned, atLimits: { totalS: fastest.totalS, moveS: fastest.moveS } };
}

/**
 * Evaluates the second layer from the first layer's numbers: the error budget on the stiffness-map grid (reusing
 * its per-point stiffness), the structural modes and the lowest of them, vibration control, excitation, heat,
 * shaft loads and the job.
 * @param ctx - what the first layer computed
 * @returns the second-layer sections
 * @see docs/models/
 */
export function evaluateSecondLayer(ctx: SecondLayerContext): SecondLayerResult {
  const { section: modes, highestWhereLowestHz } = modesSection(ctx);
  const d = ctx.d;
  const job = d.job && d.job.points.length > 0 ? jobSection(ctx, d.job.points) : null;
  return {
    errorBudget: errorBudgetSection(ctx),
    ...modes,
    structure: ctx.structure.info,
    shaping: vibrationControl({
      frequencyHz: modes.lowest.frequencyHz,
      modeId: modes.lowest.modeId,
      speedMPerS: ctx.envIn.cruiseMPerS,
      toleranceMm: d.ringingToleranceMm,
    }),
    excitation: excitationSection(ctx, modes.modes, highestWhereLowestHz),
    heat: heatSection(ctx),
    loads: loadsSection(ctx),
    job,
  };
}

/**
 * Pluck frequency range of every free span of a loop over the travel at the pretension: spans are affine in the
 * carriage position, so their extremes sit at the travel's corners; a span is kept at least `minSpanMm` long.
 * @param model - the loop's affine span model
 * @param t - travel
 * @param labels - span label for each span (in path order)
 * @param d - design (pretension, belt mass)
 * @param minSpanMm - shortest span length considered [mm]
 * @returns one band per span [Hz]
 */
export function spanBands(
  model: { spans: { l0Mm: number; gx: number; gy: number }[] },
  t: TravelInfo,
  labels: string[],
  d: DesignInput,
  minSpanMm: number,
): SecondLayerBelt['spans'] {
  const corners = [
    [t.originXMm, t.originYMm],
    [t.originXMm + t.xMm, t.originYMm],
    [t.originXMm, t.originYMm + t.yMm],
    [t.originXMm + t.xMm, t.originYMm + t.yMm],
  ];
  return model.spans
    .map((s, i) => {
      const lengths = corners.map(([x, y]) => Math.max(minSpanMm, s.l0Mm + s.gx * x + s.gy * y));
      // The string law f = √(T/μ)/(2L) (docs/models/excitation.md), the pretension and belt already validated.
      const wave = Math.sqrt(d.pretensionN / d.belt.linearMassKgPerM);
      const f = (l: number) => wave / (2 * (l / 1000));
      return {
        label: labels[i] ?? `span ${i + 1}`,
        minHz: f(Math.max(...lengths)),
        maxHz: f(Math.min(...lengths)),
        length: Math.max(...lengths),
      };
    })
    .filter((s) => s.length > minSpanMm)
    .map(({ label, minHz, maxHz }) => ({ label, minHz, maxHz }));
}

export type { DirectionLimits };
