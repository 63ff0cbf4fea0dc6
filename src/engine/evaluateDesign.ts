import { solveLoop, type LoopState, type MotorVar } from './beltLayout';
import { beltTensionOverTravel, type LoopTensionResult } from './beltTensionMap';
import { CAUTIONS } from './cautions';
import { designChecks, MIN_TEETH_IN_MESH, teethInMeshFactor } from './checks';
import { secondLayerChecks } from './secondLayerChecks';
import { torqueTableCheck } from './torqueTableCheck';
import { fullStepsPerRev } from './drive';
import { computeEnvelope, motorForcesN, samplePullCurve, scalePullCurve, type EnvelopeInput, type EnvelopeResult } from './envelope';
import { frameToTravel, type TravelInfo } from './frame';
import { kinematicsMatrix } from './kinematics';
import { slowestIndex } from './slowestDirection';
import { inverse2, type Matrix2 } from './linalg';
import { effectiveMassKg, movingMassKg, pulleyInertiaEstimateKgM2 } from './mass';
import { microstepFigures } from './microstep';
import { modelTopSpeedRevPerS, motorHoldingStiffnessNmPerRad, torqueConstantNmPerA, torqueSpeedFunction } from './motorTorque';
import { CLAMP_ALLOWANCE_MM, partsList } from './partsList';
import { guideReactionN, rackingMomentPerNewtonM, rackingTurnSpacingMm } from './racking';
import { parseDesignWithTravel, type DesignInput } from './schema';
import { evaluateSecondLayer, spanBands, structureStiffness, type SecondLayerResult, type StructureStiffness } from './secondLayer';
import { stiffnessMap, type StiffnessResult } from './stiffness';
import { spanFrequencyHz } from './tension';
import { TYPICAL_YAW_MOMENT_RATING_NM, typicalToothAllowableN } from './typicalValues';
import { layoutDrawing } from './layoutDrawing';
import type { AxisLimits, BeltReport, DesignResult, RingingFigure } from './types';
import { ENGINE_VERSION } from './version';

// The models behind every step are in docs/ (docs/README.md lists them).

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

/** Available torque of one motor (model or table, no margin), where its usable curve ends and V/k_e. */
interface TorqueSource {
  at: (revPerS: number) => number;
  source: 'model' | 'table';
  topRevPerS: number;
  backEmfSpeedRevPerS: number;
}

/**
 * Available torque of one motor at a shaft speed, model or table (no margin). The model's curve has no ceiling
 * at V/k_e; it ends where the model stops being trustworthy (modelTopSpeedRevPerS), a table at its last row,
 * and both at the designer's shaft speed limit.
 */
