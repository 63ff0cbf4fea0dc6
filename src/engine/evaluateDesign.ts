import { solveLoop, type MotorVar } from './beltLayout';
import { CAUTIONS } from './cautions';
import { designChecks, teethInMeshFactor } from './checks';
import { fullStepsPerRev } from './drive';
import { computeEnvelope, motorForcesN, samplePullCurve, scalePullCurve, type EnvelopeInput } from './envelope';
import { frameToTravel } from './frame';
import { kinematicsMatrix } from './kinematics';
import { inverse2, type Matrix2 } from './linalg';
import { effectiveMassKg, movingMassKg, pulleyInertiaEstimateKgM2 } from './mass';
import { motorHoldingStiffnessNmPerRad, torqueConstantNmPerA, torqueSpeedFunction } from './motorTorque';
import { CLAMP_ALLOWANCE_MM, partsList } from './partsList';
import { guideReactionN, rackingMomentPerNewtonM, rackingTurnSpacingMm } from './racking';
import { parseDesign, type DesignInput } from './schema';
import { stiffnessMap } from './stiffness';
import { spanFrequencyHz } from './tension';
import { layoutDrawing } from './layoutDrawing';
import type { AxisLimits, BeltReport, DesignResult, RingingFigure } from './types';
import { ENGINE_VERSION } from './version';

/** Number of directions of the envelope: one per degree. */
export const ENVELOPE_DIRECTIONS = 360;

const DEG = 180 / Math.PI;

function directionWords(dx: number, dy: number): string {
  const parts: string[] = [];
  if (Math.abs(dx) > 1e-12) parts.push(dx > 0 ? '+X' : '−X');
  if (Math.abs(dy) > 1e-12) parts.push(dy > 0 ? '+Y' : '−Y');
  let deg = Math.atan2(dy, dx) * DEG;
  if (deg < 0) deg += 360;
  return `${parts.join(' ')} (${Math.round(deg)}°)`;
}

/**
 * Available torque of one motor at a shaft speed, model or table (no margin).
 * @param d - validated design
 * @returns torque function [N·m at rev/s], its source and the speed where it ends [rev/s]
 */
function torqueSource(d: DesignInput): { at: (n: number) => number; source: 'model' | 'table'; topRevPerS: number } {
  const table = d.motor.torqueCurve && d.motor.torqueCurve.length > 0;
  let top: number;
  if (table) {
    const curve = d.motor.torqueCurve!;
    top = curve[curve.length - 1].speedRevPerS;
  } else {
    const ke = torqueConstantNmPerA(d.motor);
    top = d.driver.supplyV / ke / (2 * Math.PI);
  }
  if (d.motor.maxSpeedRevPerS !== null) top = Math.min(top, d.motor.maxSpeedRevPerS);
  const torque = torqueSpeedFunction(d.motor, d.driver);
  return {
    at: (n: number) => (n > top ? 0 : torque(n)),
    source: table ? 'table' : 'model',
    topRevPerS: Math.max(top, 1e-9),
  };
}

function ringing(accel: number, fHz: number, tolMm: number): RingingFigure {
  const w2 = (2 * Math.PI * fHz) ** 2;
  return {
    accelMPerS2: accel,
    amplitudeMm: w2 > 0 ? (accel / w2) * 1000 : Infinity,
    accelForToleranceMPerS2: (tolMm / 1000) * w2,
  };
}

/**
 * Evaluates a design: validates it with the schema, then computes kinematics, drive numbers, travel, belt
 * layout, masses, motor torque, the acceleration/speed envelope, belt tensions, the stiffness map, ringing,
 * racking, parts and checks (engine.md §1–9).
 * @param input - a design document (format.md), unvalidated
 * @returns the full result (format.md "Result" plus drawing data)
 * @throws EngineInputError with field paths when the design is invalid
 */
export function evaluateDesign(input: unknown): DesignResult {
  const d = parseDesign(input);
  return evaluateValidDesign(d);
}

/**
 * Same as {@link evaluateDesign} for an already validated design (skips the schema pass).
 * @param d - validated design
 * @returns the full result
 */
