import { MICROSTEP_OPTIONS, type Mechanism } from '@/engine';
import { INPUT_FIELDS, MECHANISM_LABELS, type QuantityKey } from '@/format';

/** One option of a select field. */
export interface FieldOption {
  value: number | string;
  label: string;
}

/** A nullable input: off means null (the engine's default or estimate applies). */
export interface OptionalPart {
  /** Path set to null when off (a field's own path, or its parent object's). */
  path: string;
  /** Switch label, e.g. "Set a wanted travel". */
  label: string;
  /** What "off" means, shown beside the switch. */
  offText: string;
  /** Value written when switched on (stored units). */
  defaultValue: unknown;
}

/** One input of the Design desk form. */
export interface FieldDef {
  /** Dotted path in the design document; also the path of schema issues and API details. */
  path: string;
  label: string;
  /** What the field means and where its limit comes from (tooltip). */
  help: string;
  control: 'number' | 'select';
  quantity?: QuantityKey;
  /** mathjs unit string of the stored value ("" for unitless). */
  stored?: string;
  /** Whole numbers only (teeth, grid points). */
  isInteger?: boolean;
  options?: FieldOption[];
  optional?: OptionalPart;
  /** Shown only for these mechanisms. */
  onlyFor?: Mechanism[];
  /** May be chosen as the swept input. */
  isSweepable?: boolean;
}

/** A titled group of inputs. */
export interface FieldGroup {
  id: 'frame' | 'belts' | 'motors' | 'masses' | 'motion' | 'structure';
  title: string;
  /** Which shelf picker sits at the top of the group. */
  picker?: 'belt' | 'motor';
  fields: FieldDef[];
}

const SIGN_OPTIONS: FieldOption[] = [
  { value: 1, label: '+1 as drawn' },
  { value: -1, label: '−1 wired reversed' },
];

/** A number input; its label, quantity and stored unit come from the one table of input names (`@/format`). */
function num(path: string, help: string, extra: Partial<FieldDef> = {}): FieldDef {
  const known = INPUT_FIELDS[path];
  if (!known?.quantity) throw new Error(`[fields] ${path} has no label or quantity in INPUT_FIELDS`);
  return {
    path,
    label: known.label,
    help,
    control: 'number',
    quantity: known.quantity,
    stored: known.stored ?? '',
    isSweepable: true,
    ...extra,
  };
}

/** A choice input; its label comes from the one table of input names. */
const labelOf = (path: string): string => INPUT_FIELDS[path]?.label ?? path;