function torqueSource(d: DesignInput): TorqueSource {
  const table = d.motor.torqueCurve && d.motor.torqueCurve.length > 0;
  let top = table ? d.motor.torqueCurve![d.motor.torqueCurve!.length - 1].speedRevPerS : modelTopSpeedRevPerS(d.motor, d.driver);
  if (d.motor.maxSpeedRevPerS !== null) top = Math.min(top, d.motor.maxSpeedRevPerS);
  const torque = torqueSpeedFunction(d.motor, d.driver);
  return {
    at: (n: number) => (n > top ? 0 : torque(n)),
    source: table ? 'table' : 'model',
    topRevPerS: Math.max(top, 1e-9),
    backEmfSpeedRevPerS: d.driver.supplyV / torqueConstantNmPerA(d.motor) / (2 * Math.PI),
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

/** Ringing at the axes' and the worst direction's limits and at the planned acceleration, at the lowest belt mode. */
function ringingFigures(es: EnvelopeSection, fHz: number, tolMm: number, plannedAccel: number): DesignResult['stiffness']['ringing'] {
  return {
    x: ringing(es.axes.x.accelMaxMPerS2, fHz, tolMm),
    y: ringing(es.axes.y.accelMaxMPerS2, fHz, tolMm),
    worst: ringing(es.axes.worst.accelMaxMPerS2, fHz, tolMm),
    planned: ringing(plannedAccel, fHz, tolMm),
  };
}

/** The second layer's own sections of the result (everything but the lowest-mode fields of `stiffness`). */
function secondLayerSections(
  second: SecondLayerResult,
): Pick<DesignResult, 'errorBudget' | 'modes' | 'modesNotHeld' | 'structure' | 'shaping' | 'excitation' | 'heat' | 'loads' | 'job'> {
  const { errorBudget, modes, modesNotHeld, structure, shaping, excitation, heat, loads, job } = second;
  return { errorBudget, modes, modesNotHeld, structure, shaping, excitation, heat, loads, job };
}

/** Drive pulley radius and the drive numbers of the result (docs/models/resolution.md). */
function driveNumbers(d: DesignInput, k: Matrix2): { rM: number; section: DesignResult['drive'] } {
  const p = d.belt.pitchMm;
  const travelPerRev = d.pulley.driveTeeth * p;
  const full = fullStepsPerRev(d.motor.stepAngleDeg);
  const fullStep = travelPerRev / full;
  const micro = fullStep / d.driver.microsteps;
  return {
    rM: travelPerRev / Math.PI / 2 / 1000,
    section: {
      pitchDiameterMm: travelPerRev / Math.PI,
      travelPerRevMm: travelPerRev,
      stepsPerMm: (full * d.driver.microsteps) / travelPerRev,
      fullStepMm: fullStep,
      fullStepsPerRev: full,
      microsteps: d.driver.microsteps,
      microstepBeltMm: micro,
      microstep: microstepFigures(k, micro),
    },
  };
}

/** Moving masses and each motor coordinate's belt-line equivalent mass (docs/models/envelope.md §2). */
interface MassModel {
  xKg: number;
  yKg: number;
  motorsOn: [number, number];
  motorEq: [number, number];
  beltCarried: [number, number];
  reflectedPerMotorKg: number;
  beltKg: number;
  jDrive: number;
  jIdler: number;
  estimated: boolean;
}

function massModel(d: DesignInput, t: TravelInfo, states: LoopState[], rM: number): MassModel {
  const p = d.belt.pitchMm;
  const rIM = (d.pulley.idlerTeeth * p) / (2 * Math.PI) / 1000;
  const mm = movingMassKg({
    mechanism: d.mechanism,
    carriageKg: d.masses.carriageKg,
    toolKg: d.masses.toolKg,
    gantryKg: d.masses.gantryKg,
    motorKg: d.motor.massKg,
  });
  const w = d.belt.widthMm;
  const jDrive =
    d.pulley.driveInertiaKgM2 ?? pulleyInertiaEstimateKgM2({ teeth: d.pulley.driveTeeth, pitchMm: p, beltWidthMm: w, hasHub: true });
  const jIdler =
    d.pulley.idlerInertiaKgM2 ?? pulleyInertiaEstimateKgM2({ teeth: d.pulley.idlerTeeth, pitchMm: p, beltWidthMm: w, hasHub: false });
  const motorsOn: [number, number] = [1, d.mechanism === 'cartesian' ? d.yMotors : 1];
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
    for (const e of loop.elements) if (e.kind === 'drive') drivesOn[t.layout.motorVars.find((v) => v.id === e.motor)!.coordinate] += 1;
  });
  const rotorSide = [0, 1].map((i) => (motorsOn[i] * d.motor.rotorInertiaKgM2 + drivesOn[i] * jDrive) / (rM * rM));
  return {
    xKg: mm.xKg,
    yKg: mm.yKg,
    motorsOn,
    motorEq: [rotorSide[0] + beltCarried[0], rotorSide[1] + beltCarried[1]],
    beltCarried,
    reflectedPerMotorKg: (d.motor.rotorInertiaKgM2 + jDrive) / (rM * rM),
    beltKg,
    jDrive,
    jIdler,
    estimated: d.pulley.driveInertiaKgM2 === null || d.pulley.idlerInertiaKgM2 === null,
  };
}

/** The mass section of the result: moving masses, each motor's equivalent mass and the effective mass per direction. */
function massSection(k: Matrix2, m: MassModel, env: EnvelopeResult): DesignResult['mass'] {
  return {
    xKg: m.xKg,
    yKg: m.yKg,
    reflectedPerMotorKg: m.reflectedPerMotorKg,
    motorEquivalentKg: { a: m.motorEq[0], b: m.motorEq[1] },
    beltKg: m.beltKg,
    effectiveKg: env.directionsDeg.map((deg) =>
      effectiveMassKg({ k, xKg: m.xKg, yKg: m.yKg, motorEquivalentKg: m.motorEq, directionRad: deg / DEG }),
    ),
    pulleyInertiaKgM2: { drive: m.jDrive, idler: m.jIdler, estimated: m.estimated },
  };
}

