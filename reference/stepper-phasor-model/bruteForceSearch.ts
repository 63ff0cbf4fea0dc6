/**
 * Independent pull-out torque values for reference/stepper-phasor-model/pull-out-torque.json.
 *
 * Brute-force search over the driver's phase-voltage phasor V_s = m·e^{jδ} (0 ≤ m ≤ V, δ the angle to the back-EMF):
 * the current from the circuit, I = (V_s − E)/Z in complex numbers, is feasible when |I| ≤ I_p, and the torque is
 * k_t·Re(I). A 400 × 1440 grid, then five 80 × 80 zooms around the best point. Built from the circuit equation only,
 * not from the closed form of docs/models/motor-torque.md, and imports nothing from the engine, so its rows stay an
 * `independent` check of it.
 *
 * Run: `npx tsx reference/stepper-phasor-model/bruteForceSearch.ts` prints every row's inputs, stored value and
 * the search's value; `tests/unit/reference/pullOutSearch.test.ts` checks that the search reproduces the table.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

/** The motor and driver numbers the search needs (SI except where the name says otherwise). */
export interface SearchInput {
  holdingTorqueNm: number;
  ratedCurrentA: number;
  phaseResistanceOhm: number;
  phaseInductanceMh: number;
  stepAngleDeg: number;
  supplyV: number;
  currentRmsA: number;
  speedRevPerS: number;
}

/** The grid the stored values were searched on: magnitude × angle steps of the first pass, then of each zoom. */
export const TABLE_PASSES: readonly (readonly [number, number])[] = [[400, 1440], ...Array.from({ length: 5 }, () => [80, 80] as const)];

/**
 * Largest torque over the voltage phasors the supply allows with the current within the driver's peak.
 * @param p - motor, driver and speed
 * @param passes - grid of the first pass and of each zoom around the best point (a coarser one is quicker)
 * @returns pull-out torque [N·m] (0 when no phasor gives a forward torque)
 */
export function searchPullOutNm(p: SearchInput, passes: readonly (readonly [number, number])[] = TABLE_PASSES): number {
  const kt = p.holdingTorqueNm / (Math.SQRT2 * p.ratedCurrentA);
  const ip = Math.SQRT2 * Math.min(p.currentRmsA, p.ratedCurrentA);
  const w = 2 * Math.PI * p.speedRevPerS;
  const e = kt * w;
  // Z = R + j·N_r·ω·L, with N_r = 90°/step angle rotor teeth (50 for a 1.8° motor).
  const zr = p.phaseResistanceOhm;
  const zi = (90 / p.stepAngleDeg) * w * (p.phaseInductanceMh / 1000);
  const zz = zr * zr + zi * zi;
  let best = -1e300;
  let bm = 0;
  let bd = 0;
  let mLo = 0;
  let mHi = p.supplyV;
  let dLo = -Math.PI;
  let dHi = Math.PI;
  for (const [nm, nd] of passes) {
    for (let i = 0; i <= nm; i++) {
      const m = Math.min(p.supplyV, mLo + ((mHi - mLo) * i) / nm);
      for (let k = 0; k <= nd; k++) {
        const d = dLo + ((dHi - dLo) * k) / nd;
        // (V_s − E)/Z with V_s = m·(cos δ + j sin δ) and E real.
        const ur = m * Math.cos(d) - e;
        const ui = m * Math.sin(d);
        const ir = (ur * zr + ui * zi) / zz;
        const ii = (ui * zr - ur * zi) / zz;
        if (Math.hypot(ir, ii) <= ip && ir > best) {
          best = ir;
          bm = m;
          bd = d;
        }
      }
    }
    const sm = (mHi - mLo) / nm;
    const sd = (dHi - dLo) / nd;
    mLo = Math.max(0, bm - 2 * sm);
    mHi = Math.min(p.supplyV, bm + 2 * sm);
    dLo = bd - 2 * sd;
    dHi = bd + 2 * sd;
  }
  return Math.max(0, kt * best);
}

/** A row of pull-out-torque.json, as far as the search reads it. */
export interface PullOutRow {
  id: string;
  inputs: {
    motor: { stepAngleDeg: number; holdingTorqueNm: number; ratedCurrentA: number; phaseResistanceOhm: number; phaseInductanceMh: number };
    driver: { supplyV: number; currentRmsA: number };
    speedRevPerS: number;
  };
  expected: { torqueNm: number };
}

/** The search's input for a table row. */
export function searchInputOf(row: PullOutRow): SearchInput {
  const { motor, driver, speedRevPerS } = row.inputs;
  return {
    holdingTorqueNm: motor.holdingTorqueNm,
    ratedCurrentA: motor.ratedCurrentA,
    phaseResistanceOhm: motor.phaseResistanceOhm,
    phaseInductanceMh: motor.phaseInductanceMh,
    stepAngleDeg: motor.stepAngleDeg,
    supplyV: driver.supplyV,
    currentRmsA: driver.currentRmsA,
    speedRevPerS,
  };
}

/** Rounded as the table stores its values: 6 significant figures. */
export function sixFigures(x: number): number {
  return Number(x.toPrecision(6));
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const table = JSON.parse(readFileSync(join(import.meta.dirname, 'pull-out-torque.json'), 'utf8')) as { rows: PullOutRow[] };
  for (const row of table.rows) {
    const found = sixFigures(searchPullOutNm(searchInputOf(row)));
    console.log(`${row.id}: ${row.inputs.speedRevPerS} rev/s, stored ${row.expected.torqueNm} N·m, search ${found} N·m`);
  }
}
