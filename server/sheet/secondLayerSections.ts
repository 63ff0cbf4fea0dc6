import { fixed, sig } from './format';
import { block, COLOR, type Content, type ContentObject, heading, numCell, table, th } from './layout';
import { heatmap } from './plots/heatmap';
import { jobPathPlot } from './plots/jobPath';
import { safe } from './sections';
import type { SheetData } from './types';

// The second layer on the design sheet (docs/models/): a page for the error budget, the modes and vibration
// control with the drive, heat and loads, and a page for the job when the design has one. A revision frozen by an
// engine without the second layer prints neither (the sheet shows what was approved, never a recomputation).

const TERM_NAMES = {
  stretch: 'Belt stretch',
  loadAngle: 'Motor load angle',
  deadband: 'Microstep deadband',
  runout: 'Drive pulley runout',
} as const;

function note(text: string, margin: [number, number, number, number] = [0, 3, 0, 0]): ContentObject {
  return safe(text, { style: 'note', margin });
}

function errorBlock(data: SheetData, width: number): Content {
  const r = data.result;
  const b = r.errorBudget;
  const w = b.worst;
  const rows = (Object.keys(TERM_NAMES) as (keyof typeof TERM_NAMES)[]).map((term) => {
    const value = { stretch: w.stretchMm, loadAngle: w.loadAngleMm, deadband: w.deadbandMm, runout: w.runoutMm }[term];
    return [
      { text: TERM_NAMES[term], bold: b.biggest.term === term },
      numCell(fixed(value * 1000, 1), b.biggest.term === term),
      numCell(`${fixed(w.totalMm > 0 ? (value / w.totalMm) * 100 : 0, 0)} %`),
    ];
  });
  rows.push([{ text: 'Total (worst case)', bold: true }, numCell(fixed(w.totalMm * 1000, 1), true), numCell('100 %')]);
  const s = r.stiffness;
  return block(
    { text: 'Positioning-error budget', style: 'h2', margin: [0, 0, 0, 3] },
    {
      columns: [
        {
          width: 230,
          stack: [
            table(['*', 52, 46], [th('Term'), th('Error [µm]', 'right'), th('Share', 'right')], rows),
            note(
              `At X ${fixed(w.xMm, 1)} mm, Y ${fixed(w.yMm, 1)} mm, moving toward ${fixed(w.directionDeg, 0)}°, at ${sig(b.accelMPerS2, 3)} m/s². ` +
                `The terms are added as a worst case. The runout error repeats every ${fixed(b.runoutPeriodMm, 1)} mm of belt.` +
                (b.isSingleMicrostepEffective
                  ? ''
                  : ' Friction exceeds the torque step of one microstep: the carriage moves in jumps of several.'),
            ),
            safe(b.biggest.message, { fontSize: 7.5, margin: [0, 5, 0, 0] }),
          ],
        },
        {
          width: '*',
          svg: heatmap({
            width: width - 244,
            maxPlotHeight: 170,
            title: 'Worst total error over the travel',
            xTitle: 'Carriage X [mm]',
            yTitle: 'Carriage Y [mm]',
            barTitle: 'Error [µm]',
            xMm: s.xMm,
            yMm: s.yMm,
            values: b.totalMm.map((row) => row.map((v) => v * 1000)),
            min: { value: w.totalMm * 1000, xMm: w.xMm, yMm: w.yMm, label: `worst ${fixed(w.totalMm * 1000, 1)} µm` },
          }),
        },
      ],
      columnGap: 14,
    },
  );
}

