/**
 * Gantrywright calculation engine: the only public entry point. Pure TypeScript, no platform imports.
 * Client and server import it as `@/engine`; nothing else in src/engine is imported directly.
 */
export { ENGINE_VERSION } from './version';
export { EngineInputError, type InputIssue } from './errors';
export {
  designInputSchema,
  isTwoPhaseStepAngle,
  parseDesign,
  safeParseDesign,
  defaultDesign,
  issuesFromZod,
  MICROSTEP_OPTIONS,
  type DesignInput,
  type DesignInputRaw,
} from './schema';
export { pitchDiameterMm, stepsPerMm, travelPerRevMm, reflectedMassKg, fullStepsPerRev, rotorTeeth } from './drive';
export {
  MECHANISMS,
  kinematicsMatrix,
  carriageToMotor,
  motorToCarriage,
  beltPullsToForce,
  forceToBeltPulls,
  couplingShares,
} from './kinematics';
export { openBeltLengthMm, openBeltLengthExactMm, wrapAngleRad, teethInMesh } from './openBelt';
export { spanFrequencyHz, tensionFromFrequencyN } from './tension';
export { pluckBandHz, PLUCK_TENSION_TOLERANCE } from './pluckBand';
export { beltArmTensionsN, chainTensionChangesN } from './beltArmTensions';
export { beltTensionOverTravel, convexHullIndices, type PullPairs, type BeltTensionInput, type LoopTensionResult } from './beltTensionMap';
export { microstepFigures, type MicrostepFigures } from './microstep';
export { TYPICAL_TOOTH_ALLOWABLE_2MM_6MM_N, TYPICAL_YAW_MOMENT_RATING_NM, typicalToothAllowableN } from './typicalValues';
export { UNIT_OF_KIND, formatSignificant, renderQuantity } from './checkText';
export { naturalFrequencyHz, spanStiffnessNPerM, ringingAmplitudeMm } from './vibration';
export {
  motorTorqueNm,
  pullOutTorqueNm,
  torqueSpeedFunction,
  torqueConstantNmPerA,
  effectivePeakCurrentA,
  modelTopSpeedRevPerS,
  MODEL_TAIL_SHARE,
  MODEL_TOP_FACTOR,
  interpolateTorqueCurve,
  motorHoldingStiffnessNmPerRad,
} from './motorTorque';
export { moveTimeS } from './moveTime';
export { frameToTravel, travelToFrame, type TravelInfo, type TravelInput } from './frame';
export {
  buildBeltLayout,
  solveLoop,
  fitLoopModel,
  elementPosition,
  planPosition,
  levelName,
  flangeMarginMm,
  FLANGE_PITCHES,
  SHAFT_RADIUS_MM,
  type BeltLevel,
  type LoopPlane,
  type BeltLayout,
  type LayoutLoop,
  type LayoutElement,
} from './beltLayout';
export { solveBeltPath, type PathElement, type SolvedPath } from './beltPath';
export { movingMassKg, effectiveMassKg, pulleyInertiaEstimateKgM2 } from './mass';
export { computeEnvelope, motorForcesN, samplePullCurve, scalePullCurve, type EnvelopeInput, type EnvelopeResult } from './envelope';
export { stiffnessMap, carriageStiffnessNPerM, type StiffnessInput, type StiffnessResult } from './stiffness';
export { rackingMomentPerNewtonM, rackingTurnSpacingMm, guideReactionN } from './racking';
export { designChecks, teethInMeshFactor, type CheckInput } from './checks';
export { torqueTableCheck, TORQUE_TABLE_CONDITION_TOLERANCE } from './torqueTableCheck';
export { CAUTIONS } from './cautions';
export { partsList, CLAMP_ALLOWANCE_MM } from './partsList';
export { evaluateDesign, evaluateValidDesign, ENVELOPE_DIRECTIONS } from './evaluateDesign';
export { lowestEigenvalue2, inverse2, transpose2, multiply2, det2, apply2, type Matrix2 } from './linalg';
export type {
  Mechanism,
  MotorDirection,
  MotorSpec,
  DriverSpec,
  TorquePoint,
  DesignResult,
  Check,
  CheckQuantity,
  PartsListRow,
  QuantityKind,
  Severity,
  Caution,
  AxisLimits,
  RingingFigure,
  BeltReport,
  BeltSpan,
  BeltTension,
  TensionPlace,
  LayoutDrawing,
  LayoutPart,
  LayoutBelt,
} from './types';
export { compareMechanisms, keyFigures, type KeyFigures, type ComparisonRow } from './compareMechanisms';
export { sweep, type SweepPoint } from './sweep';
export { beltGeometryAt, type BeltGeometry } from './beltGeometryAt';
export { layoutDrawing, layoutDrawingAt } from './layoutDrawing';
