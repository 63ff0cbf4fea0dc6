import type { SecondLayerResult } from './secondLayer';
/** Mechanism key of a design. */
export type Mechanism = 'corexy' | 'hbot' | 'cartesian';

/** Sign of each motor's positive sense: +1 keeps the K row of docs/models/envelope.md §1, −1 flips it. */
export interface MotorDirection {
  a: 1 | -1;
  b: 1 | -1;
}

/** One point of an uploaded torque–speed table. */
export interface TorquePoint {
  speedRevPerS: number;
  torqueNm: number;
}

/** Motor data as in the design document (the design document's "motor"). */
export interface MotorSpec {
  stepAngleDeg: number;
  holdingTorqueNm: number;
  ratedCurrentA: number;
  phaseResistanceOhm: number;
  phaseInductanceMh: number;
  rotorInertiaKgM2: number;
  massKg: number;
  torqueCurve?: TorquePoint[] | null;
  /** Supply [V] and driver RMS current [A] the torque table was measured at (null when not recorded). */
  torqueCurveConditions?: { supplyV: number; currentRmsA: number } | null;
  maxSpeedRevPerS?: number | null;
}

/** Driver data as in the design document (the design document's "driver"). */
export interface DriverSpec {
  microsteps: number;
  supplyV: number;
  currentRmsA: number;
}

/** Severity of one check. */
export type Severity = 'ok' | 'warn' | 'fail';

/** What a number means, with the unit fixed by the name (values are always in that unit). */
export type QuantityKind =
  | 'lengthMm'
  | 'forceN'
  | 'speedMPerS'
  | 'accelMPerS2'
  | 'torqueNm'
  | 'momentNm'
  | 'massKg'
  | 'currentA'
  | 'voltageV'
  | 'powerW'
  | 'frequencyHz'
  | 'timeS'
  | 'ratio'
  | 'count'
  | 'angleDeg';

/** A number inside a check's text, with its kind (so a client can show it in the user's unit system). */
export interface CheckQuantity {
  value: number;
  kind: QuantityKind;
}

/** One design check (docs/models/checks.md). */
export interface Check {
  /** Stable id for programs, e.g. "belt-slack" (the belt is in `subject`); never shown to users. */
  id: string;
  severity: Severity;
  /** One sentence for the designer: `parts` rendered in metric units. */
  message: string;
  /** The design's value, or null when the check has no single number. */
  value: number | null;
  /** The limit it is compared with, or null. */
  limit: number | null;
  /** Unit of value and limit ("" when dimensionless). */
  unit: string;
  /** Kind of `value` and `limit` (so a client can show them in the user's unit system). */
  kind: QuantityKind;
  /** The message as text pieces and quantities; `message` is these rendered in metric. */
  parts: (string | CheckQuantity)[];
  /** Plain-words subject the check is about, e.g. "Belt A" (null when it is about the whole design). */
  subject: string | null;
}

/** One safety caution shown on every sheet and on the Design desk (docs/models/checks.md "Cautions"). */
export interface Caution {
  id:
    | 'pinch-points'
    | 'electrical-supply'
    | 'stored-energy'
    | 'hot-motors'
    | 'unexpected-motion'
    | 'emergency-stop'
    | 'tool-hazards'
    | 'codes-and-practice';
  title: string;
  text: string;
}

/** Limits along one named direction. */
export interface AxisLimits {
  directionDeg: number;
  accelMaxMPerS2: number;
  accelAtCruiseMPerS2: number;
  speedMaxMPerS: number;
}

/** Ringing figure at the weakest point of the stiffness map. */
export interface RingingFigure {
  /** Acceleration the figure is for [m/s²]. */
  accelMPerS2: number;
  /** Overshoot after an abrupt change of that acceleration [mm]. */
  amplitudeMm: number;
  /** Acceleration that keeps the overshoot within the design's tolerance [m/s²]. */
  accelForToleranceMPerS2: number;
}