function modesBlock(data: SheetData): Content {
  const r = data.result;
  const beam = r.structure.gantryBeam;
  const typical = beam.typical.secondMoment || beam.typical.modulus || beam.typical.mass;
  const rows = r.modes.map((m, i) => [
    { text: m.label, bold: i === 0 },
    numCell(fixed(m.frequencyHz, 1), i === 0),
    numCell(`${fixed(m.xMm, 0)}, ${fixed(m.yMm, 0)}`),
  ]);
  const sh = r.shaping;
  return block(
    { text: 'Modes and vibration control', style: 'h2', margin: [0, 10, 0, 3] },
    {
      columns: [
        {
          width: 250,
          stack: [
            table(['*', 48, 60], [th('Mode'), th('Lowest [Hz]', 'right'), th('At X, Y [mm]', 'right')], rows),
            ...r.modesNotHeld.map((m) => safe(`${m.label}: ${m.message}`, { fontSize: 7.5, bold: true, margin: [0, 4, 0, 0] })),
            note(
              `Gantry beam over ${fixed(beam.spanMm, 0)} mm: I = ${grouped(beam.secondMomentMm4)} mm⁴, E = ${sig(beam.modulusGPa, 3)} GPa, ` +
                `${sig(beam.massKgPerM, 3)} kg/m${typical ? ` (typical values for a ${beam.typical.profile} where the design gives none)` : ''}.` +
                (r.structure.crossShaft
                  ? ` Cross shaft ${fixed(r.structure.crossShaft.diameterMm, 1)} mm over ${fixed(r.structure.crossShaft.lengthMm, 0)} mm.`
                  : '') +
                ' Each mode is computed with the rest of the machine rigid.',
            ),
          ],
        },
        {
          width: '*',
          stack: [
            {
              text: [
                { text: 'Shapers tuned to ', fontSize: 8 },
                { text: `${fixed(sh.frequencyHz, 1)} Hz`, bold: true },
                { text: ` add ${fixed(sh.zvDurationS * 1000, 1)} ms (ZV) or ${fixed(sh.zvdDurationS * 1000, 1)} ms (ZVD) to every move.` },
              ],
              fontSize: 8,
            },
            {
              text:
                `Without a shaper a ramp from rest to ${sig(sh.rampSpeedMPerS * 1000, 3)} mm/s must last at least ` +
                `${fixed(sh.rampTimeForTolerance.trapezoidalS * 1000, 0)} ms at constant acceleration, or ` +
                `${fixed(sh.rampTimeForTolerance.jerkLimitedS * 1000, 0)} ms jerk-limited, to ring less than ${sig(sh.toleranceMm, 2)} mm.`,
              fontSize: 8,
              margin: [0, 4, 0, 0],
            },
            table(
              ['*', 56, 56],
              [th('Lowest mode [Hz]'), th('Ramp [ms]', 'right'), th('Jerk-lim. [ms]', 'right')],
              sh.byFrequency.frequencyHz.map((f, i) => [
                { text: fixed(f, 0), bold: Math.abs(f - sh.frequencyHz) < 1e-9 },
                numCell(fixed(sh.byFrequency.trapezoidalS[i] * 1000, 0)),
                numCell(fixed(sh.byFrequency.jerkLimitedS[i] * 1000, 0)),
              ]),
              { margin: [0, 5, 0, 0] },
            ),
            note('What stiffness buys: the shortest safe ramp at other lowest-mode frequencies (this design in bold).'),
          ],
        },
      ],
      columnGap: 14,
    },
  );
}

function grouped(v: number): string {
  return fixed(v, 0).replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
}

function driveBlock(data: SheetData): Content {
  const r = data.result;
  const e = r.excitation;
  const over = e.microstepRateHzAtCruise > e.stepRateLimitHz;
  const crossings = e.crossings
    .slice(0, 8)
    .map((c) => [
      safe(c.label),
      numCell(c.maxHz > c.minHz * 1.001 ? `${fixed(c.minHz, 0)} to ${fixed(c.maxHz, 0)}` : fixed(c.minHz, 0)),
      numCell(
        c.toBeltSpeedMPerS > c.fromBeltSpeedMPerS * 1.001
          ? `${fixed(c.fromBeltSpeedMPerS * 1000, 0)} to ${fixed(c.toBeltSpeedMPerS * 1000, 0)}`
          : fixed(c.fromBeltSpeedMPerS * 1000, 0),
      ),
    ]);
  const h = r.heat;
  const loads = [...r.loads.pulleys].sort((a, b) => b.atPeakN / b.ratingN - a.atPeakN / a.ratingN).slice(0, 8);
  return block(
    { text: 'Drive: excitation, steps, heat and loads', style: 'h2', margin: [0, 10, 0, 3] },
    {
      text:
        `Step rates of the fastest motor: ${grouped(e.microstepRateHzAtCruise)} microsteps/s at the cruise speed, ` +
        `${grouped(e.microstepRateHzAtTop)} at the top speed, against the controller's ${grouped(e.stepRateLimitHz)} per motor ` +
        `(it allows ${sig(e.speedAtStepLimitMPerS * 1000, 3)} mm/s in every direction).`,
      fontSize: 7.5,
      bold: over,
    },
    crossings.length
      ? table(['*', 60, 70], [th('Tooth mesh meets'), th('Frequency [Hz]', 'right'), th('Belt speed [mm/s]', 'right')], crossings, {
          margin: [0, 4, 0, 0],
        })
      : note('The tooth-mesh frequency (belt speed ÷ pitch) meets no mode below the top speed.'),
    {
      columns: [
        {
          width: '*',
          stack: [
            table(
              ['*', 44, 44, 50],
              [th('Motor'), th('Copper [W]', 'right'), th('Output [W]', 'right'), th('RMS torque', 'right')],
              h.motors.map((m) => [
                safe(m.label),
                numCell(fixed(m.copperLossW, 2)),
                numCell(fixed(m.mechanicalW, 2)),
                numCell(`${fixed((m.rmsTorqueNm / m.continuousTorqueNm) * 100, 0)} %`),
              ]),
              { margin: [0, 6, 0, 0] },
            ),
            note(
              `Supply: at least ${fixed(h.supply.powerW, 0)} W, ${fixed(h.supply.currentA, 2)} A at ${fixed(h.supply.supplyV, 0)} V ` +
                `(${fixed((h.supply.margin - 1) * 100, 0)} % over the estimated draw). RMS torque of a cycle across X then Y, as a share of the rated holding torque.`,
            ),
          ],
        },
        {
          width: '*',
          stack: [
            table(
              ['*', 42, 42, 38],
              [th('Pulley'), th('Pretension [N]', 'right'), th('Peak [N]', 'right'), th('Of rating', 'right')],
              loads.map((p) => [
                safe(p.label, { fontSize: 7 }),
                numCell(fixed(p.atPretensionN, 1)),
                numCell(fixed(p.atPeakN, 1), p.atPeakN > p.ratingN),
                numCell(`${fixed((p.atPeakN / p.ratingN) * 100, 0)} %`),
              ]),
              { margin: [0, 6, 0, 0] },
            ),
            note(
              `Ratings: motor shaft ${fixed(r.loads.ratingN.motorShaft, 0)} N, idler ${fixed(r.loads.ratingN.idler, 0)} N. ` +
                'Radial load from the two belt arms at the wrap; the most loaded pulleys are listed.',
            ),
          ],
        },
      ],
      columnGap: 14,
    },
  );
}

