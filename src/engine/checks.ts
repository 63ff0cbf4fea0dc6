import type { BeltReport, Check, RingingFigure, Severity } from './types';

/** Highest share of available torque common practice lets a stepper design use (50–70 % of pull-out). */
export const TORQUE_MARGIN_LIMIT = 0.7;
/** Teeth in mesh for full belt capacity (belt makers' common practice). */
export const MIN_TEETH_IN_MESH = 6;
/** Below this many teeth in mesh the belt keeps under 40 % of its capacity: treated as a failure (our judgement). */
export const FAIL_TEETH_IN_MESH = 3;
/** Share of the allowable tension above which the tight side is flagged before it fails (our judgement). */
export const TENSION_WARN_SHARE = 0.8;
/** Slack-side reserve, as a share of pretension, below which the slack side is flagged (our judgement). */
export const SLACK_WARN_SHARE = 0.25;
/** Ringing beyond this many tolerances is a failure rather than a warning (our judgement). */
export const RINGING_FAIL_FACTOR = 5;
/**
 * A detachable tool mount should hold its working load m_tool·a_max with this margin, to ride out jerk and
 * vibration the rigid-body figure leaves out (our judgement).
 */
export const TOOL_HOLD_MARGIN = 1.5;
/**
 * A mount holding more than this many times its working load barely lets go in a crash, which defeats the
 * point of a break-away mount (our judgement).
 */
export const TOOL_RELEASE_FACTOR = 5;
/** Travel below this share of the outer frame size is flagged as a poorly used frame (our judgement). */
export const TRAVEL_SHARE_WARN = 0.5;

/**
 * Teeth-in-mesh derating of belt capacity: full capacity from 6 teeth, 20 % less for each tooth missing.
 * @param teethInMesh - teeth in mesh on the small pulley (fractional; whole teeth count)
 * @returns capacity factor 0 … 1 [-]
 * @see belt manufacturers' engineering literature, "for each tooth less than 6, you lose 20 % of the rated load" (common practice)
 */
export function teethInMeshFactor(teethInMesh: number): number {
  const whole = Math.floor(teethInMesh + 1e-9);
  return Math.max(0, Math.min(1, 1 - 0.2 * (MIN_TEETH_IN_MESH - whole)));
}

/** What the checks look at. */
export interface CheckInput {
  torqueMargin: number;
  currentRmsA: number;
  ratedCurrentA: number;
  belts: BeltReport[];
  pretensionN: number;
  driveTeeth: number;
  idlerTeeth: number;
  minPulleyTeeth: number;
  ringingPlanned: RingingFigure;
  ringingToleranceMm: number;
  /** Planned acceleration if the designer set one [m/s²]. */
  plannedAccelMPerS2: number | null;
  worstAccelMPerS2: number;
  bestAccelMPerS2: number;
  cruiseSpeedMPerS: number;
  worstSpeedMPerS: number;
  bestSpeedMPerS: number;
  travel: { xMm: number; yMm: number };
  outer: { xMm: number; yMm: number };
  wantedTravel: { xMm: number; yMm: number } | null;
  toolKg: number;
  toolHoldN: number | null;
  /** Highest acceleration the tool sees anywhere on the envelope [m/s²]. */
  toolAccelMPerS2: number;
}

function sev(fail: boolean, warn: boolean): Severity {
  return fail ? 'fail' : warn ? 'warn' : 'ok';
}

const fmt = (v: number, digits = 2) => (Math.abs(v) >= 100 ? v.toFixed(0) : v.toFixed(digits));

/**
 * The design checks of engine.md §8, each {id, severity, message, value, limit, unit}.
 * @param c - the numbers the checks compare
 * @returns checks in a stable order
 */
