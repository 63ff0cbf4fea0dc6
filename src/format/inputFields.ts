import { MECHANISM_SHORT } from './labels';
import { RATIO, type QuantityKey } from './displayUnits';
import { formatNumber } from './formatNumber';
import { formatQuantity } from './formatQuantity';
import type { UnitSystem } from './unitSystem';

/** What an input of a design document is called and how its number is shown. */
export interface InputField {
  /** The label the Design desk shows beside the input. */
  label: string;
  /** What it measures (picks the unit shown in each system); absent for choices and text. */
  quantity?: QuantityKey;
  /** mathjs unit string of the stored value ("" for unitless, {@link RATIO} for a share kept as a fraction). */
  stored?: string;
  /** Stored value → words, for choices (mechanism, motor direction, microsteps …). */
  choice?: (value: unknown) => string;
}

const q = (label: string, quantity: QuantityKey, stored: string): InputField => ({ label, quantity, stored });
const sign = (value: unknown): string => (value === -1 ? '−1 wired reversed' : value === 1 ? '+1 as drawn' : String(value));

/**
 * Every input of a design document by dotted path, with the label of the Design desk. The desk form, the review
 * diff, validation messages, the sheet and mails all name inputs from here, so an input has one name everywhere.
 */
export const INPUT_FIELDS: Record<string, InputField> = {
  name: { label: 'Design name' },
  description: { label: 'Description' },
  schemaVersion: { label: 'File format version' },
  mechanism: { label: 'Mechanism', choice: (v) => MECHANISM_SHORT[v as keyof typeof MECHANISM_SHORT] ?? String(v) },
  'frame.outerXMm': q('Frame width, outside (X)', 'length', 'mm'),
  'frame.outerYMm': q('Frame depth, outside (Y)', 'length', 'mm'),
  'frame.extrusionMm': q('Extrusion size', 'length', 'mm'),
  'frame.carriageXMm': q('Carriage width (X)', 'length', 'mm'),
  'frame.carriageYMm': q('Carriage depth (Y)', 'length', 'mm'),
  'frame.gantryYMm': q('Gantry depth (Y)', 'length', 'mm'),
  'frame.clearanceMm': q('End clearance', 'length', 'mm'),
  wantedTravel: { label: 'Wanted travel' },
  'wantedTravel.xMm': q('Wanted travel X', 'length', 'mm'),
  'wantedTravel.yMm': q('Wanted travel Y', 'length', 'mm'),
  map: { label: 'Stiffness map grid' },
  'map.points': q('Stiffness map grid', 'count', ''),
  'belt.pitchMm': q('Belt pitch', 'length', 'mm'),
  'belt.widthMm': q('Belt width', 'length', 'mm'),
  'belt.linearMassKgPerM': q('Belt mass per metre', 'linearMass', 'kg/m'),
  'belt.axialStiffnessN': q('Belt stiffness EA', 'force', 'N'),
  'belt.allowableTensionN': q('Allowable tension', 'force', 'N'),
  'belt.toothAllowableN': q('Allowable load per tooth', 'force', 'N'),
  'belt.minPulleyTeeth': q('Smallest pulley for this belt', 'teeth', ''),
  'pulley.driveTeeth': q('Drive pulley', 'teeth', ''),
  'pulley.idlerTeeth': q('Idlers', 'teeth', ''),
  'pulley.driveInertiaKgM2': q('Drive pulley inertia', 'inertia', 'kg m^2'),
  'pulley.idlerInertiaKgM2': q('Idler inertia', 'inertia', 'kg m^2'),
  'pulley.runoutMm': q('Drive pulley runout', 'lengthFine', 'mm'),
  pretensionN: q('Belt pretension', 'force', 'N'),
  'motor.stepAngleDeg': q('Step angle', 'angle', ''),
  'motor.holdingTorqueNm': q('Holding torque', 'torque', 'N m'),
  'motor.ratedCurrentA': q('Rated current', 'current', 'A'),
  'motor.phaseResistanceOhm': q('Phase resistance', 'resistance', 'ohm'),
  'motor.phaseInductanceMh': q('Phase inductance', 'inductance', 'mH'),
  'motor.rotorInertiaKgM2': q('Rotor inertia', 'inertia', 'kg m^2'),
  'motor.massKg': q('Motor mass', 'massSmall', 'kg'),
  'motor.maxSpeedRevPerS': q('Shaft speed limit', 'rotSpeed', ''),
  'motor.torqueCurve': {
    label: 'Motor torque table',
    choice: (v) => (Array.isArray(v) && v.length ? `${v.length} points` : 'none (motor model)'),
  },
  'motor.torqueCurveConditions': { label: 'Torque table measured at' },
  'motor.torqueCurveConditions.supplyV': q('Torque table supply voltage', 'voltage', 'V'),
  'motor.torqueCurveConditions.currentRmsA': q('Torque table driver current (RMS)', 'current', 'A'),
  'driver.microsteps': { label: 'Microsteps', choice: (v) => (v === 1 ? '1 (full step)' : `1/${String(v)}`) },
  'driver.supplyV': q('Supply voltage', 'voltage', 'V'),
  'driver.currentRmsA': q('Driver current (RMS)', 'current', 'A'),
  'motorDirection.a': { label: 'Motor A direction', choice: sign },
  'motorDirection.b': { label: 'Motor B direction', choice: sign },
  yMotors: { label: 'Y motors', choice: (v) => (v === 2 ? 'Two, synchronised' : v === 1 ? 'One, with a cross shaft' : String(v)) },
  'masses.carriageKg': q('Carriage', 'mass', 'kg'),
  'masses.toolKg': q('Tool', 'mass', 'kg'),
  'masses.gantryKg': q('Gantry', 'mass', 'kg'),
  frictionN: { label: 'Friction' },
  'frictionN.x': q('Friction along X', 'force', 'N'),
  'frictionN.y': q('Friction along Y', 'force', 'N'),
  guide: { label: 'Guides' },
  'guide.yawMomentRatingNm': q('Guide yaw moment rating', 'moment', 'N m'),
  torqueMargin: q('Torque margin', 'percent', RATIO),
  cruiseSpeedMmPerS: q('Cruise speed', 'speed', 'mm/s'),
  plannedAccelMmPerS2: q('Planned acceleration', 'accel', 'mm/s^2'),
  ringingToleranceMm: q('Ringing tolerance', 'lengthFine', 'mm'),
  toolMount: { label: 'Detachable tool mount' },
  'toolMount.holdN': q('Tool mount hold force', 'force', 'N'),
  // The second layer (docs/models/).
  gantryBeam: { label: 'Gantry beam' },
  'gantryBeam.secondMomentMm4': q('Gantry beam second moment', 'secondMoment', 'mm^4'),
  'gantryBeam.modulusGPa': q('Gantry beam modulus', 'modulus', 'GPa'),
  'gantryBeam.massKgPerM': q('Gantry beam mass per metre', 'linearMass', 'kg/m'),
  crossShaft: { label: 'Cross shaft' },
  'crossShaft.diameterMm': q('Cross shaft diameter', 'length', 'mm'),
  'crossShaft.shearModulusGPa': q('Cross shaft shear modulus', 'modulus', 'GPa'),
  controller: { label: 'Controller' },
  'controller.maxStepRateHz': q('Controller step rate limit', 'frequency', 'Hz'),
  'controller.jerkMmPerS3': q('Controller jerk', 'jerk', 'mm/s^3'),
  radialLoadRating: { label: 'Radial load ratings' },
  'radialLoadRating.motorShaftN': q('Motor shaft radial load rating', 'force', 'N'),
  'radialLoadRating.idlerN': q('Idler radial load rating', 'force', 'N'),
  job: { label: 'Job', choice: (v) => (v && typeof v === 'object' ? 'set' : 'none') },
  'job.points': { label: 'Job points', choice: (v) => (Array.isArray(v) ? `${v.length} point${v.length === 1 ? '' : 's'}` : String(v)) },
};