/** The envelope with its named directions and the worst cases the checks judge against. */
interface EnvelopeSection {
  envIn: EnvelopeInput;
  env: EnvelopeResult;
  axes: DesignResult['envelope']['axes'];
  bestAccel: number;
  /** Lowest acceleration the stage holds in any direction from rest up to the cruise speed, and where. */
  holdAccel: { accelMPerS2: number; directionDeg: number };
  worstSpeed: { speedMPerS: number; directionDeg: number };
}

function envelopeSection(d: DesignInput, k: Matrix2, m: MassModel, tq: TorqueSource, rM: number): EnvelopeSection {
  const beltPerRev = 2 * Math.PI * rM;
  // Both motor coordinates use the same motor, so one sampled curve serves both (scaled by motor count).
  const unit = samplePullCurve((w) => (d.torqueMargin * tq.at(w / beltPerRev)) / rM, tq.topRevPerS * beltPerRev);
  const envIn: EnvelopeInput = {
    k,
    xKg: m.xKg,
    yKg: m.yKg,
    motorEquivalentKg: m.motorEq,
    beltCarriedKg: m.beltCarried,
    frictionXN: d.frictionN.x,
    frictionYN: d.frictionN.y,
    pull: [scalePullCurve(unit, m.motorsOn[0]), scalePullCurve(unit, m.motorsOn[1])],
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
  const slowI = slowestIndex(env.speedMaxMPerS);
  let holdI = 0;
  const reachesCruise = env.speedMaxMPerS.every((v) => v >= envIn.cruiseMPerS);
  // Up to cruise the stage must hold the plan at every speed: the lower of the rest and cruise limits.
  const hold = (i: number) => (reachesCruise ? Math.min(env.accelMaxMPerS2[i], env.accelAtCruiseMPerS2[i]) : env.accelMaxMPerS2[i]);
  for (let i = 1; i < n; i++) {
    if (env.accelMaxMPerS2[i] < env.accelMaxMPerS2[worstI] - 1e-12) worstI = i;
    if (hold(i) < hold(holdI) - 1e-12) holdI = i;
  }
  return {
    envIn,
    env,
    axes: { x: axis(0), y: axis(n / 4), diagonal: axis(n / 8), worst: axis(worstI), slowest: axis(slowI) },
    bestAccel: Math.max(...env.accelMaxMPerS2),
    holdAccel: { accelMPerS2: hold(holdI), directionDeg: env.directionsDeg[holdI] },
    worstSpeed: { speedMPerS: env.speedMaxMPerS[slowI], directionDeg: env.directionsDeg[slowI] },
  };
}

/** Stiffness map over the travel (docs/models/stiffness-and-ringing.md). */
function stiffnessSection(d: DesignInput, t: TravelInfo, m: MassModel, rM: number, structure: StructureStiffness): StiffnessResult {
  const kMotor = motorHoldingStiffnessNmPerRad(d.motor, d.driver) / (rM * rM);
  const motorStiffness: Record<MotorVar, number> = { A: kMotor, B: kMotor, B2: kMotor };
  return stiffnessMap({
    // The gantry's yaw coordinate and a cross shaft, for the structural modes (docs/models/structural-modes.md).
    yawSlopesMmPerRad: structure.yawSlopesMmPerRad,
    shaft: structure.shaft,
    models: t.models,
    motorStiffnessNPerM: motorStiffness,
    axialStiffnessN: d.belt.axialStiffnessN,
    xKg: m.xKg,
    yKg: m.yKg,
    originXMm: t.originXMm,
    originYMm: t.originYMm,
    travelXMm: t.xMm,
    travelYMm: t.yMm,
    points: d.map.points,
  });
}

/** Teeth in mesh on the least-wrapped drive pulley of a loop, and its wrap. */
function driveMesh(loop: TravelInfo['layout']['loops'][number], st: LoopState): { teeth: number; wrapDeg: number } {
  let tim = Infinity;
  let wrapDeg = 0;
  loop.elements.forEach((e, j) => {
    if (e.kind !== 'drive') return;
    const w = st.path.wraps[j - 1].wrapRad;
    const mesh = (e.teeth * w) / (2 * Math.PI);
    if (mesh < tim) {
      tim = mesh;
      wrapDeg = w * DEG;
    }
  });
  return { teeth: tim, wrapDeg };
}

/** One belt's report: lengths, spans and pluck targets at parking, and its tension over the travel. */
function beltReports(d: DesignInput, t: TravelInfo, states: LoopState[], tensions: LoopTensionResult[]): BeltReport[] {
  const p = d.belt.pitchMm;
  const toothTypical = d.belt.toothAllowableN === null;
  const toothAllowable = d.belt.toothAllowableN ?? typicalToothAllowableN({ pitchMm: p, widthMm: d.belt.widthMm });
  return t.layout.loops.map((loop, i) => {
    const st = states[i];
    const lenMm = st.path.lengthMm;
    const loopTeeth = Math.ceil(lenMm / p - 1e-9);
    const mesh = driveMesh(loop, st);
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
    const tn = tensions[i];
    // Teeth that carry the pull: at most 6 count, and fewer lose 20 % of the 6-tooth capacity each (common practice).
    const counted = MIN_TEETH_IN_MESH * teethInMeshFactor(mesh.teeth);
    return {
      id: loop.id,
      label: loop.label,
      loopLengthMm: lenMm,
      loopTeeth,
      cutLengthMm: loopTeeth * p + 2 * CLAMP_ALLOWANCE_MM,
      teethInMesh: mesh.teeth,
      driveWrapDeg: mesh.wrapDeg,
      spans,
      referenceSpanId: reference ? reference.id : null,
      arms: st.pieces.map((pc) => ({ from: pc.from, to: pc.to, lengthMm: pc.lengthMm })),
      massKg: (lenMm / 1000) * d.belt.linearMassKgPerM,
      peakPullN: tn.peakPullN,
      tension: {
        pretensionN: d.pretensionN,
        worstTightN: tn.worstTightN,
        worstTightAt: tn.worstTightAt,
        worstSlackN: tn.worstSlackN,
        worstSlackAt: tn.worstSlackAt,
        tensileAllowableN: d.belt.allowableTensionN,
        peakPullN: tn.peakPullN,
        // With under two teeth in mesh the rule leaves no capacity: the whole pull is reported, and the check fails.
        toothLoadN: counted > 0 ? tn.peakPullN / counted : tn.peakPullN,
        toothAllowableN: toothAllowable,
        toothAllowableIsTypical: toothTypical,
        countedTeeth: counted,
        tightMapN: tn.tightMapN,
        slackMapN: tn.slackMapN,
      },
    };
  });
}

/** H-loop racking: moment per newton of X pull, the peak moment and the guides' reaction and rating (docs/models/racking.md). */
function rackingSection(d: DesignInput, t: TravelInfo, env: EnvelopeResult): DesignResult['racking'] {
  const spacing = rackingTurnSpacingMm(t.layout);
  const perN = rackingMomentPerNewtonM({ mechanism: d.mechanism, turnSpacingMm: spacing });
  const peakMoment = perN * env.peakForceXN;
  return {
    yawMomentRatingNm: d.guide.yawMomentRatingNm ?? TYPICAL_YAW_MOMENT_RATING_NM,
    yawMomentRatingIsTypical: d.guide.yawMomentRatingNm === null,
    momentPerNewtonM: perN,
    turnSpacingMm: spacing,
    peakForceXN: env.peakForceXN,
    peakMomentNm: peakMoment,
    guideSpanMm: d.frame.gantryYMm,
    guideReactionN: guideReactionN({ momentNm: peakMoment, guideSpanMm: d.frame.gantryYMm }),
  };
}

/** Torque–speed samples for the chart, with the operating points of the named directions (docs/models/envelope.md §4). */
function torqueChart(
  d: DesignInput,
  k: Matrix2,
  tq: TorqueSource,
  es: EnvelopeSection,
  m: MassModel,
  rM: number,
): DesignResult['torqueSpeed'] {
  const beltPerRev = 2 * Math.PI * rM;
  const ops: DesignResult['torqueSpeed']['operatingPoints'] = [];
  const named: [string, number, AxisLimits][] = [
    ['X', 0, es.axes.x],
    ['Y', Math.PI / 2, es.axes.y],
    ['diagonal', Math.PI / 4, es.axes.diagonal],
  ];
  for (const [nm, th, ax] of named) {
    const sh = [k[0][0] * Math.cos(th) + k[0][1] * Math.sin(th), k[1][0] * Math.cos(th) + k[1][1] * Math.sin(th)];
    for (const [when, v, a] of [
      ['at rest', 0, ax.accelMaxMPerS2],
      ['at cruise', es.envIn.cruiseMPerS, ax.accelAtCruiseMPerS2],
    ] as [string, number, number][]) {
      const f = motorForcesN(es.envIn, th, a);
      (['A', 'B'] as const).forEach((mo, i) => {
        ops.push({
          label: `${nm} move ${when}, motor ${mo}`,
          motor: mo,
          speedRevPerS: (Math.abs(sh[i]) * v) / beltPerRev,
          torqueNm: (Math.abs(f[i]) * rM) / m.motorsOn[i],
        });
      });
    }
  }
  // The model's tail is long (it ends where the torque falls to a few per cent); the chart shows the part a stage
  // uses: three times V/k_e, or past the fastest operating point.
  const fastest = Math.max(0, ...ops.map((o) => o.speedRevPerS));
  const shown = tq.source === 'table' ? tq.topRevPerS : Math.min(tq.topRevPerS, Math.max(3 * tq.backEmfSpeedRevPerS, 1.2 * fastest));
  const samples = 121;
  const speeds: number[] = [];
  const torques: number[] = [];
  for (let i = 0; i < samples; i++) {
    const s = (shown * i) / (samples - 1);
    speeds.push(s);
    torques.push(tq.at(s));
  }
  return {
    source: tq.source,
    topRevPerS: tq.topRevPerS,
    backEmfSpeedRevPerS: tq.backEmfSpeedRevPerS,
    speedRevPerS: speeds,
    torqueNm: torques,
    usableTorqueNm: torques.map((x) => x * d.torqueMargin),
    operatingPoints: ops,
  };
}

/** Motors, what they drive, and the sign convention in words. */
function motorsAndSigns(d: DesignInput, kinv: Matrix2, motorsOn: [number, number]): Pick<DesignResult, 'motors' | 'signConvention'> {
  const mech = d.mechanism;
  const words = (j: number) => directionWords(kinv[0][j], kinv[1][j]);
  const motorLabels: [string, string] = mech === 'cartesian' ? ['X', 'Y'] : ['A', 'B'];
  const yDrive = d.yMotors === 2 ? 'belts Y (one motor per side)' : 'belts Y (through the cross shaft)';
  return {
    motors: [
      { id: 'A', axisLabel: motorLabels[0], count: 1, drives: mech === 'hbot' ? 'belt H' : mech === 'corexy' ? 'belt A' : 'belt X' },
      {
        id: 'B',
        axisLabel: motorLabels[1],
        count: motorsOn[1],
        drives: mech === 'hbot' ? 'belt H' : mech === 'corexy' ? 'belt B' : yDrive,
      },
    ],
    signConvention: {
      motorDirection: d.motorDirection,
      a: `A positive step of motor ${motorLabels[0]} alone moves the carriage toward ${words(0)}.`,
      b: `A positive step of motor ${motorLabels[1]} alone moves the carriage toward ${words(1)}.`,
    },
  };
}

/** The inputs of the checks, gathered from every section of the evaluation (docs/models/checks.md). */
function checksOf(
  d: DesignInput,
  x: {
    t: TravelInfo;
    es: EnvelopeSection;
    belts: BeltReport[];
    racking: DesignResult['racking'];
    ringingPlanned: RingingFigure;
    plannedAccel: number;
  },
): DesignResult['checks'] {
  const { t, es, belts, racking, plannedAccel } = x;
  return designChecks({
    torqueMargin: d.torqueMargin,
    currentRmsA: d.driver.currentRmsA,
    ratedCurrentA: d.motor.ratedCurrentA,
    belts,
    pretensionN: d.pretensionN,
    driveTeeth: d.pulley.driveTeeth,
    idlerTeeth: d.pulley.idlerTeeth,
    minPulleyTeeth: d.belt.minPulleyTeeth,
    ringingPlanned: x.ringingPlanned,
    ringingToleranceMm: d.ringingToleranceMm,
    plannedAccelMPerS2: d.plannedAccelMmPerS2 !== null ? plannedAccel : null,
    worstAccelMPerS2: es.holdAccel.accelMPerS2,
    worstAccelDirectionDeg: es.holdAccel.directionDeg,
    cruiseSpeedMPerS: es.envIn.cruiseMPerS,
    worstSpeedMPerS: es.worstSpeed.speedMPerS,
    worstSpeedDirectionDeg: es.worstSpeed.directionDeg,
    travel: { xMm: t.xMm, yMm: t.yMm },
    outer: { xMm: d.frame.outerXMm, yMm: d.frame.outerYMm },
    wantedTravel: d.wantedTravel,
    toolKg: d.masses.toolKg,
    toolHoldN: d.toolMount ? d.toolMount.holdN : null,
    // With a planned acceleration the machine is meant to run at it; otherwise the best the motors give anywhere.
    toolAccelMPerS2: d.plannedAccelMmPerS2 !== null ? plannedAccel : es.bestAccel,
    racking:
      d.mechanism === 'hbot'
        ? {
            momentNm: Math.abs(racking.peakMomentNm),
            ratingNm: racking.yawMomentRatingNm,
            ratingIsTypical: racking.yawMomentRatingIsTypical,
          }
        : null,
  });
}

/**
 * The second layer (docs/models/): error budget, structural modes, vibration control, excitation, heat, shaft loads
 * and the job, from what the first layer computed.
 */
function secondLayerOf(
  d: DesignInput,
  x: {
    k: Matrix2;
    t: TravelInfo;
    states: LoopState[];
    m: MassModel;
    es: EnvelopeSection;
    map: StiffnessResult;
    structure: StructureStiffness;
    belts: BeltReport[];
    rM: number;
    plannedAccel: number;
    motors: DesignResult['motors'];
  },
): SecondLayerResult {
  const { t, es, belts, rM } = x;
  const kTheta = motorHoldingStiffnessNmPerRad(d.motor, d.driver);
  let worstIndex = 0;
  es.env.accelMaxMPerS2.forEach((a, i) => a < es.env.accelMaxMPerS2[worstIndex] - 1e-12 && (worstIndex = i));
  return evaluateSecondLayer({
    d,
    k: x.k,
    t,
    envIn: es.envIn,
    env: es.env,
    worstIndex,
    map: x.map,
    structure: x.structure,
    motorsOn: x.m.motorsOn,
    pulleyRadiusM: rM,
    motorStiffnessNPerM: kTheta / (rM * rM),
    holdingTorqueNm: kTheta / (90 / d.motor.stepAngleDeg),
    plannedAccelMPerS2: x.plannedAccel,
    belts: t.layout.loops.map((loop, i) => ({
      id: loop.id,
      label: loop.label,
      loop,
      wrapsRad: x.states[i].path.wraps.map((w) => w.wrapRad),
      spans: spanBands(
        t.models[i],
        t,
        belts[i].spans.map((sp) => sp.label),
        d,
        Math.max(1, d.frame.clearanceMm),
      ),
      worstTightN: belts[i].tension.worstTightN,
      peakPullN: belts[i].tension.peakPullN,
    })),
    motorLabels: x.motors.map((mo) => ({ id: mo.id, label: `Motor ${mo.axisLabel}` })),
  });
}

/**
 * Evaluates a design: validates it with the schema, then computes kinematics, drive numbers, travel, belt
 * layout, masses, motor torque, the acceleration/speed envelope, belt tensions over the travel, the stiffness map,
 * ringing, racking, parts and checks (docs/README.md).
 * @param input - a design document, unvalidated
 * @returns the full result plus drawing data
 * @throws EngineInputError with field paths when the design is invalid
 */
export function evaluateDesign(input: unknown): DesignResult {
  const { design, travel } = parseDesignWithTravel(input);
  return evaluateWithTravel(design, travel);
}

/**
 * Same as {@link evaluateDesign} for an already validated design (skips the schema pass).
 * @param d - validated design
 * @returns the full result
 */
export function evaluateValidDesign(d: DesignInput): DesignResult {
  return evaluateWithTravel(d, frameToTravel(d));
}

/** The evaluation of a validated design whose travel and belt layout (frameToTravel) are already worked out. */
function evaluateWithTravel(d: DesignInput, t: TravelInfo): DesignResult {
  const k: Matrix2 = kinematicsMatrix(d.mechanism, d.motorDirection);
  const kinv = inverse2(k);
  const { rM, section: drive } = driveNumbers(d, k);
  const parking = { xMm: t.xMm / 2, yMm: t.yMm / 2 };
  const pcx = t.originXMm + parking.xMm;
  const pcy = t.originYMm + parking.yMm;
  const states = t.layout.loops.map((loop) => solveLoop(loop, pcx, pcy));
  const m = massModel(d, t, states, rM);
  const tq = torqueSource(d);
  const es = envelopeSection(d, k, m, tq, rM);
  const structure = structureStiffness(d, t, rM);
  const map = stiffnessSection(d, t, m, rM, structure);
  const tensions = beltTensionOverTravel({
    models: t.models,
    motorVars: t.layout.motorVars,
    k,
    pretensionN: d.pretensionN,
    pairs: es.env.pullPairs,
    originXMm: t.originXMm,
    originYMm: t.originYMm,
    xMm: map.xMm,
    yMm: map.yMm,
  });
  const belts = beltReports(d, t, states, tensions);
  const racking = rackingSection(d, t, es.env);
  const plannedAccel = d.plannedAccelMmPerS2 !== null ? d.plannedAccelMmPerS2 / 1000 : es.axes.worst.accelMaxMPerS2;
  const ringingFig = ringingFigures(es, map.min.frequencyHz, d.ringingToleranceMm, plannedAccel);
  const signs = motorsAndSigns(d, kinv, m.motorsOn);
  const second = secondLayerOf(d, { k, t, states, m, es, map, structure, belts, rM, plannedAccel, motors: signs.motors });
  const checks = [
    ...checksOf(d, { t, es, belts, racking, ringingPlanned: ringingFig.planned, plannedAccel }),
    ...secondLayerChecks({ second, cruiseSpeedMPerS: es.envIn.cruiseMPerS, travel: { xMm: t.xMm, yMm: t.yMm } }),
  ];
  // A torque table replaces the motor model only for the supply and current it was measured at.
  const tableCheck = torqueTableCheck(d.motor, d.driver);
  if (tableCheck) checks.push(tableCheck);
  const env = es.env;
  return {
    engineVersion: ENGINE_VERSION,
    mechanism: d.mechanism,
    name: d.name,
    kinematics: {
      matrix: k,
      inverse: kinv,
      singleMotorDirectionDeg: {
        a: (Math.atan2(kinv[1][0], kinv[0][0]) * DEG + 360) % 360,
        b: (Math.atan2(kinv[1][1], kinv[0][1]) * DEG + 360) % 360,
      },
    },
    ...signs,
    drive,
    travel: { xMm: t.xMm, yMm: t.yMm, limitedBy: t.limitedBy },
    parking,
    mass: massSection(k, m, env),
    envelope: {
      directionsDeg: env.directionsDeg,
      accelMaxMPerS2: env.accelMaxMPerS2,
      accelAtCruiseMPerS2: env.accelAtCruiseMPerS2,
      speedMaxMPerS: env.speedMaxMPerS,
      limitingMotor: env.limitingMotor,
      axes: es.axes,
      cruiseSpeedMPerS: es.envIn.cruiseMPerS,
    },
    coupling: {
      speedShare: { a: env.speedShareA, b: env.speedShareB },
      forceShare: { a: env.forceShareA, b: env.forceShareB },
    },
    torqueSpeed: torqueChart(d, k, tq, es, m, rM),
    belts,
    stiffness: {
      xMm: map.xMm,
      yMm: map.yMm,
      lowestFrequencyHz: map.lowestFrequencyHz,
      min: map.min,
      ringing: ringingFig,
      toleranceMm: d.ringingToleranceMm,
      lowest: second.lowest,
      lowestMap: second.lowestMap,
    },
    ...secondLayerSections(second),
    racking,
    layout: layoutDrawing({
      layout: t.layout,
      states,
      frame: d.frame,
      beltWidthMm: d.belt.widthMm,
      parkXMm: pcx,
      parkYMm: pcy,
      origin: { xMm: t.originXMm, yMm: t.originYMm },
      travel: { xMm: t.xMm, yMm: t.yMm },
    }),
    partsList: partsList({
      layout: t.layout,
      belts,
      yMotors: d.yMotors,
      beltPitchMm: d.belt.pitchMm,
      beltWidthMm: d.belt.widthMm,
      driveTeeth: d.pulley.driveTeeth,
      idlerTeeth: d.pulley.idlerTeeth,
      stepAngleDeg: d.motor.stepAngleDeg,
      holdingTorqueNm: d.motor.holdingTorqueNm,
      ratedCurrentA: d.motor.ratedCurrentA,
    }),
    checks,
    cautions: CAUTIONS.map((c) => ({ ...c })),
  };
}
