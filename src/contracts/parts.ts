// The parts shelf as the API shows it (GET/POST/PATCH /api/parts/<shelf>, the torque-table routes).
import type { TorquePoint } from '@/engine';
import type { PublicAttachment } from './attachments';
import type { PulleyKind } from './enums';

/** The three shelves of the Parts shelf. */
export type PartShelf = 'belts' | 'pulleys' | 'motors';

/** Fields every part carries. */
export interface PartBase {
  id: number;
  name: string;
  /** Where the numbers come from, e.g. "typical for this size — replace with your datasheet" ("" when none). */
  note: string;
  /** A retired part stays readable (old designs name it) but is not offered for new picks. */
  retired: boolean;
}

/** A belt profile (mirrors the design's "belt"). */
export interface BeltPart extends PartBase {
  profile: string;
  /** Standard the pitch comes from ("ISO 13050"), or "". */
  standard: string | null;
  /** Where the numbers come from (datasheet, "typical"…), or "". */
  source?: string | null;
  pitchMm: number;
  widthMm: number;
  linearMassKgPerM: number;
  axialStiffnessN: number;
  allowableTensionN: number;
  minPulleyTeeth: number;
}

/** Words for each pulley role. */
export const PULLEY_KIND_LABELS: Record<PulleyKind, string> = {
  drive: 'Drive pulley',
  'idler-toothed': 'Toothed idler',
  'idler-smooth': 'Smooth idler',
};

/** A drive pulley or idler. */
export interface PulleyPart extends PartBase {
  teeth: number;
  pitchMm: number;
  /** Belt profile it meshes with ("GT2", "HTD 3M"…). */
  profile: string;
  kind: PulleyKind;
  boreMm: number;
  /** Moment of inertia, when known [kg·m²]. */
  inertiaKgM2: number | null;
}

/** A stepper motor (mirrors the design's "motor"). */
export interface MotorPart extends PartBase {
  frameMm: number;
  stepAngleDeg: number;
  holdingTorqueNm: number;
  ratedCurrentA: number;
  phaseResistanceOhm: number;
  phaseInductanceMh: number;
  rotorInertiaKgM2: number;
  massKg: number;
  torqueCurve: TorquePoint[] | null;
  /** Supply [V] and driver RMS current [A] the torque table was measured at (null when not recorded). */
  torqueCurveConditions: TorqueConditions | null;
}

/** What a torque table was measured at. */
export interface TorqueConditions {
  supplyV: number;
  currentRmsA: number;
}

/** Part type per shelf. */
export interface PartOf {
  belts: BeltPart;
  pulleys: PulleyPart;
  motors: MotorPart;
}

/** A part as the API answers it: the shelf's fields plus where it sits and when it changed. */
export type PublicPart = { [S in PartShelf]: PartOf[S] & { shelf: S; createdAt: string; updatedAt: string } }[PartShelf];

/** A motor's torque table: the motor with its points in use and the file they came from. */
export interface TorqueCurveInfo {
  motor: PublicPart & { shelf: 'motors' };
  /** The uploaded source file (null when the table was typed in or there is none). */
  file: PublicAttachment | null;
  /** Units the uploaded file used. */
  sourceUnits?: { speed: string; torque: string };
}
