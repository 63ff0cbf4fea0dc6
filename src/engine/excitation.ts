import { requireNumber } from './errors';

// What the drive itself excites (docs/models/excitation.md): the tooth-mesh frequency against the structural modes
// and the belt spans' own transverse modes, and the step rates the controller must produce.

/**
 * Tooth-mesh frequency: each belt tooth entering a pulley is a small impulse, so a belt at speed v running over
 * teeth of pitch p excites the machine at f = v/p.
 * @param args.beltSpeedMPerS - belt speed v [m/s]
 * @param args.pitchMm - belt pitch p [mm]
 * @returns tooth-mesh frequency [Hz]
 * @see docs/models/excitation.md (tooth-meshing excitation of toothed belt drives)
 */
export function toothMeshFrequencyHz(args: { beltSpeedMPerS: number; pitchMm: number }): number {
  const v = Math.abs(requireNumber('toothMeshFrequencyHz', 'beltSpeedMPerS', args?.beltSpeedMPerS));
  const p = requireNumber('toothMeshFrequencyHz', 'pitchMm', args?.pitchMm, 0, Infinity, true) / 1000;
  return v / p;
}

/**
 * Step rates a motor needs at a belt speed: full steps and microsteps per second.
 * @param args.beltSpeedMPerS - belt speed at the motor pulley [m/s]
 * @param args.fullStepMm - belt travel per full step [mm]
 * @param args.microsteps - microsteps per full step [-]
 * @returns full-step and microstep rates [Hz]
 */
export function stepRatesHz(args: { beltSpeedMPerS: number; fullStepMm: number; microsteps: number }): {
  fullStepHz: number;
  microstepHz: number;
} {
  const v = Math.abs(requireNumber('stepRatesHz', 'beltSpeedMPerS', args?.beltSpeedMPerS)) * 1000;
  const step = requireNumber('stepRatesHz', 'fullStepMm', args?.fullStepMm, 0, Infinity, true);
  const micro = requireNumber('stepRatesHz', 'microsteps', args?.microsteps, 1);
  return { fullStepHz: v / step, microstepHz: (v / step) * micro };
}

/** Something the tooth mesh may excite: a mode (line) or a band of frequencies (a span whose length changes). */
export interface ExcitationTarget {
  /** Plain words, e.g. "Gantry yaw" or "belt A: motor A pulley → idler, back-left corner". */
  label: string;
  kind: 'mode' | 'span';
  /** Lowest and highest frequency over the travel [Hz] (equal for a fixed line). */
  minHz: number;
  maxHz: number;
}

/** Belt speeds at which the tooth mesh sweeps through a target. */
export interface MeshCrossing {
  label: string;
  kind: 'mode' | 'span';
  minHz: number;
  maxHz: number;
  /** Belt speeds where the mesh frequency is inside the target's band (clipped to the speed range) [m/s]. */
  fromBeltSpeedMPerS: number;
  toBeltSpeedMPerS: number;
}

/**
 * Belt speeds within [0, top] at which the tooth-mesh frequency v/p meets each target: v = p·f for every f in
 * the target's band. Targets the mesh never reaches below the top speed are left out.
 * @param args.pitchMm - belt pitch [mm]
 * @param args.topBeltSpeedMPerS - highest belt speed of the stage [m/s]
 * @param args.targets - modes and span bands [Hz]
 * @returns the crossings, lowest speed first
 */
export function meshCrossings(args: { pitchMm: number; topBeltSpeedMPerS: number; targets: ExcitationTarget[] }): MeshCrossing[] {
  const p = requireNumber('meshCrossings', 'pitchMm', args?.pitchMm, 0, Infinity, true) / 1000;
  const top = requireNumber('meshCrossings', 'topBeltSpeedMPerS', args?.topBeltSpeedMPerS, 0);
  const out: MeshCrossing[] = [];
  for (const t of args.targets) {
    const from = p * t.minHz;
    if (!(from <= top) || !(t.maxHz > 0)) continue;
    out.push({ ...t, fromBeltSpeedMPerS: from, toBeltSpeedMPerS: Math.min(top, p * t.maxHz) });
  }
  return out.sort((a, b) => a.fromBeltSpeedMPerS - b.fromBeltSpeedMPerS);
}