/**
 * The label of an input path. Rows of a torque table read "Motor torque table, row 3, speed"; a path nobody
 * labelled is spelled out in words ("frictionN.z" → "Friction n z").
 * @param path - dotted path in the design document ("" for the document itself)
 */
export function fieldLabel(path: string): string {
  const known = INPUT_FIELDS[path];
  if (known) return known.label;
  const row = /^motor\.torqueCurve\.(\d+)(?:\.(speedRevPerS|torqueNm))?$/.exec(path);
  if (row) return `Motor torque table, row ${Number(row[1]) + 1}${row[2] ? `, ${row[2] === 'speedRevPerS' ? 'speed' : 'torque'}` : ''}`;
  if (!path) return 'The design file';
  const words = path
    .replace(/\./g, ' ')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

// "outer X size must be …", "microsteps must be …": the schema names the field in its own words before the verb.
const SUBJECT_BEFORE_VERB = /^[a-z][a-z0-9 \-–]*? (?=(must|is|are|should|cannot) )/i;

/**
 * A validation message that names the field by the label people see: "Frame width, outside (X) must be greater
 * than 0" rather than "outer X size must be greater than 0" at path "frame.outerXMm".
 * @param path - dotted path of the issue ("" for the whole document)
 * @param message - the schema's message
 */
export function fieldMessage(path: string, message: string): string {
  if (!path) return message;
  const label = fieldLabel(path);
  const rest = message.replace(SUBJECT_BEFORE_VERB, '');
  return rest === message && !/^(must|is|are|should|cannot) /.test(message) ? `${label}: ${message}` : `${label} ${rest}`;
}

/**
 * A stored input value in words in a unit system: numbers with their unit ("18.11 in", "60 %"), choices by name
 * ("H-bot"), null as "—", lists by their size.
 * @param path - dotted path of the input
 * @param value - the stored value
 * @param system - metric or imperial
 */
export function formatInputValue(path: string, value: unknown, system: UnitSystem): string {
  const field = INPUT_FIELDS[path];
  if (value === null || value === undefined) return '—';
  if (field?.choice) return field.choice(value);
  if (typeof value === 'number')
    return field?.quantity ? formatQuantity(value, field.quantity, field.stored ?? '', system) : formatNumber(value);
  if (typeof value === 'string') return value === '' ? '(empty)' : value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.length === 0 ? '(none)' : `${value.length} entr${value.length === 1 ? 'y' : 'ies'}`;
  return 'set';
}