export function designChecks(c: CheckInput): Check[] {
  const out: Check[] = [];
  out.push({
    id: 'torque-margin',
    severity: sev(false, c.torqueMargin > TORQUE_MARGIN_LIMIT),
    message:
      c.torqueMargin > TORQUE_MARGIN_LIMIT
        ? `The design uses ${fmt(c.torqueMargin * 100, 0)} % of the available torque; above ${TORQUE_MARGIN_LIMIT * 100} % a stepper risks lost steps (common practice: 50–70 %).`
        : `The design uses ${fmt(c.torqueMargin * 100, 0)} % of the available torque, within common practice (50–70 %).`,
    value: c.torqueMargin,
    limit: TORQUE_MARGIN_LIMIT,
    unit: '',
  });
  out.push({
    id: 'driver-current',
    severity: sev(false, c.currentRmsA > c.ratedCurrentA),
    message:
      c.currentRmsA > c.ratedCurrentA
        ? `Driver current ${fmt(c.currentRmsA)} A is above the motor's rated ${fmt(c.ratedCurrentA)} A: the motor runs hot.`
        : `Driver current ${fmt(c.currentRmsA)} A is within the motor's rated ${fmt(c.ratedCurrentA)} A.`,
    value: c.currentRmsA,
    limit: c.ratedCurrentA,
    unit: 'A',
  });
  const minTeeth = Math.min(c.driveTeeth, c.idlerTeeth);
  out.push({
    id: 'pulley-min-teeth',
    severity: sev(minTeeth < c.minPulleyTeeth, false),
    message:
      minTeeth < c.minPulleyTeeth
        ? `A ${minTeeth}-tooth pulley is smaller than the belt's minimum of ${c.minPulleyTeeth} teeth.`
        : `The smallest pulley has ${minTeeth} teeth, at least the belt's minimum of ${c.minPulleyTeeth}.`,
    value: minTeeth,
    limit: c.minPulleyTeeth,
    unit: 'teeth',
  });
  for (const b of c.belts) {
    const whole = Math.floor(b.teethInMesh + 1e-9);
    out.push({
      id: `teeth-in-mesh:${b.id}`,
      severity: sev(whole < FAIL_TEETH_IN_MESH, whole < MIN_TEETH_IN_MESH),
      message:
        whole < MIN_TEETH_IN_MESH
          ? `${b.label}: ${whole} teeth in mesh on the drive pulley (${fmt(b.driveWrapDeg, 0)}° wrap); below 6 the belt loses 20 % of its capacity per missing tooth (common practice).`
          : `${b.label}: ${whole} teeth in mesh on the drive pulley, at least 6 (common practice).`,
      value: whole,
      limit: MIN_TEETH_IN_MESH,
      unit: 'teeth',
    });
    out.push({
      id: `belt-working-tension:${b.id}`,
      severity: sev(b.tightSideN > b.allowableTensionN, b.tightSideN > TENSION_WARN_SHARE * b.allowableTensionN),
      message:
        b.tightSideN > b.allowableTensionN
          ? `${b.label}: tight side ${fmt(b.tightSideN)} N exceeds the allowable ${fmt(b.allowableTensionN)} N.`
          : `${b.label}: tight side ${fmt(b.tightSideN)} N against an allowable ${fmt(b.allowableTensionN)} N.`,
      value: b.tightSideN,
      limit: b.allowableTensionN,
      unit: 'N',
    });
    out.push({
      id: `belt-slack-side:${b.id}`,
      severity: sev(b.slackSideN <= 0, b.slackSideN < SLACK_WARN_SHARE * c.pretensionN),
      message:
        b.slackSideN <= 0
          ? `${b.label}: the slack side goes slack (${fmt(b.slackSideN)} N) at peak pull; raise the pretension to at least half the peak pull ${fmt(b.peakPullN / 2)} N (common practice).`
          : `${b.label}: the slack side keeps ${fmt(b.slackSideN)} N at peak pull.`,
      value: b.slackSideN,
      limit: 0,
      unit: 'N',
    });
  }
  const amp = c.ringingPlanned.amplitudeMm;
  out.push({
    id: 'resonance',
    severity: sev(amp > RINGING_FAIL_FACTOR * c.ringingToleranceMm, amp > c.ringingToleranceMm),
    message:
      amp > c.ringingToleranceMm
        ? `At ${fmt(c.ringingPlanned.accelMPerS2)} m/s² the carriage rings by about ${amp.toPrecision(2)} mm at the weakest point, more than the ${c.ringingToleranceMm} mm tolerance; keep acceleration under ${fmt(c.ringingPlanned.accelForToleranceMPerS2)} m/s² or stiffen the belts.`
        : `At ${fmt(c.ringingPlanned.accelMPerS2)} m/s² the carriage rings by about ${amp.toPrecision(2)} mm at the weakest point, within the ${c.ringingToleranceMm} mm tolerance.`,
    value: amp,
    limit: c.ringingToleranceMm,
    unit: 'mm',
  });
  if (c.plannedAccelMPerS2 !== null) {
    const a = c.plannedAccelMPerS2;
    out.push({
      id: 'planned-acceleration',
      severity: sev(a > c.bestAccelMPerS2, a > c.worstAccelMPerS2),
      message:
        a > c.worstAccelMPerS2
          ? `The planned ${fmt(a)} m/s² exceeds what the motors give in the worst direction (${fmt(c.worstAccelMPerS2)} m/s²).`
          : `The planned ${fmt(a)} m/s² is within what the motors give in every direction (worst ${fmt(c.worstAccelMPerS2)} m/s²).`,
      value: a,
      limit: c.worstAccelMPerS2,
      unit: 'm/s²',
    });
  }
  const v = c.cruiseSpeedMPerS;
  out.push({
    id: 'cruise-speed',
    severity: sev(v > c.bestSpeedMPerS, v > c.worstSpeedMPerS),
    message:
      v > c.worstSpeedMPerS
        ? `Cruise speed ${fmt(v)} m/s is above the highest speed in the worst direction (${fmt(c.worstSpeedMPerS)} m/s).`
        : `Cruise speed ${fmt(v)} m/s is reachable in every direction (worst ${fmt(c.worstSpeedMPerS)} m/s).`,
    value: v,
    limit: c.worstSpeedMPerS,
    unit: 'm/s',
  });
  if (c.wantedTravel) {
    for (const axis of ['x', 'y'] as const) {
      const have = axis === 'x' ? c.travel.xMm : c.travel.yMm;
      const want = axis === 'x' ? c.wantedTravel.xMm : c.wantedTravel.yMm;
      out.push({
        id: `travel-wanted:${axis}`,
        severity: sev(have < want, false),
        message:
          have < want
            ? `${axis.toUpperCase()} travel ${fmt(have)} mm is short of the wanted ${fmt(want)} mm.`
            : `${axis.toUpperCase()} travel ${fmt(have)} mm covers the wanted ${fmt(want)} mm.`,
        value: have,
        limit: want,
        unit: 'mm',
      });
    }
  }
  const share = Math.min(c.travel.xMm / c.outer.xMm, c.travel.yMm / c.outer.yMm);
  out.push({
    id: 'travel-vs-frame',
    severity: sev(false, share < TRAVEL_SHARE_WARN),
    message:
      share < TRAVEL_SHARE_WARN
        ? `Only ${fmt(share * 100, 0)} % of the frame size is usable travel along one axis; carriage, clearances or pulleys take most of it.`
        : `At least ${fmt(share * 100, 0)} % of the frame size is usable travel along each axis.`,
    value: share,
    limit: TRAVEL_SHARE_WARN,
    unit: '',
  });
  if (c.toolHoldN !== null) {
    const need = c.toolKg * c.toolAccelMPerS2;
    out.push({
      id: 'tool-mount-hold',
      severity: sev(c.toolHoldN < need, c.toolHoldN < TOOL_HOLD_MARGIN * need),
      message:
        c.toolHoldN < TOOL_HOLD_MARGIN * need
          ? `The tool mount holds ${fmt(c.toolHoldN)} N; the tool needs ${fmt(need)} N at ${fmt(c.toolAccelMPerS2)} m/s², ${TOOL_HOLD_MARGIN}× that with margin.`
          : `The tool mount holds ${fmt(c.toolHoldN)} N, at least ${TOOL_HOLD_MARGIN}× the ${fmt(need)} N the tool needs at ${fmt(c.toolAccelMPerS2)} m/s².`,
      value: c.toolHoldN,
      limit: TOOL_HOLD_MARGIN * need,
      unit: 'N',
    });
    if (need > 0) {
      out.push({
        id: 'tool-mount-release',
        severity: sev(false, c.toolHoldN > TOOL_RELEASE_FACTOR * need),
        message:
          c.toolHoldN > TOOL_RELEASE_FACTOR * need
            ? `The tool mount holds more than ${TOOL_RELEASE_FACTOR}× its working load (${fmt(need)} N): it will hardly let go in a crash.`
            : `The tool mount holds at most ${TOOL_RELEASE_FACTOR}× its working load, so it can still let go in a crash.`,
        value: c.toolHoldN,
        limit: TOOL_RELEASE_FACTOR * need,
        unit: 'N',
      });
    }
  }
  return out;
}
