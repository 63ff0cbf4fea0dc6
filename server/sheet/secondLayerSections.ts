import { fixed } from './format';
import { block, COLOR, type Content, type ContentObject, heading, numCell, table, th } from './layout';
import { heatmap } from './plots/heatmap';
import { jobPathPlot } from './plots/jobPath';
import { safe, unitsOf } from './sections';
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
  const u = unitsOf(data);
  const L = u.label('length');
  const kL = u.factor('length', 'mm');
  const kF = u.factor('lengthFine', 'mm');
  const rows = (Object.keys(TERM_NAMES) as (keyof typeof TERM_NAMES)[]).map((term) => {
    const value = { stretch: w.stretchMm, loadAngle: w.loadAngleMm, deadband: w.deadbandMm, runout: w.runoutMm }[term];
    return [
      { text: TERM_NAMES[term], bold: b.biggest.term === term },
      numCell(u.n(value, 'lengthFine', 'mm', 3), b.biggest.term === term),
      numCell(u.q(w.totalMm > 0 ? value / w.totalMm : 0, 'percent', 'ratio', 3)),
    ];
  });
  rows.push([
    { text: 'Total (worst case)', bold: true },
    numCell(u.n(w.totalMm, 'lengthFine', 'mm', 3), true),
    numCell(u.q(1, 'percent', 'ratio')),
  ]);
  const s = r.stiffness;
  return block(
    { text: 'Positioning-error budget', style: 'h2', margin: [0, 0, 0, 3] },
    {
      columns: [
        {
          width: 230,
          stack: [
            table(['*', 52, 46], [th('Term'), th(`Error [${u.label('lengthFine')}]`, 'right'), th('Share', 'right')], rows),
            note(
              `At X ${u.q(w.xMm, 'length', 'mm')}, Y ${u.q(w.yMm, 'length', 'mm')}, moving toward ${fixed(w.directionDeg, 0)}°, at ${u.q(b.accelMPerS2, 'accel', 'm/s^2', 3)}. ` +
                `The terms are added as a worst case. The runout error repeats every ${u.q(b.runoutPeriodMm, 'length', 'mm', 3)} of belt.` +
                (b.isSingleMicrostepEffective
                  ? ''
                  : ' Friction exceeds the torque step of one microstep: the carriage moves in jumps of several.'),
            ),
            safe(b.biggest.parts ? u.parts(b.biggest.parts) : b.biggest.message, { fontSize: 7.5, margin: [0, 5, 0, 0] }),
          ],
        },
        {
          width: '*',
          svg: heatmap({
            width: width - 244,
            maxPlotHeight: 170,
            title: 'Worst total error over the travel',
            xTitle: `Carriage X [${L}]`,
            yTitle: `Carriage Y [${L}]`,
            barTitle: `Error [${u.label('lengthFine')}]`,
            xMm: s.xMm.map((v) => v * kL),
            yMm: s.yMm.map((v) => v * kL),
            values: b.totalMm.map((row) => row.map((v) => v * kF)),
            min: { value: w.totalMm * kF, xMm: w.xMm * kL, yMm: w.yMm * kL, label: `worst ${u.q(w.totalMm, 'lengthFine', 'mm', 3)}` },
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
  const u = unitsOf(data);
  const rows = r.modes.map((m, i) => [
    { text: m.label, bold: i === 0 },
    numCell(fixed(m.frequencyHz, 1), i === 0),
    numCell(`${u.n(m.xMm, 'length', 'mm', 3)}, ${u.n(m.yMm, 'length', 'mm', 3)}`),
  ]);
  const sh = r.shaping;
  return block(
    { text: 'Modes and vibration control', style: 'h2', margin: [0, 10, 0, 3] },
    {
      columns: [
        {
          width: 250,
          stack: [
            table(['*', 48, 60], [th('Mode'), th('Lowest [Hz]', 'right'), th(`At X, Y [${u.label('length')}]`, 'right')], rows),
            ...r.modesNotHeld.map((m) => safe(`${m.label}: ${m.message}`, { fontSize: 7.5, bold: true, margin: [0, 4, 0, 0] })),
            note(
              `Gantry beam over ${u.q(beam.spanMm, 'length', 'mm')}: I = ${u.q(beam.secondMomentMm4, 'secondMoment', 'mm^4', 3)}, ` +
                `E = ${u.q(beam.modulusGPa, 'modulus', 'GPa', 3)}, ${u.q(beam.massKgPerM, 'linearMass', 'kg/m', 3)}${typical ? ` (typical values for a ${beam.typical.profile} where the design gives none)` : ''}.` +
                (r.structure.crossShaft
                  ? ` Cross shaft ${u.q(r.structure.crossShaft.diameterMm, 'length', 'mm', 3)} over ${u.q(r.structure.crossShaft.lengthMm, 'length', 'mm')}.`
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
                {
                  text: ` add ${u.q(sh.zvDurationS, 'timeShort', 's', 3)} (ZV) or ${u.q(sh.zvdDurationS, 'timeShort', 's', 3)} (ZVD) to every move.`,
                },
              ],
              fontSize: 8,
            },
            {
              text:
                `Without a shaper a ramp from rest to ${u.q(sh.rampSpeedMPerS, 'speed', 'm/s', 3)} must last at least ` +
                `${u.q(sh.rampTimeForTolerance.trapezoidalS, 'timeShort', 's', 3)} at constant acceleration, or ` +
                `${u.q(sh.rampTimeForTolerance.jerkLimitedS, 'timeShort', 's', 3)} jerk-limited, to ring less than ${u.q(sh.toleranceMm, 'lengthFine', 'mm', 3)}.`,
              fontSize: 8,
              margin: [0, 4, 0, 0],
            },
            table(
              ['*', 56, 56],
              [th('Lowest mode [Hz]'), th('Ramp [ms]', 'right'), th('Jerk-lim. [ms]', 'right')],
              sh.byFrequency.frequencyHz.map((f, i) => [
                { text: fixed(f, 0), bold: Math.abs(f - sh.frequencyHz) < 1e-9 },
                numCell(u.n(sh.byFrequency.trapezoidalS[i], 'timeShort', 's', 3)),
                numCell(u.n(sh.byFrequency.jerkLimitedS[i], 'timeShort', 's', 3)),
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
  const u = unitsOf(data);
  const crossings = e.crossings
    .slice(0, 8)
    .map((c) => [
      safe(c.label),
      numCell(c.maxHz > c.minHz * 1.001 ? `${fixed(c.minHz, 0)} to ${fixed(c.maxHz, 0)}` : fixed(c.minHz, 0)),
      numCell(
        c.toBeltSpeedMPerS > c.fromBeltSpeedMPerS * 1.001
          ? `${u.n(c.fromBeltSpeedMPerS, 'speed', 'm/s', 3)} to ${u.n(c.toBeltSpeedMPerS, 'speed', 'm/s', 3)}`
          : u.n(c.fromBeltSpeedMPerS, 'speed', 'm/s', 3),
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
        `(it allows ${u.q(e.speedAtStepLimitMPerS, 'speed', 'm/s', 3)} in every direction).`,
      fontSize: 7.5,
      bold: over,
    },
    crossings.length
      ? table(
          ['*', 60, 70],
          [th('Tooth mesh meets'), th('Frequency [Hz]', 'right'), th(`Belt speed [${u.label('speed')}]`, 'right')],
          crossings,
          {
            margin: [0, 4, 0, 0],
          },
        )
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
                numCell(u.q(m.rmsTorqueNm / m.continuousTorqueNm, 'percent', 'ratio', 3)),
              ]),
              { margin: [0, 6, 0, 0] },
            ),
            note(
              `Supply: at least ${fixed(h.supply.powerW, 0)} W, ${fixed(h.supply.currentA, 2)} A at ${fixed(h.supply.supplyV, 0)} V ` +
                `(${u.q(h.supply.margin - 1, 'percent', 'ratio', 3)} over the estimated draw). RMS torque of a cycle across X then Y, as a share of the rated holding torque.`,
            ),
          ],
        },
        {
          width: '*',
          stack: [
            table(
              ['*', 42, 42, 38],
              [
                th('Pulley'),
                th(`Pretension [${u.label('force')}]`, 'right'),
                th(`Peak [${u.label('force')}]`, 'right'),
                th('Of rating', 'right'),
              ],
              loads.map((p) => [
                safe(p.label, { fontSize: 7 }),
                numCell(u.n(p.atPretensionN, 'force', 'N', 3)),
                numCell(u.n(p.atPeakN, 'force', 'N', 3), p.atPeakN > p.ratingN),
                numCell(u.q(p.atPeakN / p.ratingN, 'percent', 'ratio', 3)),
              ]),
              { margin: [0, 6, 0, 0] },
            ),
            note(
              `Ratings: motor shaft ${u.q(r.loads.ratingN.motorShaft, 'force', 'N', 3)}, idler ${u.q(r.loads.ratingN.idler, 'force', 'N', 3)}. ` +
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
  const u = unitsOf(data);
  const slowRows = job.slowest.map((i) => {
    const m = job.moves[i];
    return [
      `${m.fromIndex + 1} to ${m.toIndex + 1}`,
      numCell(u.n(m.distanceMm, 'length', 'mm', 3)),
      numCell(fixed(m.directionDeg, 0)),
      numCell(u.n(m.timeS, 'timeShort', 's', 3)),
      numCell(u.n(m.peakSpeedMPerS, 'speed', 'm/s', 3)),
      m.limitedBy,
    ];
  });
  return [
    { ...(heading(number, 'Job timing') as ContentObject), pageBreak: 'before' },
    {
      text: [
        { text: 'Cycle time ', fontSize: 9 },
        { text: job.totalS === null ? 'not reachable' : u.q(job.totalS, 'time', 's', 4), bold: true, fontSize: 12 },
        {
          text:
            `  for ${job.pointCount} points: ${u.q(job.moveS, 'time', 's', 3)} moving, ${u.q(job.dwellS, 'time', 's', 3)} dwelling, ` +
            `${job.profile === 'jerk-limited' ? 'jerk-limited S-curves' : 'constant-acceleration ramps'}, each move with its own direction's limits.` +
            (job.atLimits && job.atLimits.totalS !== null
              ? ` As fast as the motors allow: ${u.q(job.atLimits.totalS, 'time', 's', 4)}.`
              : ''),
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
        th(`Length [${u.label('length')}]`, 'right'),
        th('Direction [°]', 'right'),
        th(`Time [${u.label('timeShort')}]`, 'right'),
        th(`Peak [${u.label('speed')}]`, 'right'),
        th('Limited by'),
      ],
      slowRows,
    ),
  ];
}
