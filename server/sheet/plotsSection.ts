import { fixed } from './format';
import { block, type Content, heading } from './layout';
import { heatmap } from './plots/heatmap';
import { type ChartPoint, lineChart } from './plots/lineChart';
import { polarPlot } from './plots/polar';
import { PALETTE } from './plots/svg';
import { motorNames, unitsOf } from './sections';
import type { SheetData } from './types';

/** An SVG drawn `size` points wide, centred in a column `columnWidth` wide. */
function centred(columnWidth: number, size: number, svg: string): Content {
  return { width: columnWidth, stack: [{ svg, width: size, alignment: 'center' }] };
}

function couplingPlots(data: SheetData, half: number, polar: number): Content {
  const r = data.result;
  const [nameA, nameB] = motorNames(r);
  const tagA = r.motors[0]?.axisLabel ?? 'A';
  const tagB = r.motors[1]?.axisLabel ?? 'B';
  const series = (which: 'speedShare' | 'forceShare') => [
    { label: nameA, tag: tagA, values: r.coupling[which].a, color: PALETTE.blue, signed: true },
    { label: nameB, tag: tagB, values: r.coupling[which].b, color: PALETTE.vermillion, signed: true },
  ];
  return {
    columns: [
      centred(
        half,
        polar,
        polarPlot({
          width: polar,
          title: 'Speed share per motor',
          radiusTitle: 'radius: motor belt speed per unit carriage speed',
          directionsDeg: r.envelope.directionsDeg,
          series: series('speedShare'),
        }),
      ),
      centred(
        half,
        polar,
        polarPlot({
          width: polar,
          title: 'Force share per motor',
          radiusTitle: 'radius: motor belt pull per unit carriage force',
          directionsDeg: r.envelope.directionsDeg,
          series: series('forceShare'),
        }),
      ),
    ],
    columnGap: 14,
  };
}

function envelopePlot(data: SheetData, polar: number): string {
  const env = data.result.envelope;
  const worst = env.axes.worst;
  const u = unitsOf(data);
  const k = u.factor('accel', 'm/s^2');
  return polarPlot({
    width: polar,
    title: 'Acceleration envelope',
    radiusTitle: `radius: largest acceleration in that direction [${u.label('accel')}]`,
    directionsDeg: env.directionsDeg,
    series: [
      { label: 'At rest (speed going to zero)', values: env.accelMaxMPerS2.map((v) => v * k), color: PALETTE.blue },
      {
        label: `At cruise speed ${u.q(data.design.cruiseSpeedMmPerS, 'speed', 'mm/s', 3)}`,
        values: env.accelAtCruiseMPerS2.map((v) => v * k),
        color: PALETTE.vermillion,
        dash: '4 2',
      },
    ],
    markers: [
      {
        directionDeg: worst.directionDeg,
        value: worst.accelMaxMPerS2 * k,
        label: `Worst direction ${fixed(worst.directionDeg, 0)}°: ${u.q(worst.accelMaxMPerS2, 'accel', 'm/s^2', 3)} at rest`,
      },
    ],
  });
}

const SHAPE_OF_MOVE: Record<string, ChartPoint['shape']> = { X: 'circle', Y: 'square', diagonal: 'diamond' };

/**
 * The engine's operating points, one marker per move and moment (the motor that needs the most torque),
 * points that coincide merged into one marker with a joint label.
 */