/** Excitation section of the result (docs/models/excitation.md). */
export interface ExcitationResult {
  /** Tooth-mesh frequency at the cruise speed, fastest motor, worst direction [Hz]. */
  toothMeshHzAtCruise: number;
  /** Step rates of the fastest motor at the stage's top speed [Hz]. */
  fullStepRateHzAtTop: number;
  microstepRateHzAtTop: number;
  /** Step rates of the fastest motor at the cruise speed [Hz]. */
  fullStepRateHzAtCruise: number;
  microstepRateHzAtCruise: number;
  /** Controller's step-rate limit per motor [Hz]. */
  stepRateLimitHz: number;
  /** Highest belt speed at cruise and at the top speed (fastest motor, worst direction) [m/s]. */
  beltSpeedAtCruiseMPerS: number;
  beltSpeedAtTopMPerS: number;
  /** Carriage speed the controller's limit allows in the worst direction [m/s]. */
  speedAtStepLimitMPerS: number;
  /** What the mesh may excite and where it does. */
  targets: ExcitationTarget[];
  crossings: MeshCrossing[];
}

/**
 * The excitation section: tooth-mesh frequency over the belt-speed range against the modes and the spans' own
 * transverse modes, and the step rates at cruise and top speed against the controller's limit.
 * @param args.pitchMm - belt pitch [mm]
 * @param args.fullStepMm - belt travel per full step [mm]
 * @param args.microsteps - microsteps per full step [-]
 * @param args.beltSpeedPerCarriageSpeed - largest belt speed per unit carriage speed over all directions [-]
 * @param args.cruiseSpeedMPerS - cruise speed of the carriage [m/s]
 * @param args.topBeltSpeedMPerS - highest belt speed the stage reaches in any direction [m/s]
 * @param args.stepRateLimitHz - controller's step-rate limit per motor [Hz]
 * @param args.targets - modes and span bands
 * @returns the section
 * @see docs/models/excitation.md
 */
export function excitation(args: {
  pitchMm: number;
  fullStepMm: number;
  microsteps: number;
  beltSpeedPerCarriageSpeed: number;
  cruiseSpeedMPerS: number;
  topBeltSpeedMPerS: number;
  stepRateLimitHz: number;
  targets: ExcitationTarget[];
}): ExcitationResult {
  const cruiseBelt = args.cruiseSpeedMPerS * args.beltSpeedPerCarriageSpeed;
  const atCruise = stepRatesHz({ beltSpeedMPerS: cruiseBelt, fullStepMm: args.fullStepMm, microsteps: args.microsteps });
  const atTop = stepRatesHz({ beltSpeedMPerS: args.topBeltSpeedMPerS, fullStepMm: args.fullStepMm, microsteps: args.microsteps });
  const microstepMm = args.fullStepMm / args.microsteps;
  return {
    toothMeshHzAtCruise: toothMeshFrequencyHz({ beltSpeedMPerS: cruiseBelt, pitchMm: args.pitchMm }),
    fullStepRateHzAtTop: atTop.fullStepHz,
    microstepRateHzAtTop: atTop.microstepHz,
    fullStepRateHzAtCruise: atCruise.fullStepHz,
    microstepRateHzAtCruise: atCruise.microstepHz,
    stepRateLimitHz: args.stepRateLimitHz,
    beltSpeedAtCruiseMPerS: cruiseBelt,
    beltSpeedAtTopMPerS: args.topBeltSpeedMPerS,
    speedAtStepLimitMPerS: (args.stepRateLimitHz * microstepMm) / 1000 / args.beltSpeedPerCarriageSpeed,
    targets: args.targets,
    crossings: meshCrossings({ pitchMm: args.pitchMm, topBeltSpeedMPerS: args.topBeltSpeedMPerS, targets: args.targets }),
  };
}