/** Every input of a design, grouped as on the Design desk. */
export const FIELD_GROUPS: FieldGroup[] = [
  {
    id: 'frame',
    title: 'Frame & travel',
    fields: [
      {
        path: 'mechanism',
        label: labelOf('mechanism'),
        control: 'select',
        help: 'CoreXY: two stationary motors and two crossed belt loops. H-bot: two stationary motors and one H-shaped loop; the gantry feels a racking moment. Cartesian: one motor per axis, the X motor rides the gantry.',
        options: (Object.keys(MECHANISM_LABELS) as Mechanism[]).map((m) => ({ value: m, label: MECHANISM_LABELS[m] })),
      },
      num(
        'frame.outerXMm',
        'Outside width of the frame along X. Travel is what remains after the extrusions, pulleys, carriage, gantry and end clearances. Accepted: above 0 up to 10 m.',
      ),
      num('frame.outerYMm', 'Outside depth of the frame along Y. Accepted: above 0 up to 10 m.'),
      num(
        'frame.extrusionMm',
        'Cross-section of the frame profile (20 for a 20 × 20 profile). Corner pulleys sit inside it. Accepted: above 0 up to 200 mm.',
      ),
      num('frame.carriageXMm', 'Footprint of the carriage along X: it uses up travel at both ends.'),
      num('frame.carriageYMm', 'Footprint of the carriage along Y.'),
      num('frame.gantryYMm', 'Depth of the gantry beam along Y: it uses up Y travel.'),
      num('frame.clearanceMm', 'Gap kept at each end stop so the carriage never reaches the frame. Default 5 mm.'),
      num('wantedTravel.xMm', 'Travel you need along X. When set, the travel check fails if the frame gives less.', {
        optional: {
          path: 'wantedTravel',
          label: 'I need a set travel',
          offText: 'Not set: travel follows from the frame',
          defaultValue: { xMm: 300, yMm: 300 },
        },
      }),
      num('wantedTravel.yMm', 'Travel you need along Y. When set, the travel check fails if the frame gives less.', {
        optional: {
          path: 'wantedTravel',
          label: 'I need a set travel',
          offText: 'Not set: travel follows from the frame',
          defaultValue: { xMm: 300, yMm: 300 },
        },
      }),
      num(
        'map.points',
        'Grid points per axis of the stiffness map (2 to 101). More points place the weakest spot more exactly and take longer.',
        {
          isInteger: true,
          isSweepable: false,
        },
      ),
    ],
  },
  {
    id: 'belts',
    title: 'Belts & pulleys',
    picker: 'belt',
    fields: [
      num(
        'belt.pitchMm',
        'Tooth spacing of the belt. 2 mm and 3 mm round-tooth belts are common on desktop machines (common practice); trapezoidal pitches are in ISO 5296 and DIN 7721, round-tooth pitches in ISO 13050.',
      ),
      num(
        'belt.widthMm',
        'Width of the belt. Stiffness, mass and allowable tension scale with it: take them from the datasheet for this width.',
      ),
      num(
        'belt.linearMassKgPerM',
        'Mass of one metre of this belt, from the belt maker’s datasheet. Sets each span’s pluck frequency and adds to the moving mass.',
      ),
      num(
        'belt.axialStiffnessN',
        'Force per unit strain of this belt (specific stiffness × width), from the datasheet. A span of length L is a spring EA/L: it sets deflection and the lowest resonance.',
      ),
      num(
        'belt.allowableTensionN',
        'Largest tight-side tension the belt’s cords may carry, from the belt maker’s datasheet. The tensile check compares the worst tight side over the travel with it exactly as typed; few teeth in mesh derate the tooth load, not this.',
      ),
      num(
        'belt.toothAllowableN',
        'Load one tooth in mesh may carry, from the belt maker’s load tables for this pitch and width. The tooth-load check spreads the peak pull over at most 6 teeth in mesh (fewer lose 20 % each, common practice). Off: a typical value, 12 N for a 2 mm pitch, 6 mm wide belt, scaled with pitch × width (belt makers’ tables).',
        {
          optional: {
            path: 'belt.toothAllowableN',
            label: 'Enter the load per tooth',
            offText: 'Typical value for this pitch and width',
            defaultValue: 12,
          },
          isSweepable: false,
        },
      ),
      num(
        'belt.minPulleyTeeth',
        'The belt maker’s smallest pulley for this profile: smaller pulleys bend the tension cords too hard. Checked against the drive pulley and toothed idlers.',
        { isInteger: true },
      ),
      num(
        'pulley.driveTeeth',
        'Teeth of the pulley on each motor shaft. Travel per motor revolution = teeth × pitch: fewer teeth give finer steps and more force, more teeth more speed. Accepted: 6 to 500.',
        { isInteger: true },
      ),
      num('pulley.idlerTeeth', 'Teeth (or the equivalent pitch diameter) of the idlers that turn the belt. Accepted: 6 to 500.', {
        isInteger: true,
      }),
      num(
        'pulley.driveInertiaKgM2',
        'Moment of inertia of one drive pulley. Off: estimated as an aluminium pulley with flanges and a set-screw hub of the pulley’s size (docs in the repository: masses and inertia).',
        {
          optional: {
            path: 'pulley.driveInertiaKgM2',
            label: 'Enter drive pulley inertia',
            offText: 'Estimated from the pulley size',
            defaultValue: 1e-6,
          },
          isSweepable: false,
        },
      ),
      num(
        'pulley.idlerInertiaKgM2',
        'Moment of inertia of one idler. Off: estimated as an aluminium idler with flanges (no hub) of the idler’s size.',
        {
          optional: {
            path: 'pulley.idlerInertiaKgM2',
            label: 'Enter idler inertia',
            offText: 'Estimated from the idler size',
            defaultValue: 5e-7,
          },
          isSweepable: false,
        },
      ),
      num(
        'pretensionN',
        'Static tension each belt span is set to with the motors off. Under load the short arm of a belt takes almost all of a pull near the ends of travel, so keeping the slack side taut needs close to the full peak pull, not half of it. The Belt tension tab shows the worst slack side and turns the pretension into a pluck frequency per span.',
      ),
    ],
  },
  {
    id: 'motors',
    title: 'Motors & drivers',
    picker: 'motor',
    fields: [
      num(
        'motor.stepAngleDeg',
        'Full-step angle of the motor: 1.8° (200 steps per revolution), 0.9° (400) or another two-phase angle, 90° ÷ a whole number of rotor teeth. From the motor datasheet. Three- and five-phase motors (1.2°, 0.72°) are not modelled.',
      ),
      num('motor.holdingTorqueNm', 'Standstill torque with both phases at rated current, from the motor datasheet.'),
      num('motor.ratedCurrentA', 'Phase current the holding torque is quoted at (datasheet).'),
      num(
        'motor.phaseResistanceOhm',
        'Winding resistance of one phase (datasheet). With inductance and supply voltage it sets how torque falls with speed.',
      ),
      num('motor.phaseInductanceMh', 'Winding inductance of one phase (datasheet). Higher inductance loses torque sooner as speed rises.'),
      num(
        'motor.rotorInertiaKgM2',
        'Moment of inertia of the rotor (datasheet). Reflected to the belt as J / r², it adds to the mass each motor accelerates.',
      ),
      num('motor.massKg', 'Mass of one motor. It moves only on a cartesian stage, where the X motor rides the gantry.'),
      num('motor.maxSpeedRevPerS', 'Highest shaft speed you allow (bearings, pulley rating). Off: no limit beyond the torque.', {
        optional: { path: 'motor.maxSpeedRevPerS', label: 'Limit shaft speed', offText: 'No limit beyond the torque', defaultValue: 20 },
      }),
      {
        path: 'driver.microsteps',
        label: labelOf('driver.microsteps'),
        control: 'select',
        help: 'Microsteps per full step set on the driver (a power of two up to 256). Finer microsteps move more smoothly; they do not make the motor hold position more exactly.',
        options: MICROSTEP_OPTIONS.map((m) => ({ value: m, label: m === 1 ? '1 (full step)' : `1/${m}` })),
      },
      num('driver.supplyV', 'DC supply of the drivers. A higher voltage keeps torque up to higher speeds.'),
      num(
        'driver.currentRmsA',
        'RMS phase current set on the driver. At low speed torque = holding torque × RMS current ÷ rated current. Current above the rated current gives no more torque here (the iron saturates, the motor overheats); a check warns.',
      ),
      {
        path: 'motorDirection.a',
        label: labelOf('motorDirection.a'),
        control: 'select',
        help: 'Which way is +A. Builders wire motors both ways; −1 flips motor A’s row of the motor-to-carriage relation. The sheet prints the convention.',
        options: SIGN_OPTIONS,
      },
      {
        path: 'motorDirection.b',
        label: labelOf('motorDirection.b'),
        control: 'select',
        help: 'Which way is +B; −1 flips motor B’s row of the motor-to-carriage relation.',
        options: SIGN_OPTIONS,
      },
      {
        path: 'yMotors',
        label: labelOf('yMotors'),
        control: 'select',
        help: 'One Y motor through a cross shaft, or two synchronised motors, one at each end of the gantry.',
        options: [
          { value: 1, label: 'One, with a cross shaft' },
          { value: 2, label: 'Two, synchronised' },
        ],
        onlyFor: ['cartesian'],
      },
    ],
  },
  {
    id: 'masses',
    title: 'Moving masses',
    fields: [
      num('masses.carriageKg', 'Carriage plate, clamps, bearings: everything that moves in both X and Y except the tool.'),
      num('masses.toolKg', 'The tool on the carriage. Moves in X and Y; the tool-mount check uses it.'),
      num('masses.gantryKg', 'Beam, rail and gantry pulleys: moves in Y only.'),
    ],
  },
  {
    id: 'motion',
    title: 'Motion & margins',
    fields: [
      num('frictionN.x', 'Force to push the carriage along X at constant speed (guides, seals, drag chain).'),
      num('frictionN.y', 'Force to push the gantry along Y at constant speed.'),
      num(
        'guide.yawMomentRatingNm',
        'Moment the Y guides together may take about the vertical axis: the guide maker’s yaw moment rating of one carriage, times the carriages holding the gantry. The H-shaped belt twists the gantry; the racking check compares its peak moment with this. Off: a typical value, 10 N·m, for two 12 mm miniature profile-rail carriages (guide makers’ catalogues).',
        {
          optional: {
            path: 'guide.yawMomentRatingNm',
            label: 'Enter the guides’ rating',
            offText: 'Typical value for two small profile-rail carriages',
            defaultValue: 10,
          },
          onlyFor: ['hbot'],
          isSweepable: false,
        },
      ),
      num(
        'torqueMargin',
        'Share of the available torque the design may use, in percent (above 0 up to 100 %). Common practice keeps a stepper at 50–70 % of its pull-out torque to avoid lost steps; the check warns above 70 %.',
      ),
      num('cruiseSpeedMmPerS', 'Travel speed of typical moves. The envelope gives the acceleration still available at this speed.'),
      num(
        'plannedAccelMmPerS2',
        'Acceleration you mean to use. Off: the limit in the worst direction is used for ringing and tension checks.',
        {
          optional: {
            path: 'plannedAccelMmPerS2',
            label: 'Set a planned acceleration',
            offText: 'Uses the worst-direction limit',
            defaultValue: 5000,
          },
        },
      ),
      num(
        'ringingToleranceMm',
        'Overshoot you accept after an abrupt change of acceleration, at the weakest point of the stiffness map. Default 0.02 mm.',
      ),
      num(
        'toolMount.holdN',
        'Force at which a detachable (e.g. magnetic) tool mount lets go. It must hold tool mass × acceleration with margin, yet still let go in a crash.',
        {
          optional: {
            path: 'toolMount',
            label: 'Detachable tool mount',
            offText: 'Tool fixed to the carriage',
            defaultValue: { holdN: 25 },
          },
        },
      ),
    ],
  },
  {
    id: 'structure',
    title: 'Structure & controller',
    fields: [
      num(
        'gantryBeam.secondMomentMm4',
        'Second moment of area of the gantry beam about the vertical axis (the one it bends about when the carriage accelerates along Y), from the profile maker’s table. Off: a typical value for the frame’s extrusion size — 20 × 20 mm about 6 900 mm⁴, 30 × 30 mm about 28 000 mm⁴, 40 × 40 mm about 95 000 mm⁴ (typical values rounded from aluminium profile catalogues; makers differ by several per cent).',
        {
          optional: {
            path: 'gantryBeam.secondMomentMm4',
            label: 'Enter the beam’s second moment',
            offText: 'Typical value for the frame profile',
            defaultValue: 6900,
          },
        },
      ),
      num(
        'gantryBeam.modulusGPa',
        'Young’s modulus of the beam material. Off: aluminium profile alloy, about 69 GPa (typical value); steel is about 200 GPa.',
        {
          optional: {
            path: 'gantryBeam.modulusGPa',
            label: 'Enter the beam’s modulus',
            offText: 'Aluminium, typical value',
            defaultValue: 69,
          },
        },
      ),
      num(
        'gantryBeam.massKgPerM',
        'Mass of the beam itself per metre, for its own share in the bending mode. Off: a typical value for the frame’s extrusion size (20 × 20 mm about 0.5 kg/m).',
        {
          optional: {
            path: 'gantryBeam.massKgPerM',
            label: 'Enter the beam’s mass per metre',
            offText: 'Typical value for the frame profile',
            defaultValue: 0.5,
          },
        },
      ),
      num(
        'crossShaft.diameterMm',
        'Solid round shaft that carries one Y motor’s turn to the far side (cartesian with one Y motor). Its twist lets the gantry turn. Default 8 mm.',
        { onlyFor: ['cartesian'] },
      ),
      num('crossShaft.shearModulusGPa', 'Shear modulus of the shaft material. Default 79.3 GPa, steel (typical value).', {
        onlyFor: ['cartesian'],
      }),
      num(
        'pulley.runoutMm',
        'Eccentricity of the drive pulley’s pitch circle on the shaft: a once-per-turn position error in the error budget. Default 0.02 mm (typical value for a small machined pulley).',
      ),
      num(
        'controller.maxStepRateHz',
        'Highest step-pulse rate the motion controller gives one motor. Default 100 kHz (a typical figure for a small 32-bit controller); enter your controller’s.',
      ),
      num(
        'controller.jerkMmPerS3',
        'Jerk limit of the controller’s motion planner. On: job moves are timed as jerk-limited S-curves. Off: constant-acceleration ramps.',
        {
          optional: {
            path: 'controller.jerkMmPerS3',
            label: 'Moves are jerk-limited',
            offText: 'Constant-acceleration ramps',
            defaultValue: 100000,
          },
        },
      ),
      num(
        'radialLoadRating.motorShaftN',
        'Radial load the motor maker allows on the shaft (usually quoted at a distance from the flange). Default 75 N, a typical figure for a 42 mm-frame stepper quoted at 20 mm from the flange (makers quote roughly 25–75 N); enter the datasheet figure.',
      ),
      num(
        'radialLoadRating.idlerN',
        'Radial load an idler and its bearings may carry. Default 200 N (typical value for small idlers on miniature ball bearings).',
      ),
    ],
  },
];

/** Every field, flat. */
export const ALL_FIELDS: FieldDef[] = FIELD_GROUPS.flatMap((g) => g.fields);

/** Fields a sweep may vary. */
export const SWEEPABLE_FIELDS: FieldDef[] = ALL_FIELDS.filter((f) => f.control === 'number' && f.isSweepable && !f.optional);

/** The group a dotted issue path belongs to (for counting problems per group). */
export function groupOfPath(path: string): FieldGroup['id'] | null {
  for (const g of FIELD_GROUPS) {
    if (g.fields.some((f) => path === f.path || path.startsWith(`${f.path}.`) || (f.optional && path === f.optional.path))) return g.id;
  }
  if (path.startsWith('motor.torqueCurve')) return 'motors';
  if (path.startsWith('frame') || path === 'wantedTravel') return 'frame';
  return null;
}