export function evaluateValidDesign(d: DesignInput): DesignResult {
  const mech = d.mechanism;
  const k: Matrix2 = kinematicsMatrix(mech, d.motorDirection);
  const kinv = inverse2(k);

  // --- drive numbers (engine.md §2)
  const p = d.belt.pitchMm;
  const zD = d.pulley.driveTeeth;
  const zI = d.pulley.idlerTeeth;
  const travelPerRev = zD * p;
  const pitchDiameter = travelPerRev / Math.PI;
  const rM = pitchDiameter / 2 / 1000;
  const rIM = (zI * p) / (2 * Math.PI) / 1000;
  const full = fullStepsPerRev(d.motor.stepAngleDeg);
  const fullStep = travelPerRev / full;
  const micro = fullStep / d.driver.microsteps;
  const colMax = (f: (j: number) => number) => Math.max(Math.abs(f(0)), Math.abs(f(1)));
  const microstepMm = {
    x: micro * colMax((j) => kinv[0][j]),
    y: micro * colMax((j) => kinv[1][j]),
    diagonal: (micro * colMax((j) => kinv[0][j] + kinv[1][j])) / Math.SQRT2,
  };

  // --- travel and layout (engine.md §3)
  const t = frameToTravel(d);
  const parking = { xMm: t.xMm / 2, yMm: t.yMm / 2 };
  const pcx = t.originXMm + parking.xMm;
  const pcy = t.originYMm + parking.yMm;
  const states = t.layout.loops.map((loop) => solveLoop(loop, pcx, pcy));

  // --- masses (engine.md §4)
  const mm = movingMassKg({
    mechanism: mech,
    carriageKg: d.masses.carriageKg,
    toolKg: d.masses.toolKg,
    gantryKg: d.masses.gantryKg,
    motorKg: d.motor.massKg,
  });
  const estimated = d.pulley.driveInertiaKgM2 === null || d.pulley.idlerInertiaKgM2 === null;
  const jDrive = d.pulley.driveInertiaKgM2 ?? pulleyInertiaEstimateKgM2({ teeth: zD, pitchMm: p, beltWidthMm: d.belt.widthMm });
  const jIdler = d.pulley.idlerInertiaKgM2 ?? pulleyInertiaEstimateKgM2({ teeth: zI, pitchMm: p, beltWidthMm: d.belt.widthMm });
  const reflectedPerMotor = (d.motor.rotorInertiaKgM2 + jDrive) / (rM * rM);
  const motorsOn: [number, number] = [1, mech === 'cartesian' ? d.yMotors : 1];
  const drivesOn: [number, number] = [0, 0];
  const beltCarried: [number, number] = [0, 0];
  let beltKg = 0;
  t.layout.loops.forEach((loop, i) => {
    const loopKg = (states[i].path.lengthMm / 1000) * d.belt.linearMassKgPerM;
    beltKg += loopKg;
    const idlers = loop.elements.filter((e) => e.kind === 'idler').length;
    const loopEq = loopKg + (idlers * jIdler) / (rIM * rIM);
    beltCarried[0] += loop.massShare.a * loopEq;
    beltCarried[1] += loop.massShare.b * loopEq;
    for (const e of loop.elements) {
      if (e.kind === 'drive') {
        const coord = t.layout.motorVars.find((v) => v.id === e.motor)!.coordinate;
        drivesOn[coord] += 1;
      }
    }
  });
  const rotorSide: [number, number] = [0, 1].map((i) => (motorsOn[i] * d.motor.rotorInertiaKgM2 + drivesOn[i] * jDrive) / (rM * rM)) as [
    number,
    number,
  ];
  const motorEq: [number, number] = [rotorSide[0] + beltCarried[0], rotorSide[1] + beltCarried[1]];

  // --- motor torque and envelope (engine.md §5, §6)
  const tq = torqueSource(d);
  const beltPerRev = 2 * Math.PI * rM;
  // Both motor coordinates use the same motor, so one sampled curve serves both (scaled by motor count).
  const unit = samplePullCurve((w) => (d.torqueMargin * tq.at(w / beltPerRev)) / rM, tq.topRevPerS * beltPerRev);
  const curves = [0, 1].map((i) => scalePullCurve(unit, motorsOn[i])) as EnvelopeInput['pull'];
  const envIn: EnvelopeInput = {
    k,
    xKg: mm.xKg,
    yKg: mm.yKg,
    motorEquivalentKg: motorEq,
    beltCarriedKg: beltCarried,
    frictionXN: d.frictionN.x,
    frictionYN: d.frictionN.y,
    pull: curves,
    cruiseMPerS: d.cruiseSpeedMmPerS / 1000,
    directions: ENVELOPE_DIRECTIONS,
  };
  const env = computeEnvelope(envIn);
  const n = ENVELOPE_DIRECTIONS;
  const axis = (i: number): AxisLimits => ({
    directionDeg: env.directionsDeg[i],
    accelMaxMPerS2: env.accelMaxMPerS2[i],
    accelAtCruiseMPerS2: env.accelAtCruiseMPerS2[i],
    speedMaxMPerS: env.speedMaxMPerS[i],
  });
  let worstI = 0;
  for (let i = 1; i < n; i++) if (env.accelMaxMPerS2[i] < env.accelMaxMPerS2[worstI] - 1e-12) worstI = i;
  const axes = { x: axis(0), y: axis(n / 4), diagonal: axis(n / 8), worst: axis(worstI) };
  const bestAccel = Math.max(...env.accelMaxMPerS2);
  const worstSpeed = Math.min(...env.speedMaxMPerS);
  const bestSpeed = Math.max(...env.speedMaxMPerS);

  // --- belts and tension (engine.md §3, §7)
  const belts: BeltReport[] = t.layout.loops.map((loop, i) => {
    const st = states[i];
    const lenMm = st.path.lengthMm;
    const loopTeeth = Math.ceil(lenMm / p - 1e-9);
    let tim = Infinity;
    let wrapDeg = 0;
    loop.elements.forEach((e, j) => {
      if (e.kind !== 'drive') return;
      const w = st.path.wraps[j - 1].wrapRad;
      const m = (e.teeth * w) / (2 * Math.PI);
      if (m < tim) {
        tim = m;
        wrapDeg = w * DEG;
      }
    });
    const label = (id: string) => loop.elements.find((e) => e.id === id)?.label ?? id;
    const body = (id: string) => loop.elements.find((e) => e.id === id)?.body;
    const spans = st.path.spans.map((s) => ({
      id: `${loop.id}:${s.from.split('.')[1]}->${s.to.split('.')[1]}`,
      label: `${label(s.from)} → ${label(s.to)}`,
      from: s.from,
      to: s.to,
      lengthMm: s.lengthMm,
      targetFrequencyHz:
        s.lengthMm > 0 ? spanFrequencyHz({ tensionN: d.pretensionN, linearMassKgPerM: d.belt.linearMassKgPerM, spanMm: s.lengthMm }) : 0,
      // A span whose two ends ride the same body keeps its length wherever the carriage is: the one to pluck.
      fixedLength: body(s.from) === body(s.to),
    }));
    const fixed = spans.filter((x) => x.fixedLength && x.lengthMm > 0);
    const reference = fixed.length > 0 ? fixed.reduce((a, b) => (b.lengthMm > a.lengthMm ? b : a)) : null;
    const share = loop.massShare;
    // A loop carries the pull of the motor coordinate(s) it belongs to; two Y loops share the Y pull.
    const loopsOnB = t.layout.loops.filter((l) => l.massShare.b > 0).length;
    const peak =
      share.a > 0 && share.b > 0
        ? Math.max(env.peakBeltPullN[0], env.peakBeltPullN[1])
        : share.a > 0
          ? env.peakBeltPullN[0]
          : env.peakBeltPullN[1] / loopsOnB;
    const allowable = d.belt.allowableTensionN * teethInMeshFactor(tim);
    return {
      id: loop.id,
      label: loop.label,
      loopLengthMm: lenMm,
      loopTeeth,
      cutLengthMm: loopTeeth * p + 2 * CLAMP_ALLOWANCE_MM,
      teethInMesh: tim,
      driveWrapDeg: wrapDeg,
      spans,
      referenceSpanId: reference ? reference.id : null,
      arms: st.pieces.map((pc) => ({ from: pc.from, to: pc.to, lengthMm: pc.lengthMm })),
      massKg: (lenMm / 1000) * d.belt.linearMassKgPerM,
      peakPullN: peak,
      tightSideN: d.pretensionN + peak / 2,
      slackSideN: d.pretensionN - peak / 2,
      allowableTensionN: allowable,
    };
  });

  // --- stiffness map and ringing (engine.md §7)
  const kTheta = motorHoldingStiffnessNmPerRad(d.motor, d.driver);
  const kMotor = kTheta / (rM * rM);
  const motorStiffness: Record<MotorVar, number> = { A: kMotor, B: kMotor, B2: kMotor };
  const map = stiffnessMap({
    models: t.models,
    motorStiffnessNPerM: motorStiffness,
    axialStiffnessN: d.belt.axialStiffnessN,
    xKg: mm.xKg,
    yKg: mm.yKg,
    originXMm: t.originXMm,
    originYMm: t.originYMm,
    travelXMm: t.xMm,
    travelYMm: t.yMm,
    points: d.map.points,
  });
  const fMin = map.min.frequencyHz;
  const tol = d.ringingToleranceMm;
  const plannedAccel = d.plannedAccelMmPerS2 !== null ? d.plannedAccelMmPerS2 / 1000 : axes.worst.accelMaxMPerS2;

  // --- racking (engine.md §7)
  const spacing = rackingTurnSpacingMm(t.layout);
  const perN = rackingMomentPerNewtonM({ mechanism: mech, turnSpacingMm: spacing });
  const peakMoment = perN * env.peakForceXN;
  const guideSpan = d.frame.gantryYMm;

  // --- torque–speed samples and operating points for the motor chart
  const samples = 101;
  const topShow = tq.topRevPerS;
  const speeds: number[] = [];
  const torques: number[] = [];
  for (let i = 0; i < samples; i++) {
    const s = (topShow * i) / (samples - 1);
    speeds.push(s);
    torques.push(tq.at(s));
  }
  const ops: DesignResult['torqueSpeed']['operatingPoints'] = [];
  const named: [string, number, AxisLimits][] = [
    ['X', 0, axes.x],
    ['Y', Math.PI / 2, axes.y],
    ['diagonal', Math.PI / 4, axes.diagonal],
  ];
  for (const [nm, th, ax] of named) {
    const sh = [k[0][0] * Math.cos(th) + k[0][1] * Math.sin(th), k[1][0] * Math.cos(th) + k[1][1] * Math.sin(th)];
    for (const [when, v, a] of [
      ['at rest', 0, ax.accelMaxMPerS2],
      ['at cruise', envIn.cruiseMPerS, ax.accelAtCruiseMPerS2],
    ] as [string, number, number][]) {
      const f = motorForcesN(envIn, th, a);
      (['A', 'B'] as const).forEach((m, i) => {
        ops.push({
          label: `${nm} move ${when}, motor ${m}`,
          motor: m,
          speedRevPerS: (Math.abs(sh[i]) * v) / beltPerRev,
          torqueNm: (Math.abs(f[i]) * rM) / motorsOn[i],
        });
      });
    }
  }

  // --- sign convention and motors
  const words = (j: number) => directionWords(kinv[0][j], kinv[1][j]);
  const motorLabels: [string, string] = mech === 'cartesian' ? ['X', 'Y'] : ['A', 'B'];
  const motors: DesignResult['motors'] = [
    { id: 'A', axisLabel: motorLabels[0], count: 1, drives: mech === 'hbot' ? 'belt H' : mech === 'corexy' ? 'belt A' : 'belt X' },
    {
      id: 'B',
      axisLabel: motorLabels[1],
      count: motorsOn[1],
      drives:
        mech === 'hbot'
          ? 'belt H'
          : mech === 'corexy'
            ? 'belt B'
            : d.yMotors === 2
              ? 'belts Y (one motor per side)'
              : 'belts Y (through the cross shaft)',
    },
  ];

  // --- drawing
  const drawing = layoutDrawing({
    layout: t.layout,
    states,
    frame: d.frame,
    beltWidthMm: d.belt.widthMm,
    parkXMm: pcx,
    parkYMm: pcy,
    origin: { xMm: t.originXMm, yMm: t.originYMm },
    travel: { xMm: t.xMm, yMm: t.yMm },
  });

  const ringingFig = {
    x: ringing(axes.x.accelMaxMPerS2, fMin, tol),
    y: ringing(axes.y.accelMaxMPerS2, fMin, tol),
    worst: ringing(axes.worst.accelMaxMPerS2, fMin, tol),
    planned: ringing(plannedAccel, fMin, tol),
  };

  const checks = designChecks({
    torqueMargin: d.torqueMargin,
    currentRmsA: d.driver.currentRmsA,
    ratedCurrentA: d.motor.ratedCurrentA,
    belts,
    pretensionN: d.pretensionN,
    driveTeeth: zD,
    idlerTeeth: zI,
    minPulleyTeeth: d.belt.minPulleyTeeth,
    ringingPlanned: ringingFig.planned,
    ringingToleranceMm: tol,
    plannedAccelMPerS2: d.plannedAccelMmPerS2 !== null ? plannedAccel : null,
    worstAccelMPerS2: axes.worst.accelMaxMPerS2,
    bestAccelMPerS2: bestAccel,
    cruiseSpeedMPerS: envIn.cruiseMPerS,
    worstSpeedMPerS: worstSpeed,
    bestSpeedMPerS: bestSpeed,
    travel: { xMm: t.xMm, yMm: t.yMm },
    outer: { xMm: d.frame.outerXMm, yMm: d.frame.outerYMm },
    wantedTravel: d.wantedTravel,
    toolKg: d.masses.toolKg,
    toolHoldN: d.toolMount ? d.toolMount.holdN : null,
    // With a planned acceleration the machine is meant to run at it; otherwise the best the motors give anywhere.
    toolAccelMPerS2: d.plannedAccelMmPerS2 !== null ? plannedAccel : bestAccel,
  });

  return {
    engineVersion: ENGINE_VERSION,
    mechanism: mech,
    name: d.name,
    kinematics: {
      matrix: k,
      inverse: kinv,
      singleMotorDirectionDeg: {
        a: (Math.atan2(kinv[1][0], kinv[0][0]) * DEG + 360) % 360,
        b: (Math.atan2(kinv[1][1], kinv[0][1]) * DEG + 360) % 360,
      },
    },
    signConvention: {
      motorDirection: d.motorDirection,
      a: `A positive step of motor ${motorLabels[0]} alone moves the carriage toward ${words(0)}.`,
      b: `A positive step of motor ${motorLabels[1]} alone moves the carriage toward ${words(1)}.`,
    },
    motors,
    drive: {
      pitchDiameterMm: pitchDiameter,
      travelPerRevMm: travelPerRev,
      stepsPerMm: (full * d.driver.microsteps) / travelPerRev,
      fullStepMm: fullStep,
      fullStepsPerRev: full,
      microsteps: d.driver.microsteps,
      microstepBeltMm: micro,
      microstepMm,
    },
    travel: { xMm: t.xMm, yMm: t.yMm, limitedBy: t.limitedBy },
    parking,
    mass: {
      xKg: mm.xKg,
      yKg: mm.yKg,
      reflectedPerMotorKg: reflectedPerMotor,
      motorEquivalentKg: { a: motorEq[0], b: motorEq[1] },
      beltKg,
      effectiveKg: env.directionsDeg.map((deg) =>
        effectiveMassKg({ k, xKg: mm.xKg, yKg: mm.yKg, motorEquivalentKg: motorEq, directionRad: deg / DEG }),
      ),
      pulleyInertiaKgM2: { drive: jDrive, idler: jIdler, estimated },
    },
    envelope: {
      directionsDeg: env.directionsDeg,
      accelMaxMPerS2: env.accelMaxMPerS2,
      accelAtCruiseMPerS2: env.accelAtCruiseMPerS2,
      speedMaxMPerS: env.speedMaxMPerS,
      limitingMotor: env.limitingMotor,
      axes,
      cruiseSpeedMPerS: envIn.cruiseMPerS,
    },
    coupling: {
      speedShare: { a: env.speedShareA, b: env.speedShareB },
      forceShare: { a: env.forceShareA, b: env.forceShareB },
    },
    torqueSpeed: {
      source: tq.source,
      speedRevPerS: speeds,
      torqueNm: torques,
      usableTorqueNm: torques.map((x) => x * d.torqueMargin),
      operatingPoints: ops,
    },
    belts,
    stiffness: {
      xMm: map.xMm,
      yMm: map.yMm,
      lowestFrequencyHz: map.lowestFrequencyHz,
      min: map.min,
      ringing: ringingFig,
      toleranceMm: tol,
    },
    racking: {
      momentPerNewtonM: perN,
      turnSpacingMm: spacing,
      peakForceXN: env.peakForceXN,
      peakMomentNm: peakMoment,
      guideSpanMm: guideSpan,
      guideReactionN: guideReactionN({ momentNm: peakMoment, guideSpanMm: guideSpan }),
    },
    layout: drawing,
    partsList: partsList({
      layout: t.layout,
      belts,
      yMotors: d.yMotors,
      beltPitchMm: p,
      beltWidthMm: d.belt.widthMm,
      driveTeeth: zD,
      idlerTeeth: zI,
      stepAngleDeg: d.motor.stepAngleDeg,
      holdingTorqueNm: d.motor.holdingTorqueNm,
      ratedCurrentA: d.motor.ratedCurrentA,
    }),
    checks,
    cautions: CAUTIONS.map((c) => ({ ...c })),
  };
}
