import { requireNumber, throwInputError } from './errors';

function checkDrive(scope: string, args: { centerMm: number; d1Mm: number; d2Mm: number }): [number, number, number] {
  const c = requireNumber(scope, 'centerMm', args?.centerMm, 0, Infinity, true);
  const d1 = requireNumber(scope, 'd1Mm', args?.d1Mm, 0, Infinity, true);
  const d2 = requireNumber(scope, 'd2Mm', args?.d2Mm, 0, Infinity, true);
  // Pulleys that overlap have no straight belt between them.
  if (Math.abs(d1 - d2) >= 2 * c) throwInputError(scope, 'must exceed half the difference of the diameters', 'centerMm');
  return [c, Math.max(d1, d2), Math.min(d1, d2)];
}

/**
 * Pitch length of an open (uncrossed) two-pulley belt, design formula L = 2C + π(D+d)/2 + (D−d)²/(4C).
 * @param args.centerMm - centre distance C [mm]
 * @param args.d1Mm - pitch diameter of one pulley [mm]
 * @param args.d2Mm - pitch diameter of the other pulley [mm]
 * @returns belt pitch length [mm]
 * @see Shigley's Mechanical Engineering Design (Budynas & Nisbett, 9th/10th ed.), ch. 17, Eq. 17-16a (from memory)
 */
export function openBeltLengthMm(args: { centerMm: number; d1Mm: number; d2Mm: number }): number {
  const [c, big, small] = checkDrive('openBeltLengthMm', args);
  return 2 * c + (Math.PI * (big + small)) / 2 + ((big - small) * (big - small)) / (4 * c);
}

/**
 * Exact pitch length of an open two-pulley belt: L = 2√(C² − ((D−d)/2)²) + π(D+d)/2 + (D−d)·asin((D−d)/(2C)).
 * @param args.centerMm - centre distance C [mm]
 * @param args.d1Mm - pitch diameter of one pulley [mm]
 * @param args.d2Mm - pitch diameter of the other pulley [mm]
 * @returns belt pitch length [mm]
 * @see Encyclopaedia Britannica, 11th ed. (1911), vol. 17, "Mechanics" §59, Eq. 32 B
 */
export function openBeltLengthExactMm(args: { centerMm: number; d1Mm: number; d2Mm: number }): number {
  const [c, big, small] = checkDrive('openBeltLengthExactMm', args);
  const e = (big - small) / 2;
  return 2 * Math.sqrt(c * c - e * e) + (Math.PI * (big + small)) / 2 + (big - small) * Math.asin((big - small) / (2 * c));
}

/**
 * Wrap angle of an open belt on the small pulley: θ = π − 2·asin((D−d)/(2C)).
 * @param args.centerMm - centre distance C [mm]
 * @param args.d1Mm - pitch diameter of one pulley [mm]
 * @param args.d2Mm - pitch diameter of the other pulley [mm]
 * @returns wrap angle on the smaller pulley [rad]
 * @see Shigley's Mechanical Engineering Design, ch. 17, Eq. 17-1 (from memory)
 */
export function wrapAngleRad(args: { centerMm: number; d1Mm: number; d2Mm: number }): number {
  const [c, big, small] = checkDrive('wrapAngleRad', args);
  return Math.PI - 2 * Math.asin((big - small) / (2 * c));
}

/**
 * Teeth in mesh on a pulley: z·θ/(2π) (fractional; belt makers count whole teeth, so compare floor() with the rule).
 * @param args.teeth - pulley tooth count z [-]
 * @param args.wrapRad - wrap angle θ [rad]
 * @returns teeth in mesh [-]
 * @see belt manufacturers' engineering literature (common practice: ≥ 6 teeth in mesh)
 */
export function teethInMesh(args: { teeth: number; wrapRad: number }): number {
  const z = requireNumber('teethInMesh', 'teeth', args?.teeth, 0, 10000, true);
  const w = requireNumber('teethInMesh', 'wrapRad', args?.wrapRad, 0, 2 * Math.PI);
  return (z * w) / (2 * Math.PI);
}
