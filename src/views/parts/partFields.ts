import { PULLEY_KIND_LABELS, type PartKind, type PulleyKind } from '@/api/parts';
import type { QuantityKey } from '@/format';

/** One field of a part, for the table and the add/edit dialog. */
export interface PartField {
  key: string;
  label: string;
  control: 'text' | 'textarea' | 'number' | 'select';
  quantity?: QuantityKey;
  /** mathjs unit string of the stored value. */
  stored?: string;
  isRequired?: boolean;
  /** Whole numbers only; the value is rounded to this step before sending (e.g. frame size in whole mm). */
  isInteger?: boolean;
  /** Null allowed (off = unknown). */
  isNullable?: boolean;
  options?: { value: string; label: string }[];
  /** Shown as a column of the table. */
  inTable?: boolean;
  help?: string;
}

/** The three shelves: title, singular noun, fields. */
export interface ShelfDef {
  kind: PartKind;
  title: string;
  noun: string;
  fields: PartField[];
}

const NAME: PartField = { key: 'name', label: 'Name', control: 'text', isRequired: true, inTable: true };
const NOTE: PartField = {
  key: 'note',
  label: 'Note',
  control: 'textarea',
  help: 'Where the numbers come from. Numbers that are not from a datasheet should say so, e.g. “typical values for this size — replace with your datasheet”.',
};

/** Every shelf of the Parts shelf screen. */
export const SHELVES: ShelfDef[] = [
  {
    kind: 'belts',
    title: 'Belts',
    noun: 'belt',
    fields: [
      NAME,
      { key: 'profile', label: 'Profile', control: 'text', isRequired: true, inTable: true, help: 'Tooth profile, e.g. GT2, HTD 3M, T5.' },
      {
        key: 'standard',
        label: 'Standard',
        control: 'text',
        help: 'Standard the pitch comes from: ISO 5296, DIN 7721, ISO 13050 — or leave empty for trade belts.',
      },
      { key: 'pitchMm', label: 'Pitch', control: 'number', quantity: 'length', stored: 'mm', isRequired: true, inTable: true },
      { key: 'widthMm', label: 'Width', control: 'number', quantity: 'length', stored: 'mm', isRequired: true, inTable: true },
      {
        key: 'linearMassKgPerM',
        label: 'Mass per metre',
        control: 'number',
        quantity: 'linearMass',
        stored: 'kg/m',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'axialStiffnessN',
        label: 'Stiffness EA',
        control: 'number',
        quantity: 'force',
        stored: 'N',
        isRequired: true,
        inTable: true,
        help: 'Force per unit strain of this width.',
      },
      {
        key: 'allowableTensionN',
        label: 'Allowable tension',
        control: 'number',
        quantity: 'force',
        stored: 'N',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'minPulleyTeeth',
        label: 'Smallest pulley',
        control: 'number',
        quantity: 'teeth',
        stored: '',
        isRequired: true,
        isInteger: true,
        inTable: true,
      },
      { key: 'source', label: 'Source', control: 'text', help: 'Datasheet or book the numbers come from.' },
      NOTE,
    ],
  },
  {
    kind: 'pulleys',
    title: 'Pulleys',
    noun: 'pulley',
    fields: [
      NAME,
      {
        key: 'kind',
        label: 'Role',
        control: 'select',
        isRequired: true,
        inTable: true,
        options: (Object.keys(PULLEY_KIND_LABELS) as PulleyKind[]).map((k) => ({ value: k, label: PULLEY_KIND_LABELS[k] })),
      },
      { key: 'profile', label: 'Belt profile', control: 'text', isRequired: true, inTable: true },
      { key: 'teeth', label: 'Teeth', control: 'number', quantity: 'teeth', stored: '', isRequired: true, isInteger: true, inTable: true },
      { key: 'pitchMm', label: 'Pitch', control: 'number', quantity: 'length', stored: 'mm', isRequired: true, inTable: true },
      { key: 'boreMm', label: 'Bore', control: 'number', quantity: 'length', stored: 'mm', isRequired: true, inTable: true },
      {
        key: 'inertiaKgM2',
        label: 'Inertia',
        control: 'number',
        quantity: 'inertia',
        stored: 'kg m^2',
        isNullable: true,
        inTable: true,
        help: 'Leave empty to let the engine estimate it from the size.',
      },
      NOTE,
    ],
  },
  {
    kind: 'motors',
    title: 'Motors',
    noun: 'motor',
    fields: [
      NAME,
      {
        key: 'frameMm',
        label: 'Frame size',
        control: 'number',
        quantity: 'length',
        stored: 'mm',
        isRequired: true,
        isInteger: true,
        inTable: true,
        help: 'Square flange size, e.g. 42 or 57 mm.',
      },
      { key: 'stepAngleDeg', label: 'Step angle', control: 'number', quantity: 'angle', stored: '', isRequired: true, inTable: true },
      {
        key: 'holdingTorqueNm',
        label: 'Holding torque',
        control: 'number',
        quantity: 'torque',
        stored: 'N m',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'ratedCurrentA',
        label: 'Rated current',
        control: 'number',
        quantity: 'current',
        stored: 'A',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'phaseResistanceOhm',
        label: 'Phase resistance',
        control: 'number',
        quantity: 'resistance',
        stored: 'ohm',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'phaseInductanceMh',
        label: 'Phase inductance',
        control: 'number',
        quantity: 'inductance',
        stored: 'mH',
        isRequired: true,
        inTable: true,
      },
      {
        key: 'rotorInertiaKgM2',
        label: 'Rotor inertia',
        control: 'number',
        quantity: 'inertia',
        stored: 'kg m^2',
        isRequired: true,
        inTable: true,
      },
      { key: 'massKg', label: 'Mass', control: 'number', quantity: 'massSmall', stored: 'kg', isRequired: true, inTable: true },
      NOTE,
    ],
  },
];

