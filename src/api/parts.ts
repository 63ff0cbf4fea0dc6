import type { TorquePoint } from '@/engine';
import { get, patch, post } from './http';

/** The three shelves of the Parts shelf. */
export type PartKind = 'belts' | 'pulleys' | 'motors';

/** Fields every part carries. */
interface PartBase {
  id: number;
  name: string;
  /** Where the numbers come from, e.g. "from memory — replace with your datasheet". */
  note: string | null;
  /** A retired part stays readable (old designs name it) but is not offered for new picks. */
  retired: boolean;
}

/** A belt profile (mirrors the design's "belt"). */
export interface BeltPart extends PartBase {
  profile: string;
  /** Standard the pitch comes from ("ISO 13050"), or "". */
  standard: string | null;
  /** Where the numbers come from (datasheet, "from memory"…), or "". */
  source?: string | null;
  pitchMm: number;
  widthMm: number;
  linearMassKgPerM: number;
  axialStiffnessN: number;
  allowableTensionN: number;
  minPulleyTeeth: number;
}

/** Roles of a pulley on the shelf. */
export type PulleyKind = 'drive' | 'idler-toothed' | 'idler-smooth';

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

/** Fields sent when adding or editing a part (no id; retired only on edit). */
export type PartInput<K extends PartKind> = Omit<PartOf[K], 'id' | 'retired'> & { retired?: boolean };

function itemsOf<T>(body: T[] | { items: T[] }): T[] {
  return Array.isArray(body) ? body : body.items;
}

/** Lists one shelf; retired parts only when asked. */
export const listParts = async <K extends PartKind>(kind: K, includeRetired = false): Promise<PartOf[K][]> =>
  itemsOf(
    await get<PartOf[K][] | { items: PartOf[K][] }>(`/parts/${kind}`, { includeRetired: includeRetired ? 1 : undefined, pageSize: 100 }),
  );

/** Adds a part to a shelf (admin). */
export const createPart = <K extends PartKind>(kind: K, input: PartInput<K>): Promise<PartOf[K]> => post(`/parts/${kind}`, input);

/** Edits or retires a part (admin); `{ retired: true }` retires it. */
export const updatePart = <K extends PartKind>(kind: K, id: number, input: Partial<PartInput<K>>): Promise<PartOf[K]> =>
  patch(`/parts/${kind}/${id}`, input);