/** One free belt span at the parking position. */
export interface BeltSpan {
  /** "<belt>:<from>-><to>" */
  id: string;
  label: string;
  from: string;
  to: string;
  lengthMm: number;
  /** Pluck frequency at the design pretension [Hz]. */
  targetFrequencyHz: number;
  /** True when both ends ride the same body, so the span does not change with the carriage position. */
  fixedLength: boolean;
}

/** One belt of the layout with its lengths and tensions. */
export interface BeltReport {
  id: string;
  label: string;
  /** Pitch-line length clamp to clamp [mm] (constant over the travel). */
  loopLengthMm: number;
  /** Whole teeth the belt must have to cover the loop (rounded up). */
  loopTeeth: number;
  /** Length to cut: whole teeth plus the clamp allowance at both ends [mm]. */
  cutLengthMm: number;
  /** Teeth in mesh on the least-wrapped drive pulley of this belt (fractional). */
  teethInMesh: number;
  /** Wrap on that drive pulley [°]. */
  driveWrapDeg: number;
  spans: BeltSpan[];
  /** The longest fixed-length span: the one to pluck when setting the tension (null if the belt has none). */
  referenceSpanId: string | null;
  /** Belt between load-bearing nodes at parking (the arms that hold the carriage) [mm]. */
  arms: { from: string; to: string; lengthMm: number }[];
  /** Belt mass [kg]. */
  massKg: number;
  /** Largest pull any drive pulley of this belt transmits anywhere on the envelope [N]. */
  peakPullN: number;
  /** Working tension over the travel and every envelope direction (docs/models/belt-tension.md). */
  tension: BeltTension;
}

/** Where on the travel (travel coordinates) and in which direction of travel a worst tension occurs. */
export interface TensionPlace {
  xMm: number;
  yMm: number;
  directionDeg: number;
}

/** A belt's working tension: worst tight and slack side, their places, the allowables and the maps. */
export interface BeltTension {
  /** Tension of every span with no pull [N]. */
  pretensionN: number;
  /** Highest tension of any piece of the belt over the travel grid and every envelope direction [N]. */
  worstTightN: number;
  worstTightAt: TensionPlace;
  /** Lowest tension of any piece of the belt over the travel grid and every envelope direction [N]. */
  worstSlackN: number;
  worstSlackAt: TensionPlace;
  /** The belt's allowable tension exactly as typed (cords; no teeth-in-mesh factor) [N]. */
  tensileAllowableN: number;
  /** Largest pull a drive pulley of this belt transmits [N]. */
  peakPullN: number;
  /** Load per tooth in mesh at the peak pull: peak pull ÷ counted teeth [N]. */
  toothLoadN: number;
  /** Allowable load per tooth in mesh, as typed or the typical value [N]. */
  toothAllowableN: number;
  /** True when toothAllowableN is the typical value (the design gave none). */
  toothAllowableIsTypical: boolean;
  /** Teeth counted for the tooth load: at most 6, fewer derated by 20 % per missing tooth (common practice). */
  countedTeeth: number;
  /** Highest tension over every direction at each point of the stiffness-map grid [N], indexed [iy][ix]. */
  tightMapN: number[][];
  /** Lowest tension over every direction at each point of the stiffness-map grid [N], indexed [iy][ix]. */
  slackMapN: number[][];
}

/** A pulley, idler or clamp as drawn at the parking position. */
export interface LayoutPart {
  id: string;
  /** Short name on the drawings and in the span table ("A2"); "" for a clamp. Missing in results of engine 1.0. */
  tag?: string;
  /** Plain-words name starting with the tag ("A2 motor A pulley, back-right corner"). */
  label: string;
  belt: string;
  kind: 'drive' | 'idler' | 'clamp';
  body: 'frame' | 'gantry' | 'carriage';
  /** True when the belt's teeth run on it (toothed idler); false for a smooth idler on the belt's back. */
  toothed: boolean;
  /** Plan position [mm] (an upright loop's element on the loop's plan line). */
  xMm: number;
  yMm: number;
  /** Height above its upright loop's lower run [mm]; 0 in a flat loop. */
  zMm?: number;
  /** Belt level, 1 lower, 2 upper (docs/models/belt-layout.md). */
  level?: 1 | 2;
  /** Direction of the pulley's axis: vertical in a flat loop, along X or Y in an upright one. */
  axis?: 'vertical' | 'x' | 'y';
  /** Ids of the parts on the same bolt (stacked idlers, each on its own bearings). */
  stackedWith?: string[];
  radiusMm: number;
  teeth: number;
  /** Motor coordinate of a drive pulley. */
  motor: 'A' | 'B' | null;
  wrapDeg: number;
}