export function operatingMarkers(data: SheetData): ChartPoint[] {
  const groups = new Map<string, { move: string; when: string; x: number; y: number }>();
  for (const p of data.result.torqueSpeed.operatingPoints) {
    const m = /^(.+?) move (at rest|at cruise)/.exec(p.label);
    const move = m?.[1] ?? p.label;
    const when = m?.[2] ?? '';
    const key = `${move}|${when}`;
    const seen = groups.get(key);
    if (!seen || p.torqueNm > seen.y) groups.set(key, { move, when, x: p.speedRevPerS, y: p.torqueNm });
  }
  const merged: { moves: string[]; when: string; x: number; y: number }[] = [];
  for (const g of groups.values()) {
    const same = merged.find((m) => m.when === g.when && Math.abs(m.x - g.x) < 1e-6 && Math.abs(m.y - g.y) < 1e-9 + 1e-6 * Math.abs(g.y));
    if (same) same.moves.push(g.move);
    else merged.push({ moves: [g.move], when: g.when, x: g.x, y: g.y });
  }
  const u = unitsOf(data);
  const k = u.factor('torque', 'N m');
  const cruise = u.q(data.design.cruiseSpeedMmPerS, 'speed', 'mm/s', 3);
  return merged.map((m) => ({
    x: m.x,
    y: m.y * k,
    shape: SHAPE_OF_MOVE[m.moves[0]] ?? 'triangle',
    filled: m.when === 'at cruise',
    label: `${m.moves.join(' or ')} move ${m.when === 'at cruise' ? `at ${cruise}` : 'from rest'}: ${u.q(m.y, 'torque', 'N m', 3)} at ${fixed(m.x, 2)} rev/s`,
  }));
}

function torqueSpeedPlot(data: SheetData, width: number, height: number): string {
  const ts = data.result.torqueSpeed;
  const u = unitsOf(data);
  const k = u.factor('torque', 'N m');
  return lineChart({
    width,
    height,
    title: `Motor torque against speed (${ts.source === 'table' ? 'uploaded table' : 'motor model'})`,
    xTitle: 'Motor speed [rev/s]',
    yTitle: `Torque [${u.label('torque')}]`,
    series: [
      { label: 'Available torque', x: ts.speedRevPerS, y: ts.torqueNm.map((v) => v * k), color: PALETTE.blue },
      {
        label: `Usable torque (${fixed(data.design.torqueMargin * 100, 0)} % of it)`,
        x: ts.speedRevPerS,
        y: ts.usableTorqueNm.map((v) => v * k),
        color: PALETTE.vermillion,
        dash: '4 2',
      },
    ],
    points: operatingMarkers(data),
  });
}

/** Section 7: coupling map, envelope, torque–speed curve and stiffness map, all vector SVG. */
export function plotsSection(data: SheetData, width: number): Content[] {
  const half = (width - 14) / 2;
  // Polar plots stay small enough that the coupling map and the envelope share a US Letter page.
  const polar = Math.min(half, 214);
  const s = data.result.stiffness;
  const u = unitsOf(data);
  const kL = u.factor('length', 'mm');
  const L = u.label('length');
  return [
    block(
      heading('7', 'Plots'),
      { text: 'Coupling map', style: 'h2', margin: [0, 0, 0, 2] },
      {
        text: 'Share of each motor in carriage speed and force for every direction of travel. A motor alone moves the carriage along its lobe.',
        style: 'note',
        margin: [0, 0, 0, 4],
      },
      couplingPlots(data, half, polar),
    ),
    block(
      { text: 'Speed and acceleration', style: 'h2', margin: [0, 10, 0, 4] },
      {
        columns: [
          centred(half, polar, envelopePlot(data, polar)),
          { width: half, svg: torqueSpeedPlot(data, half, polar * 0.86), margin: [0, 14, 0, 0] },
        ],
        columnGap: 14,
      },
    ),
    block(
      { text: 'Stiffness map', style: 'h2', margin: [0, 10, 0, 2] },
      {
        text: 'Lowest natural frequency of the carriage at every point of the travel. Low values ring longest after a change of acceleration.',
        style: 'note',
        margin: [0, 0, 0, 4],
      },
      {
        svg: heatmap({
          width,
          maxPlotHeight: 300,
          title: 'Lowest natural frequency over the travel',
          xTitle: `Carriage X from the travel origin [${L}]`,
          yTitle: `Carriage Y [${L}]`,
          barTitle: 'Lowest frequency [Hz]',
          xMm: s.xMm.map((v) => v * kL),
          yMm: s.yMm.map((v) => v * kL),
          values: s.lowestFrequencyHz,
          min: {
            value: s.min.frequencyHz,
            xMm: s.min.xMm * kL,
            yMm: s.min.yMm * kL,
            label: `lowest ${fixed(s.min.frequencyHz, 1)} Hz at X ${u.q(s.min.xMm, 'length', 'mm', 4)}, Y ${u.q(s.min.yMm, 'length', 'mm', 4)}`,
          },
        }),
        width,
      },
    ),
  ];
}
