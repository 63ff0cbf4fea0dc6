import { formatNumber } from '@/components/units/quantities';
import { ALL_FIELDS } from '@/views/desk/fields';

/** Labels and stored units of the Design desk inputs, by dotted path. */
const FIELD_BY_PATH = new Map(ALL_FIELDS.map((f) => [f.path, f]));

/** Paths the Design desk form does not list, in words. */
const EXTRA_LABELS: Record<string, string> = {
  name: 'Design name',
  description: 'Description',
  'motor.torqueCurve': 'Motor torque–speed table',
  'job.points': 'Job points',
};

/**
 * A label for an input path: the Design desk's own label when it has one, else the path in words
 * ("frictionN.x" → "Friction n x").
 * @param path - dotted path in the design document
 */
export function inputLabel(path: string): string {
  const field = FIELD_BY_PATH.get(path);
  if (field) return field.label;
  if (EXTRA_LABELS[path]) return EXTRA_LABELS[path];
  const words = path
    .replace(/\./g, ' ')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** The stored unit of an input path ("mm", "kg", "" when none or unknown). */
export function inputUnit(path: string): string {
  const stored = FIELD_BY_PATH.get(path)?.stored ?? '';
  return stored.replace('^2', '²').replace(' ', '·');
}

/**
 * A frozen value in words: numbers to 4 significant digits, null as "—", lists and objects as compact JSON.
 * @param value - any JSON value
 * @param unit - appended to numbers when given
 */
export function formatValue(value: unknown, unit = ''): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'number') return unit ? `${formatNumber(value)} ${unit}` : formatNumber(value);
  if (typeof value === 'string') return value === '' ? '(empty)' : value;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.length === 0 ? '(none)' : `${value.length} entr${value.length === 1 ? 'y' : 'ies'}`;
  return JSON.stringify(value);
}

/**
 * The change between two numbers as a signed percentage ("+12.5 %"), or "" when either is missing or zero.
 */
export function relativeChange(before: number | null, after: number | null): string {
  if (before === null || after === null || before === 0) return '';
  const pct = ((after - before) / Math.abs(before)) * 100;
  if (Math.abs(pct) < 0.05) return '±0 %';
  return `${pct > 0 ? '+' : '−'}${formatNumber(Math.abs(pct), 3)} %`;
}