/** One belt as drawn. */
export interface LayoutBelt {
  id: string;
  label?: string;
  level?: 1 | 2;
  /** 'flat': in a horizontal level; 'upright': in a vertical plane (its runs overlap in plan). */
  plane?: 'flat' | 'upright';
  /** Straight spans in plan [mm]. */
  segments: { x1Mm: number; y1Mm: number; x2Mm: number; y2Mm: number }[];
  /** An upright loop in its own plane: position along its runs (X or Y) and height above the lower run [mm]. */
  elevation?: { along: 'x' | 'y'; segments: { u1Mm: number; z1Mm: number; u2Mm: number; z2Mm: number }[] };
}

/** Geometry for drawing the layout in plan, frame coordinates from the outer front-left corner [mm]. */
export interface LayoutDrawing {
  frame: { outerXMm: number; outerYMm: number; extrusionMm: number };
  carriage: { xMm: number; yMm: number; widthMm: number; depthMm: number };
  gantry: { yMm: number; depthMm: number; fromXMm: number; toXMm: number };
  /** Travel rectangle of the carriage centre; (fromXMm, fromYMm) is travel position (0, 0), the origin. */
  travel: { fromXMm: number; fromYMm: number; toXMm: number; toYMm: number };
  /** The belt levels and the belts on each, lowest first. Missing in results of engine 1.0. */
  levels?: { level: 1 | 2; label: string; belts: string[] }[];
  /** Belt width and flange allowance outside each pitch circle [mm], for drawing pulleys to size. */
  beltWidthMm?: number;
  flangeMm?: number;
  parts: LayoutPart[];
  belts: LayoutBelt[];
}

/** One row of the parts list for ordering. */
export interface PartsListRow {
  item: string;
  quantity: number;
  /** The specification in metric words. */
  spec: string;
  /** The same specification as text pieces and quantities, for readers in other unit systems. */
  specParts?: (string | CheckQuantity)[];
}