/** Notes that flag numbers as typical values rather than read from the part's own datasheet. */
export function isTypicalValue(note: string | null | undefined): boolean {
  return !!note && /typical|not a datasheet|replace with (your|the)|from memory/i.test(note);
}

/**
 * The note several parts of a shelf share word for word (the typical-values warning of the seeded parts, mostly):
 * shown once above the list, each of those rows then carries a short marker instead of the whole sentence.
 * @returns the most common note among `notes` that at least two parts carry, or null
 */
export function sharedNote(notes: readonly (string | null | undefined)[]): string | null {
  const counts = new Map<string, number>();
  for (const n of notes) if (n) counts.set(n, (counts.get(n) ?? 0) + 1);
  let best: string | null = null;
  let bestCount = 1;
  for (const [note, count] of counts) {
    if (count > bestCount) {
      best = note;
      bestCount = count;
    }
  }
  return best;
}

/** One value inside a table cell. */
export interface CellValue {
  key: string;
  quantity?: QuantityKey;
  stored?: string;
}

/** A column of a shelf's table: one value, or two joined ("2 mm × 6 mm", on two lines where the column is narrow). */
export interface TableColumn {
  label: string;
  /**
   * Least width [px]: what the widest value needs in metric and imperial units, or the header on two lines without
   * breaking a word ("ALLOWABLE") or starting a line with a joiner ("FRAME · / STEP"), whichever is more.
   */
  width: number;
  values: CellValue[];
  /** Joins two values. */
  joiner?: string;
  /** Plain text (not a number). */
  isText?: boolean;
}

/**
 * Least widths [px] of each shelf's Name and Note columns. With the value columns and Actions (156 px) they add up to
 * 980 px, just within the table at a 1280 px window, so nothing scrolls sideways there
 * (tests/e2e/listColumns.e2e.test.ts). A note several parts share is said once above the table (sharedNote), so the
 * belts' Note column holds a short marker and Name gets the room for "2 mm round tooth 10 mm" on one line; wider
 * windows give both more, in proportion.
 */
export const TABLE_EDGES: Record<PartKind, { name: number; note: number }> = {
  belts: { name: 176, note: 168 },
  pulleys: { name: 186, note: 194 },
  motors: { name: 184, note: 156 },
};

/** Compact table columns per shelf (the dialog edits every field). */
export const TABLE_COLUMNS: Record<PartKind, TableColumn[]> = {
  belts: [
    {
      label: 'Pitch × width',
      width: 96,
      values: [
        { key: 'pitchMm', quantity: 'length', stored: 'mm' },
        { key: 'widthMm', quantity: 'length', stored: 'mm' },
      ],
      joiner: '×',
    },
    { label: 'Mass per metre', width: 98, values: [{ key: 'linearMassKgPerM', quantity: 'linearMass', stored: 'kg/m' }] },
    { label: 'EA', width: 92, values: [{ key: 'axialStiffnessN', quantity: 'force', stored: 'N' }] },
    { label: 'Allowable tension', width: 102, values: [{ key: 'allowableTensionN', quantity: 'force', stored: 'N' }] },
    { label: 'Smallest pulley', width: 92, values: [{ key: 'minPulleyTeeth' }] },
  ],
  pulleys: [
    { label: 'Role', width: 112, values: [{ key: 'kind' }], isText: true },
    { label: 'Teeth', width: 68, values: [{ key: 'teeth' }] },
    { label: 'Pitch', width: 84, values: [{ key: 'pitchMm', quantity: 'length', stored: 'mm' }] },
    { label: 'Bore', width: 76, values: [{ key: 'boreMm', quantity: 'length', stored: 'mm' }] },
    { label: 'Inertia', width: 104, values: [{ key: 'inertiaKgM2', quantity: 'inertia', stored: 'kg m^2' }] },
  ],
  motors: [
    {
      label: 'Frame · step',
      width: 82,
      values: [
        { key: 'frameMm', quantity: 'length', stored: 'mm' },
        { key: 'stepAngleDeg', quantity: 'angle', stored: '' },
      ],
      joiner: '·',
    },
    { label: 'Holding torque', width: 84, values: [{ key: 'holdingTorqueNm', quantity: 'torque', stored: 'N m' }] },
    { label: 'Rated', width: 68, values: [{ key: 'ratedCurrentA', quantity: 'current', stored: 'A' }] },
    {
      label: 'R · L per phase',
      width: 80,
      values: [
        { key: 'phaseResistanceOhm', quantity: 'resistance', stored: 'ohm' },
        { key: 'phaseInductanceMh', quantity: 'inductance', stored: 'mH' },
      ],
      joiner: '·',
    },
    { label: 'Rotor', width: 96, values: [{ key: 'rotorInertiaKgM2', quantity: 'inertia', stored: 'kg m^2' }] },
    { label: 'Mass', width: 74, values: [{ key: 'massKg', quantity: 'massSmall', stored: 'kg' }] },
  ],
};
