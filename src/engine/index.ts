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
  JOB_MAX_POINTS,
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
export { moveTimeS, jerkLimitedMoveTimeS } from './moveTime';
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
export {
  compareMechanisms,
  comparisonRow,
  keyFigures,
  secondLayerFigures,
  type KeyFigures,
  type ComparisonRow,
  type AccelEnvelope,
  type SecondLayerFigures,
} from './compareMechanisms';
export { sweep, sweepPoint, type SweepPoint } from './sweep';
export { getAt, setAt, nonGroupStep } from './dottedPath';
export { slowestDirection, slowestIndex } from './slowestDirection';
export { beltGeometryAt, type BeltGeometry } from './beltGeometryAt';
export { layoutDrawing, layoutDrawingAt } from './layoutDrawing';
export {
  zvShaperImpulses,
  zvdShaperImpulses,
  zvShaperDurationS,
  zvdShaperDurationS,
  rampResidualVibrationMm,
  rampTimeForToleranceS,
  vibrationControl,
  type ShaperImpulse,
  type ShapingResult,
} from './vibrationControl';
export { generalizedEigen3, type Sym3, type Eigen3 } from './linalg';
export {
  TYPICAL_GANTRY_BEAMS,
  MODE_LABELS,
  typicalGantryBeam,
  beamEffectiveMassShare,
  beamBendingFrequencyHz,
  shaftTorsionStiffnessNmPerRad,
  gantryYawMass,
  yawModeFrequencyHz,
  lowestModeMap,
  type TypicalBeam,
  type YawMass,
  type ModeId,
  type ModeReport,
  type LowestModeMap,
} from './structuralModes';
export { pulleyRadialLoadN, shaftLoads, type PulleyLoadInput, type PulleyLoad, type LoadsResult } from './shaftLoads';
export { copperLossW, supplySizing, rmsTorqueNm, referenceMoveRmsTorqueNm, SUPPLY_MARGIN } from './heat';
export {
  toothMeshFrequencyHz,
  stepRatesHz,
  meshCrossings,
  excitation,
  type ExcitationTarget,
  type MeshCrossing,
  type ExcitationResult,
} from './excitation';
export { scheduleJob, type JobPoint, type DirectionLimits, type JobMove, type JobResult, type MoveLimit } from './jobSchedule';
export {
  loadAngleErrorMm,
  microstepDeadband,
  carriageErrorMm,
  errorBudgetMap,
  biggestErrorTerm,
  type Deadband,
  type ErrorTerm,
  type ErrorBudgetPoint,
  type ErrorBudgetResult,
  type ErrorBudgetInput,
} from './errorBudget';
export { yawSlopesMmPerRad, gantryYawMap } from './gantryYaw';
export { sampledGridMap, gridStride } from './gridSampling';
export {
  evaluateSecondLayer,
  structureStiffness,
  directionLimits,
  spanBands,
  type SecondLayerResult,
  type SecondLayerContext,
  type StructureInfo,
} from './secondLayer';
export { type HeatResult } from './heat';
export { jobTime } from './jobTime';
export { secondLayerChecks, STEP_RATE_WARN_SHARE, SHAFT_LOAD_FAIL_FACTOR } from './secondLayerChecks';