/** The full result of evaluateDesign (the result fields of src/engine/README.md plus what the Design desk draws). */
export interface DesignResult {
  engineVersion: string;
  mechanism: Mechanism;
  name: string;
  kinematics: {
    /** [[kAx, kAy], [kBx, kBy]]: [ΔA, ΔB] = K·[ΔX, ΔY], motor directions applied. */
    matrix: [[number, number], [number, number]];
    /** K⁻¹: [ΔX, ΔY] = K⁻¹·[ΔA, ΔB]. */
    inverse: [[number, number], [number, number]];
    /** Carriage direction a positive step of each motor alone produces [°]. */
    singleMotorDirectionDeg: { a: number; b: number };
  };
  /** Which way is +A/+B, for the sheet. */
  signConvention: { motorDirection: MotorDirection; a: string; b: string };
  motors: { id: 'A' | 'B'; axisLabel: string; count: number; drives: string }[];
  drive: {
    pitchDiameterMm: number;
    travelPerRevMm: number;
    stepsPerMm: number;
    fullStepMm: number;
    fullStepsPerRev: number;
    microsteps: number;
    microstepBeltMm: number;
    /** Carriage figures of one microstep, each named for what it is (docs/models/resolution.md). */
    microstep: { oneMotorMm: number; oneMotorDirectionDeg: number; axisMm: number; diagonalMm: number };
  };
  travel: {
    xMm: number;
    yMm: number;
    limitedBy: { xLow: string; xHigh: string; yLow: string; yHigh: string };
  };
  parking: { xMm: number; yMm: number };
  mass: {
    xKg: number;
    yKg: number;
    reflectedPerMotorKg: number;
    /** Belt-line equivalent mass of each motor coordinate: rotors, drive pulleys, idlers, belt [kg]. */
    motorEquivalentKg: { a: number; b: number };
    beltKg: number;
    /** Effective mass along each envelope direction [kg]. */
    effectiveKg: number[];
    pulleyInertiaKgM2: { drive: number; idler: number; estimated: boolean };
  };
  envelope: {
    directionsDeg: number[];
    accelMaxMPerS2: number[];
    accelAtCruiseMPerS2: number[];
    speedMaxMPerS: number[];
    limitingMotor: ('A' | 'B')[];
    /**
     * Named directions: X, Y, the diagonal, `worst` the direction with the lowest acceleration at rest, and `slowest`
     * the direction with the lowest top speed — its speed is "top speed, worst direction" (docs/models/envelope.md §3).
     * `slowest` is absent from results stored before engine 2.2.
     */
    axes: { x: AxisLimits; y: AxisLimits; diagonal: AxisLimits; worst: AxisLimits; slowest: AxisLimits };
    cruiseSpeedMPerS: number;
  };
  coupling: {
    speedShare: { a: number[]; b: number[] };
    forceShare: { a: number[]; b: number[] };
  };
  torqueSpeed: {
    source: 'model' | 'table';
    /** Speed where the usable curve ends: the model's tail cut, a table's last row or the speed limit [rev/s]. */
    topRevPerS: number;
    /** Back-EMF equal to the supply, V/k_e: no ceiling in this model, shown for orientation [rev/s]. */
    backEmfSpeedRevPerS: number;
    speedRevPerS: number[];
    torqueNm: number[];
    /** Torque the design may use (margin applied) [N·m]. */
    usableTorqueNm: number[];
    operatingPoints: { label: string; motor: 'A' | 'B'; speedRevPerS: number; torqueNm: number }[];
  };
  belts: BeltReport[];
  stiffness: {
    xMm: number[];
    yMm: number[];
    lowestFrequencyHz: number[][];
    min: { frequencyHz: number; xMm: number; yMm: number };
    ringing: { x: RingingFigure; y: RingingFigure; worst: RingingFigure; planned: RingingFigure };
    toleranceMm: number;
    /** Lowest of all structural modes anywhere on the grid, and which mode it is (docs/models/structural-modes.md). */
    lowest: SecondLayerResult['lowest'];
    /** Lowest of all modes at each grid point and which one it is, [iy][ix]. */
    lowestMap: SecondLayerResult['lowestMap'];
  };
  /** Positioning-error budget over the travel grid (docs/models/error-budget.md). */
  errorBudget: SecondLayerResult['errorBudget'];
  /** Structural modes beside the belt mode, each at its weakest point, lowest first. */
  modes: SecondLayerResult['modes'];
  /** Modes the belts leave unheld (the guides alone hold them). */
  modesNotHeld: SecondLayerResult['modesNotHeld'];
  /** Beam and shaft values the modes were computed with. */
  structure: SecondLayerResult['structure'];
  /** Input-shaper and ramp numbers for the lowest mode (docs/models/vibration-control.md). */
  shaping: SecondLayerResult['shaping'];
  /** Tooth-mesh frequency against the modes and spans; step rates (docs/models/excitation.md). */
  excitation: SecondLayerResult['excitation'];
  /** Copper loss, supply sizing and RMS torque (docs/models/heat-and-supply.md). */
  heat: SecondLayerResult['heat'];
  /** Radial loads on motor shafts and idlers (docs/models/shaft-loads.md). */
  loads: SecondLayerResult['loads'];
  /** Job timing when the design lists job points (docs/models/job-timing.md). */
  job: SecondLayerResult['job'];
  racking: {
    /** Rated moment of the Y guides about the vertical axis, as typed or the typical value [N·m]. */
    yawMomentRatingNm: number;
    yawMomentRatingIsTypical: boolean;
    momentPerNewtonM: number;
    turnSpacingMm: number;
    peakForceXN: number;
    peakMomentNm: number;
    guideSpanMm: number;
    guideReactionN: number;
  };
  layout: LayoutDrawing;
  partsList: PartsListRow[];
  checks: Check[];
  cautions: Caution[];
}