/**
 * The page for the error budget, the modes, vibration control and the drive (empty for a revision frozen without
 * the second layer).
 * @param data - the frozen revision
 * @param width - content width [pt]
 * @param number - section number on the sheet
 */
export function secondLayerSection(data: SheetData, width: number, number: string): Content[] {
  if (!data.result.errorBudget || !data.result.modes) return [];
  return [
    { ...(heading(number, 'Positioning error, modes and the drive') as ContentObject), pageBreak: 'before' },
    errorBlock(data, width),
    modesBlock(data),
    driveBlock(data),
  ];
}

/**
 * The job page: cycle time, the path with the slowest moves and the slowest moves' table (only when the frozen
 * revision has a job).
 * @param data - the frozen revision
 * @param width - content width [pt]
 * @param number - section number on the sheet
 */
export function jobSection(data: SheetData, width: number, number: string): Content[] {
  const job = data.result.job;
  const points = data.design.job?.points ?? [];
  if (!job || points.length === 0) return [];
  const slowRows = job.slowest.map((i) => {
    const m = job.moves[i];
    return [
      `${m.fromIndex + 1} to ${m.toIndex + 1}`,
      numCell(fixed(m.distanceMm, 1)),
      numCell(fixed(m.directionDeg, 0)),
      numCell(m.timeS === null ? '—' : fixed(m.timeS * 1000, 0)),
      numCell(fixed(m.peakSpeedMPerS * 1000, 0)),
      m.limitedBy,
    ];
  });
  return [
    { ...(heading(number, 'Job timing') as ContentObject), pageBreak: 'before' },
    {
      text: [
        { text: 'Cycle time ', fontSize: 9 },
        { text: job.totalS === null ? 'not reachable' : `${sig(job.totalS, 4)} s`, bold: true, fontSize: 12 },
        {
          text:
            `  for ${job.pointCount} points: ${sig(job.moveS ?? Number.NaN, 3)} s moving, ${sig(job.dwellS, 3)} s dwelling, ` +
            `${job.profile === 'jerk-limited' ? 'jerk-limited S-curves' : 'constant-acceleration ramps'}, each move with its own direction's limits.` +
            (job.atLimits && job.atLimits.totalS !== null ? ` As fast as the motors allow: ${sig(job.atLimits.totalS, 4)} s.` : ''),
          fontSize: 8,
        },
      ],
    },
    job.outsideTravel.length
      ? safe(`Points outside the travel: ${job.outsideTravel.map((i) => i + 1).join(', ')}.`, {
          bold: true,
          color: COLOR.ink,
          margin: [0, 3, 0, 0],
        })
      : '',
    { svg: jobPathPlot({ width, maxPlotHeight: 330, travel: data.result.travel, points, job }), width, margin: [0, 6, 0, 0] },
    { text: 'Slowest moves', style: 'h2' },
    table(
      [60, 50, 50, 50, 60, '*'],
      [
        th('Points'),
        th('Length [mm]', 'right'),
        th('Direction [°]', 'right'),
        th('Time [ms]', 'right'),
        th('Peak [mm/s]', 'right'),
        th('Limited by'),
      ],
      slowRows,
    ),
  ];
}
