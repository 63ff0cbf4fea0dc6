import { pluckBandHz, PLUCK_TENSION_TOLERANCE, slowestDirection } from '@/engine';
import { checkText, fieldLabel, formatInputValue, plural, type QuantityKey } from '@/format';
import { fixed, userTextRuns, utcStamp } from './format';
import { block, COLOR, type Content, type ContentObject, groupRow, heading, numCell, table, th } from './layout';
import { cautionIcon, SEVERITY_WORD, severityIcon } from './plots/glyphs';
import { legacyBelt, legacyMicrostep } from './legacy';
import type { DesignResult, Mechanism, SheetData } from './types';
import { sheetUnits, type SheetUnits } from './units';

/** The sheet's unit helper for this sheet's unit system. */
export function unitsOf(data: Pick<SheetData, 'units'>): SheetUnits {
  return sheetUnits(data.units);
}

/** "[mm]" for a table header. */
const bracket = (label: string): string => (label ? ` [${label}]` : '');

export const MECHANISM_NAME: Record<Mechanism, string> = {
  corexy: 'CoreXY (two stationary motors, crossed belt loops)',
  hbot: 'H-bot (two stationary motors, one H-shaped belt loop)',
  cartesian: 'Cartesian (one motor per axis)',
};

const MECHANISM_SHORT: Record<Mechanism, string> = { corexy: 'CoreXY', hbot: 'H-bot', cartesian: 'Cartesian' };

/** Motor names as the engine labels them ("Motor A", or "Motor X" / "Motor Y (2 motors)" on a cartesian stage). */
export function motorNames(result: DesignResult): [string, string] {
  const name = (i: 0 | 1): string => {
    const m = result.motors[i];
    if (!m) return i === 0 ? 'Motor A' : 'Motor B';
    return `Motor ${m.axisLabel}${m.count > 1 ? ` (${m.count} motors)` : ''}`;
  };
  return [name(0), name(1)];
}

/** Name of the motor the engine reports as limiting ('A' | 'B'). */
export function limitingName(result: DesignResult, motor: string | undefined): string {
  const [a, b] = motorNames(result);
  return motor === 'A' ? a : motor === 'B' ? b : '—';
}

/** Text from users or the engine, split into runs every character of which the sheet fonts can draw. */
export function safe(raw: string, extra: ContentObject = {}): ContentObject {
  return { text: userTextRuns(raw, Boolean(extra.bold), Boolean(extra.italics)), ...extra };
}

function label(text: string): ContentObject {
  return { text, style: 'label', margin: [0, 0, 0, 1] };
}

/** Page 1 title block: design, revision, mechanism, people and approval. */
export function titleBlock(data: SheetData, width: number): Content {
  const { result, design } = data;
  const field = (name: string, value: ContentObject | string): ContentObject => ({
    stack: [label(name), typeof value === 'string' ? { text: value, fontSize: 8.5 } : { fontSize: 8.5, ...value }],
    margin: [0, 1, 0, 1],
  });
  const comment = data.approval.comment.trim();
  const justification = (data.approval.justification ?? '').trim();
  const failed = result.checks.filter((c) => c.severity === 'fail').length;
  const description = design.description.trim();
  return {
    stack: [
      safe(data.designName, { style: 'title', margin: [0, 0, 0, 2] }),
      {
        text: `${MECHANISM_NAME[data.mechanism]}  ·  Revision ${data.revisionNumber}  ·  Approved design sheet`,
        style: 'subtitle',
        margin: [0, 0, 0, 8],
      },
      {
        table: {
          widths: [width * 0.3 - 8, width * 0.3 - 8, width * 0.4 - 8],
          body: [
            [
              field('Revision', { text: String(data.revisionNumber), bold: true }),
              field('Designer', { text: [...userTextRuns(data.designer.name), { text: `  ${data.designer.email}`, color: COLOR.muted }] }),
              field('Approved by', safe(data.approval.reviewerName, { bold: true })),
            ],
            [
              field('Mechanism', MECHANISM_SHORT[data.mechanism]),
              field('Units on this sheet', data.units === 'imperial' ? 'Imperial (in, lbf, oz·in)' : 'Metric (mm, N, N·m)'),
              field('Approved on', utcStamp(data.approval.approvedAt)),
            ],
            [
              {
                colSpan: 3,
                ...field('Reviewer comment', comment ? safe(comment, { italics: true }) : { text: 'No comment.', color: COLOR.muted }),
              },
              {},
              {},
            ],
            ...(failed && justification
              ? [
                  [
                    {
                      colSpan: 3,
                      ...field(
                        `Approved although ${plural(failed, 'check')} failed — the reviewer's justification`,
                        safe(justification, { bold: true }),
                      ),
                    },
                    {},
                    {},
                  ],
                ]
              : []),
          ],
        },
        layout: {
          hLineWidth: (i: number, node: { table: { body: unknown[] } }) => (i === 0 || i === node.table.body.length ? 0.8 : 0.3),
          vLineWidth: (i: number) => (i === 0 || i === 3 ? 0.8 : 0.3),
          hLineColor: () => COLOR.rule,
          vLineColor: () => COLOR.rule,
          paddingLeft: () => 6,
          paddingRight: () => 6,
          paddingTop: () => 3,
          paddingBottom: () => 3,
        },
      },
      ...(description ? [safe(description, { fontSize: 7.5, margin: [0, 4, 0, 0] })] : []),
      {
        text: `Engine ${result.engineVersion}. Build from sections 1 to 3; the sections after them hold the checks and the engineering behind them.`,
        style: 'note',
        margin: [0, 3, 0, 0],
      },
      ...(data.appUrl ? [{ text: `Sheets and tension records online: ${data.appUrl}`, style: 'note', margin: [0, 3, 0, 0] }] : []),
    ],
  };
}

/** The boxed cautions of page 1, worded by the engine so the sheet and the Design desk say the same. */
export function cautionsBox(result: DesignResult, width: number): Content {
  const hazards = result.cautions.filter((c) => c.id !== 'codes-and-practice');
  const defer = result.cautions.find((c) => c.id === 'codes-and-practice');
  const items = hazards.map((c) => ({ text: [{ text: `${c.title}. `, bold: true }, ...userTextRuns(c.text)], margin: [0, 0, 0, 2.5] }));
  return {
    table: {
      widths: [width - 2],
      body: [
        [
          {
            fillColor: COLOR.cautionFill,
            columns: [
              { svg: cautionIcon(24), width: 24, margin: [0, 1, 0, 0] },
              {
                width: '*',
                stack: [
                  { text: 'CAUTIONS — read before building, wiring or running this stage', bold: true, fontSize: 9, margin: [0, 0, 0, 4] },
                  { stack: items, fontSize: 7.5 },
                  ...(defer
                    ? [
                        {
                          text: [{ text: `${defer.title}. ` }, ...userTextRuns(defer.text, true)],
                          fontSize: 7.5,
                          bold: true,
                          margin: [0, 2, 0, 0],
                        },
                      ]
                    : []),
                ],
              },
            ],
            columnGap: 10,
          },
        ],
      ],
    },
    layout: {
      hLineWidth: () => 1.4,
      vLineWidth: () => 1.4,
      hLineColor: () => COLOR.cautionEdge,
      vLineColor: () => COLOR.cautionEdge,
      paddingLeft: () => 8,
      paddingRight: () => 8,
      paddingTop: () => 7,
      paddingBottom: () => 6,
    },
    margin: [0, 12, 0, 0],
  };
}

/** Key figures of page 1 as a strip of labelled values, in the sheet's units. */
export function keyFigures(data: SheetData, width: number): Content {
  const result = data.result;
  const u = unitsOf(data);
  const counts = { ok: 0, warn: 0, fail: 0 };
  for (const c of result.checks) counts[c.severity] += 1;
  const worst = result.envelope.axes.worst;
  const tiles: [string, string, string][] = [
    ['Travel X × Y', `${u.n(result.travel.xMm, 'length', 'mm', 3)} × ${u.n(result.travel.yMm, 'length', 'mm', 3)}`, u.label('length')],
    [
      `Steps per ${u.system === 'imperial' ? 'inch' : 'mm'} (per motor)`,
      stepsText(data),
      `microsteps per ${u.system === 'imperial' ? 'inch' : 'mm'} of belt`,
    ],
    [
      'Worst acceleration at rest',
      u.n(worst.accelMaxMPerS2, 'accel', 'm/s^2', 3),
      `${u.label('accel')} at ${fixed(worst.directionDeg, 0)}°`,
    ],
    [
      'Lowest resonance',
      fixed(result.stiffness.min.frequencyHz, 1),
      `Hz at X ${u.n(result.stiffness.min.xMm, 'length', 'mm', 3)}, Y ${u.q(result.stiffness.min.yMm, 'length', 'mm', 3)}`,
    ],
    ['Checks', `${counts.ok} / ${counts.warn} / ${counts.fail}`, 'ok / warning / fail'],
  ];
  const w = (width - 4 * 8) / 5;
  return {
    columns: tiles.map(([name, value, unit]) => ({
      width: w,
      table: {
        widths: [w],
        body: [
          [
            {
              stack: [
                { text: name, style: 'label' },
                { text: value, fontSize: 13, bold: true, margin: [0, 1, 0, 0] },
                { text: unit, fontSize: 6.5, color: COLOR.muted },
              ],
            },
          ],
        ],
      },
      layout: {
        hLineWidth: (i: number) => (i === 0 ? 1.6 : 0),
        vLineWidth: () => 0,
        hLineColor: () => COLOR.accent,
        paddingLeft: () => 0,
        paddingRight: () => 0,
        paddingTop: () => 3,
        paddingBottom: () => 0,
      },
    })),
    columnGap: 8,
    margin: [0, 12, 0, 0],
  };
}

/** Steps per length of belt to three decimals (a controller needs them exact), per mm or per inch. */
function stepsText(data: SheetData): string {
  const perMm = data.result.drive.stepsPerMm;
  return fixed(data.units === 'imperial' ? perMm * 25.4 : perMm, data.units === 'imperial' ? 2 : 3);
}

/**
 * Section 4: every check with its result as a shape and a word (never colour alone), worst first, its message and
 * value and limit in the sheet's units. Internal check ids stay off the sheet. An approval over a failed check
 * prints the reviewer's justification above the table.
 */
export function checksTable(data: SheetData): Content[] {
  const result = data.result;
  const order = { fail: 0, warn: 1, ok: 2 } as const;
  const sorted = [...result.checks].sort((a, b) => order[a.severity] - order[b.severity]);
  const rows = sorted.map((c) => {
    const text = checkText(c, data.units);
    const message = safe(text.message.replace(/\u00a0/g, ' '));
    return [
      {
        columns: [
          { svg: severityIcon(c.severity, 9), width: 9 },
          { text: SEVERITY_WORD[c.severity], bold: true, fontSize: 7, margin: [4, 0.5, 0, 0] },
        ],
      },
      c.subject ? { stack: [message, safe(c.subject, { fontSize: 6, color: COLOR.muted })] } : message,
      numCell(text.value.replace(/\u00a0/g, ' ')),
      numCell(text.limit.replace(/\u00a0/g, ' ')),
    ];
  });
  const failed = sorted.filter((c) => c.severity === 'fail').length;
  const justification = (data.approval.justification ?? '').trim();
  return [
    heading('4', 'Checks'),
    ...(failed && justification
      ? [
          {
            text: [
              { text: `Approved although ${plural(failed, 'check')} failed. `, bold: true },
              { text: `${data.approval.reviewerName}'s justification: `, bold: true },
              ...userTextRuns(justification),
            ],
            fontSize: 7.5,
            margin: [0, 0, 0, 4],
          },
        ]
      : []),
    table([62, '*', 64, 64], [th('Result'), th('Check'), th('Value', 'right'), th('Limit', 'right')], rows),
    {
      text: 'Ordered: fail, then warning, then ok. The shape and the word carry the result; colour only repeats it.',
      style: 'note',
      margin: [0, 3, 0, 0],
    },
  ];
}

type Row = [string, string, string];

function inputTable(groups: [string, Row[]][]): ContentObject {
  const body: Content[][] = [];
  for (const [title, rows] of groups) {
    body.push(groupRow(title, 3));
    for (const [name, value, unit] of rows) body.push([name, numCell(value), { text: unit, color: COLOR.muted }]);
  }
  return table(['*', 'auto', 40], [th('Quantity'), th('Value', 'right'), th('Unit')], body);
}

function signWord(sign: 1 | -1): string {
  return sign === -1 ? 'reversed' : 'as drawn';
}

/** Section 8: the design inputs in the Design desk's four groups, named as on the desk, in the sheet's units. */
export function inputsSection(data: SheetData): Content[] {
  const d = data.design;
  const r = data.result;
  const u = unitsOf(data);
  const [nameA, nameB] = motorNames(r);
  /** One input by its path: the desk's label, the number and its unit label. */
  const input = (path: string, value: number | null, quantity: QuantityKey, stored: string, label = fieldLabel(path)): Row =>
    value === null ? [label, 'none', ''] : [label, u.n(value, quantity, stored), u.label(quantity)];
  const pair = (label: string, a: number, b: number, quantity: QuantityKey, stored: string): Row => [
    label,
    `${u.n(a, quantity, stored)} × ${u.n(b, quantity, stored)}`,
    u.label(quantity),
  ];
  const inertia = (path: string, v: number | null): Row =>
    v === null ? [fieldLabel(path), 'estimated', ''] : input(path, v, 'inertia', 'kg m^2');
  const left: [string, Row[]][] = [
    [
      'Frame & travel',
      [
        pair('Frame outside, X × Y', d.frame.outerXMm, d.frame.outerYMm, 'length', 'mm'),
        input('frame.extrusionMm', d.frame.extrusionMm, 'length', 'mm'),
        pair('Carriage footprint, X × Y', d.frame.carriageXMm, d.frame.carriageYMm, 'length', 'mm'),
        input('frame.gantryYMm', d.frame.gantryYMm, 'length', 'mm'),
        input('frame.clearanceMm', d.frame.clearanceMm, 'length', 'mm'),
        ...(d.wantedTravel ? [pair('Wanted travel, X × Y', d.wantedTravel.xMm, d.wantedTravel.yMm, 'length', 'mm')] : []),
        pair('Usable travel, X × Y (result)', r.travel.xMm, r.travel.yMm, 'length', 'mm'),
      ],
    ],
    [
      'Belts & pulleys',
      [
        input('belt.pitchMm', d.belt.pitchMm, 'length', 'mm'),
        input('belt.widthMm', d.belt.widthMm, 'length', 'mm'),
        input('belt.linearMassKgPerM', d.belt.linearMassKgPerM, 'linearMass', 'kg/m'),
        input('belt.axialStiffnessN', d.belt.axialStiffnessN, 'force', 'N'),
        input('belt.allowableTensionN', d.belt.allowableTensionN, 'force', 'N', 'Allowable tension (cords)'),
        d.belt.toothAllowableN === null
          ? [fieldLabel('belt.toothAllowableN'), 'typical value', '']
          : input('belt.toothAllowableN', d.belt.toothAllowableN, 'force', 'N'),
        [fieldLabel('belt.minPulleyTeeth'), fixed(d.belt.minPulleyTeeth, 0), 'teeth'],
        [fieldLabel('pulley.driveTeeth'), fixed(d.pulley.driveTeeth, 0), 'teeth'],
        inertia('pulley.driveInertiaKgM2', d.pulley.driveInertiaKgM2),
        [fieldLabel('pulley.idlerTeeth'), fixed(d.pulley.idlerTeeth, 0), 'teeth'],
        inertia('pulley.idlerInertiaKgM2', d.pulley.idlerInertiaKgM2),
        input('pretensionN', d.pretensionN, 'force', 'N', 'Pretension of each span'),
      ],
    ],
  ];
  const curve = d.motor.torqueCurve && d.motor.torqueCurve.length > 0;
  const right: [string, Row[]][] = [
    [
      'Motors & drivers',
      [
        [fieldLabel('motor.stepAngleDeg'), fixed(d.motor.stepAngleDeg, 2), '°'],
        input('motor.holdingTorqueNm', d.motor.holdingTorqueNm, 'torque', 'N m'),
        input('motor.ratedCurrentA', d.motor.ratedCurrentA, 'current', 'A'),
        [fieldLabel('motor.phaseResistanceOhm'), u.n(d.motor.phaseResistanceOhm, 'resistance', 'ohm'), 'ohm'],
        input('motor.phaseInductanceMh', d.motor.phaseInductanceMh, 'inductance', 'mH'),
        input('motor.rotorInertiaKgM2', d.motor.rotorInertiaKgM2, 'inertia', 'kg m^2'),
        input('motor.massKg', d.motor.massKg, 'massSmall', 'kg'),
        ['Torque–speed data', curve ? `table, ${d.motor.torqueCurve?.length} points` : 'motor model', ''],
        [
          fieldLabel('motor.maxSpeedRevPerS'),
          d.motor.maxSpeedRevPerS === null ? 'none' : fixed(d.motor.maxSpeedRevPerS, 1),
          d.motor.maxSpeedRevPerS === null ? '' : 'rev/s',
        ],
        ...(d.mechanism === 'cartesian' ? [[fieldLabel('yMotors'), formatInputValue('yMotors', d.yMotors, data.units), ''] as Row] : []),
        [`Direction of ${nameA}`, signWord(d.motorDirection.a), ''],
        [`Direction of ${nameB}`, signWord(d.motorDirection.b), ''],
        [fieldLabel('driver.microsteps'), formatInputValue('driver.microsteps', d.driver.microsteps, data.units), ''],
        input('driver.supplyV', d.driver.supplyV, 'voltage', 'V'),
        input('driver.currentRmsA', d.driver.currentRmsA, 'current', 'A'),
        [`${fieldLabel('torqueMargin')} (share used)`, fixed(d.torqueMargin * 100, 0), '%'],
      ],
    ],
    [
      'Moving masses',
      [
        input('masses.carriageKg', d.masses.carriageKg, 'mass', 'kg'),
        input('masses.toolKg', d.masses.toolKg, 'mass', 'kg'),
        input('masses.gantryKg', d.masses.gantryKg, 'mass', 'kg'),
        ['Moving mass in X / Y (result)', `${u.n(r.mass.xKg, 'mass', 'kg')} / ${u.n(r.mass.yKg, 'mass', 'kg')}`, u.label('mass')],
        input('', r.mass.reflectedPerMotorKg, 'mass', 'kg', 'Rotor + pulley as belt mass'),
        ['Friction X / Y', `${u.n(d.frictionN.x, 'force', 'N')} / ${u.n(d.frictionN.y, 'force', 'N')}`, u.label('force')],
        ...(d.mechanism === 'hbot'
          ? [
              d.guide.yawMomentRatingNm === null
                ? ([fieldLabel('guide.yawMomentRatingNm'), 'typical value', ''] as Row)
                : input('guide.yawMomentRatingNm', d.guide.yawMomentRatingNm, 'moment', 'N m'),
            ]
          : []),
        input('cruiseSpeedMmPerS', d.cruiseSpeedMmPerS, 'speed', 'mm/s'),
        d.plannedAccelMmPerS2 === null
          ? [fieldLabel('plannedAccelMmPerS2'), 'worst limit', '']
          : input('plannedAccelMmPerS2', d.plannedAccelMmPerS2, 'accel', 'mm/s^2'),
        d.toolMount
          ? input('toolMount.holdN', d.toolMount.holdN, 'force', 'N', 'Tool mount lets go at')
          : ['Tool mount lets go at', 'none fitted', ''],
        input('ringingToleranceMm', d.ringingToleranceMm, 'lengthFine', 'mm'),
      ],
    ],
  ];
  return [block(heading('8', 'Inputs'), { columns: [inputTable(left), inputTable(right)], columnGap: 14 })];
}

/** Section 3: drive numbers per motor and the sign convention. Plain numbers only. */
export function driveSection(data: SheetData): Content[] {
  const { drive } = data.result;
  const u = unitsOf(data);
  const [nameA, nameB] = motorNames(data.result);
  const both = (value: string): Content[] => [numCell(value), numCell(value)];
  const unit = (text: string): ContentObject => ({ text, color: COLOR.muted });
  const per = u.system === 'imperial' ? 'in' : 'mm';
  const perWord = u.system === 'imperial' ? 'inch' : 'mm';
  const fine = (v: number) => u.n(v, 'lengthFine', 'mm', 4);
  const rows: Content[][] = [
    ['Full steps per revolution', ...both(fixed(drive.fullStepsPerRev, 0)), unit('steps/rev')],
    ['Microsteps per full step', ...both(fixed(drive.microsteps, 0)), unit('')],
    ['Drive pulley pitch diameter', ...both(u.n(drive.pitchDiameterMm, 'length', 'mm', 5)), unit(u.label('length'))],
    ['Belt travel per revolution', ...both(u.n(drive.travelPerRevMm, 'length', 'mm', 5)), unit(`${u.label('length')}/rev`)],
    [
      { text: `Steps per ${perWord} of belt`, bold: true },
      numCell(stepsText(data), true),
      numCell(stepsText(data), true),
      unit(`microsteps/${per}`),
    ],
    ['Full-step length (belt)', ...both(fine(drive.fullStepMm)), unit(u.label('lengthFine'))],
    ['Microstep length (belt)', ...both(fine(drive.microstepBeltMm)), unit(u.label('lengthFine'))],
  ];
  const micro = drive.microstep;
  const old = legacyMicrostep(data.result);
  const carriage: Content[][] = micro
    ? [
        [
          'One motor steps once, the other holds',
          numCell(`${fine(micro.oneMotorMm)} toward ${fixed(micro.oneMotorDirectionDeg, 0)}°`),
          unit(u.label('lengthFine')),
        ],
        [{ text: 'Smallest pure X or pure Y move', bold: true }, numCell(fine(micro.axisMm), true), unit(u.label('lengthFine'))],
        ['Smallest pure 45° diagonal move', numCell(fine(micro.diagonalMm)), unit(u.label('lengthFine'))],
      ]
    : old
      ? [
          [`Along X (engine ${data.result.engineVersion})`, numCell(fine(old.x)), unit(u.label('lengthFine'))],
          [`Along Y (engine ${data.result.engineVersion})`, numCell(fine(old.y)), unit(u.label('lengthFine'))],
          [`Along the diagonal (engine ${data.result.engineVersion})`, numCell(fine(old.diagonal)), unit(u.label('lengthFine'))],
        ]
      : [];
  const shaft =
    data.design.mechanism === 'cartesian' && data.design.yMotors === 1
      ? ' One Y motor turns both Y belts through a cross shaft, taken as rigid: its inertia and twist are neglected and both belts share the pull equally.'
      : '';
  return [
    block(
      heading('3', 'Drive numbers for the motion controller'),
      table(['*', 80, 80, 70], [th('Per motor'), th(nameA, 'right'), th(nameB, 'right'), th('Unit')], rows),
      ...(carriage.length
        ? [
            { text: 'Carriage move per microstep', style: 'h2', margin: [0, 6, 0, 3] },
            table(['*', 110, 40], [th('Figure'), th('Move', 'right'), th('Unit')], carriage),
          ]
        : []),
      {
        text:
          'Plain numbers for setting up the motion controller; this sheet gives no controller configuration text. ' +
          (micro
            ? 'Each carriage figure answers its own question: on crossed belts one motor alone moves the carriage along a diagonal, and a pure X or Y move needs one microstep of each motor.'
            : old
              ? `The carriage figures are as approved with engine ${data.result.engineVersion}, which reported one motor's move projected on X and Y.`
              : '') +
          shaft,
        style: 'note',
        margin: [0, 3, 0, 0],
      },
    ),
    block(...signConvention(data)),
  ];
}

function signed(v: number): string {
  return v > 0 ? `+${fixed(v, 3)}` : fixed(v, 3);
}

/** Motor sign convention: belt travel at each motor for unit carriage moves (K), and each motor alone. */
export function signConvention(data: SheetData): Content[] {
  const r = data.result;
  const k = r.kinematics.matrix;
  const [nameA, nameB] = motorNames(r);
  const dir = r.signConvention.motorDirection;
  // K is a ratio of lengths: the same numbers in any unit, for a move of one unit.
  const one = data.units === 'imperial' ? '1 inch' : '1 mm';
  const rows: Content[][] = [
    [`Carriage moves ${one} along +X`, numCell(signed(k[0][0])), numCell(signed(k[1][0]))],
    [`Carriage moves ${one} along +Y`, numCell(signed(k[0][1])), numCell(signed(k[1][1]))],
  ];
  return [
    { text: 'Which way each motor turns', style: 'h2', margin: [0, 10, 0, 3] },
    {
      columns: [
        {
          width: 250,
          ...table(
            ['*', 58, 58],
            [th(`Belt travel at each motor${bracket(data.units === 'imperial' ? 'in' : 'mm')}`), th(nameA, 'right'), th(nameB, 'right')],
            rows,
          ),
        },
        {
          width: '*',
          stack: [
            safe(r.signConvention.a),
            safe(r.signConvention.b, { margin: [0, 2, 0, 0] }),
            {
              text: `Direction setting of this design: ${nameA} ${signWord(dir.a)}, ${nameB} ${signWord(dir.b)} (already in the table).`,
              margin: [0, 2, 0, 0],
            },
            {
              text:
                'Angles: 0° is +X, 90° is +Y, counter-clockwise seen from above. Jog each motor a short way before the first ' +
                'homing; if one runs the other way, swap one of its coil pairs or invert it in the controller.',
              style: 'note',
              margin: [0, 4, 0, 0],
            },
          ],
        },
      ],
      columnGap: 14,
    },
  ];
}

/**
 * Section 2: belt loops to cut, then per span the target pluck frequency with its tolerance band at a stated
 * carriage parking position — in the order a maker works: cut, fit, park, pluck.
 */
export function beltsSection(data: SheetData): Content[] {
  const r = data.result;
  const u = unitsOf(data);
  const L = u.label('length');
  const F = u.label('force');
  const N = (v: number) => u.n(v, 'force', 'N', 3);
  const loops = r.belts.map((b) => {
    const old = legacyBelt(b);
    return [
      safe(b.label, { bold: true }),
      numCell(u.n(b.cutLengthMm, 'length', 'mm', 4), true),
      numCell(fixed(b.loopTeeth, 0), true),
      numCell(u.n(b.loopLengthMm, 'length', 'mm', 5)),
      numCell(`${fixed(b.teethInMesh, 1)} (${fixed(b.driveWrapDeg, 0)}°)`),
      numCell(N(b.peakPullN)),
      numCell(
        old ? `${N(old.tightSideN)} / ${N(old.allowableTensionN)}` : `${N(b.tension.worstTightN)} / ${N(b.tension.tensileAllowableN)}`,
      ),
      numCell(N(old ? old.slackSideN : b.tension.worstSlackN), !old && b.tension.worstSlackN <= 0),
      numCell(old ? '—' : `${N(b.tension.toothLoadN)} / ${N(b.tension.toothAllowableN)}${b.tension.toothAllowableIsTypical ? '*' : ''}`),
    ];
  });
  const where = (p: { xMm: number; yMm: number; directionDeg: number }) =>
    `X ${u.n(p.xMm, 'length', 'mm', 3)}, Y ${u.n(p.yMm, 'length', 'mm', 3)} ${L}, moving toward ${fixed(p.directionDeg, 0)}°`;
  const worstRows = r.belts
    .filter((b) => !legacyBelt(b))
    .map((b) => [
      safe(b.label, { bold: true }),
      numCell(N(b.tension.worstTightN)),
      { text: where(b.tension.worstTightAt) },
      numCell(N(b.tension.worstSlackN), b.tension.worstSlackN <= 0),
      { text: where(b.tension.worstSlackAt) },
    ]);
  const typicalTooth = r.belts.some((b) => !legacyBelt(b) && b.tension.toothAllowableIsTypical);
  const isLegacy = r.belts.some((b) => legacyBelt(b));
  const spans = r.belts.flatMap((b) =>
    b.spans.map((s) => {
      const band = pluckBandHz({ targetHz: s.targetFrequencyHz });
      return [
        safe(b.label),
        safe(`${s.label}${b.referenceSpanId === s.id ? ' (reference)' : ''}`),
        numCell(u.n(s.lengthMm, 'length', 'mm', 4)),
        { text: s.fixedLength ? 'no' : 'yes', alignment: 'center' },
        numCell(fixed(s.targetFrequencyHz, 1), true),
        numCell(`${fixed(band.lowHz, 1)} – ${fixed(band.highHz, 1)}`),
      ];
    }),
  );
  const park = r.parking;
  const centre = Math.abs(park.xMm - r.travel.xMm / 2) < 0.05 && Math.abs(park.yMm - r.travel.yMm / 2) < 0.05;
  const parking =
    `Park the carriage at X ${u.q(park.xMm, 'length', 'mm', 4)}, Y ${u.q(park.yMm, 'length', 'mm', 4)} from the travel origin` +
    `${centre ? ' (the centre of travel)' : ''} with the motors unpowered, then pluck each span at its middle.`;
  const tolerancePct = fixed(PLUCK_TENSION_TOLERANCE * 100, 0);
  return [
    block(
      heading('2', 'Belts: cut, fit and tension'),
      { text: 'Loops to cut', style: 'h2', margin: [0, 0, 0, 3] },
      table(
        [52, 44, 34, '*', 54, 40, 62, 40, 56],
        [
          th('Belt'),
          th(`Cut length${bracket(L)}`, 'right'),
          th('Teeth', 'right'),
          th(`Pitch-line loop${bracket(L)}`, 'right'),
          th('Teeth in mesh (wrap)', 'right'),
          th(`Peak pull${bracket(F)}`, 'right'),
          th(`${isLegacy ? 'Tight side' : 'Worst tight'} / allowed${bracket(F)}`, 'right'),
          th(`${isLegacy ? 'Slack side' : 'Worst slack'}${bracket(F)}`, 'right'),
          th(`Tooth load / allowed${bracket(F)}`, 'right'),
        ],
        loops,
      ),
      {
        text:
          'Cut length includes the clamp allowance at both ends; the teeth count is the pitch-line loop in whole teeth. ' +
          (isLegacy
            ? `Tensions as approved with engine ${r.engineVersion}, which split each pull equally between the arms.`
            : 'Worst tight and slack side: over the whole travel and every direction of the envelope, at rest and at cruise. ' +
              'A pull splits between a belt’s arms in inverse proportion to their lengths, so the short arm takes almost all of it near the ends of travel. ' +
              'Tooth load: peak pull over the teeth in mesh, at most 6 counted, fewer derated 20 % each (common practice); the tensile allowable is the belt’s, as typed.' +
              (typicalTooth
                ? ' * typical value of the allowable load per tooth, scaled from belt makers’ tables; use the maker’s figure.'
                : '')),
        style: 'note',
        margin: [0, 3, 0, 0],
      },
      ...(worstRows.length
        ? [
            { text: 'Where the worst tensions occur', style: 'h2', margin: [0, 6, 0, 3] },
            table(
              [52, 44, '*', 44, '*'],
              [th('Belt'), th(`Tight${bracket(F)}`, 'right'), th('Where'), th(`Slack${bracket(F)}`, 'right'), th('Where')],
              worstRows,
            ),
          ]
        : []),
    ),
    {
      stack: [
        { text: 'Tension: pluck each span', style: 'h2', headlineLevel: 2 },
        { text: parking, bold: true, fontSize: 7.5, margin: [0, 0, 0, 2] },
        {
          text:
            `Set every span to ${u.q(data.design.pretensionN, 'force', 'N', 3)}: tighten until the pluck reads the target, ` +
            `and stop inside the band (tension within ±${tolerancePct} % of the target).`,
          fontSize: 7.5,
          margin: [0, 0, 0, 4],
        },
      ],
    },
    table(
      [60, '*', 56, 52, 60, 76],
      [
        th('Belt'),
        th('Span'),
        th(`Free length${bracket(L)}`, 'right'),
        th('Moves with carriage', 'center'),
        th('Target pluck [Hz]', 'right'),
        th('Good band [Hz]', 'right'),
      ],
      spans,
    ),
    {
      text:
        `The band keeps the tension within ±${tolerancePct} % of the target, a typical value from belt makers' installation guides; ` +
        'the pluck frequency goes with the square root of tension, so the band is about −5 % / +5 % in hertz. ' +
        `Pluck frequency of a span f = (1 / 2L) · sqrt(T / m), with m = ${u.q(data.design.belt.linearMassKgPerM, 'linearMass', 'kg/m', 3)} for this belt. ` +
        'Spans that do not move with the carriage can be checked at any position. Record plucks against this sheet in the app; ' +
        'it reports the tension and flags a mismatch between belts. A reading far above the target may be the second harmonic: pluck again, softly, in the middle.',
      style: 'note',
      margin: [0, 3, 0, 0],
    },
  ];
}

/** Section 5: acceleration and speed limits along X, Y, the diagonal and the worst direction. */
export function limitsSection(data: SheetData): Content[] {
  const env = data.result.envelope;
  const u = unitsOf(data);
  const A = u.label('accel');
  const V = u.label('speed');
  const limiting = (deg: number): string => {
    const i = env.directionsDeg.findIndex((d) => Math.abs(d - deg) < 0.5);
    return limitingName(data.result, i >= 0 ? env.limitingMotor[i] : undefined);
  };
  // The worst acceleration and the worst speed are the lowest over all directions, each in its own direction
  // (docs/models/envelope.md §3): the acceleration is bold on its row, the speed on its own.
  const rows = (['x', 'y', 'diagonal', 'worst', 'slowest'] as const).map((key) => {
    const ax = key === 'slowest' ? slowestDirection(env) : env.axes[key];
    const name = {
      x: 'Along X',
      y: 'Along Y',
      diagonal: 'Along the diagonal',
      worst: 'Worst for acceleration',
      slowest: 'Worst for speed',
    }[key];
    return [
      { text: name, bold: key === 'worst' || key === 'slowest' },
      numCell(fixed(ax.directionDeg, 0)),
      numCell(u.n(ax.accelMaxMPerS2, 'accel', 'm/s^2', 3), key === 'worst'),
      numCell(u.n(ax.accelAtCruiseMPerS2, 'accel', 'm/s^2', 3), key === 'worst'),
      numCell(u.n(ax.speedMaxMPerS, 'speed', 'm/s', 3), key === 'slowest'),
      limiting(ax.directionDeg),
    ];
  });
  return [
    block(
      heading('5', 'Limits'),
      table(
        ['*', 46, 70, 92, 64, 84],
        [
          th('Direction'),
          th('Angle [°]', 'right'),
          th(`Accel. at rest${bracket(A)}`, 'right'),
          th(`Accel. at ${u.q(data.design.cruiseSpeedMmPerS, 'speed', 'mm/s', 3)}${bracket(A)}`, 'right'),
          th(`Max speed${bracket(V)}`, 'right'),
          th('Limited by'),
        ],
        rows,
      ),
      {
        text: `Limits use ${fixed(data.design.torqueMargin * 100, 0)} % of the available motor torque. Acceleration at rest is the limit as the speed goes to zero.`,
        style: 'note',
        margin: [0, 3, 0, 0],
      },
      { text: motorModelNote(data), style: 'note', margin: [0, 3, 0, 0] },
    ),
  ];
}

/** Which torque data the limits rest on, and what the motor model leaves out. */
function motorModelNote(data: SheetData): string {
  const ts = data.result.torqueSpeed;
  if (ts.source === 'table') return 'Motor torque: from the uploaded torque–speed table of this motor (no torque beyond its last row).';
  if (typeof ts.topRevPerS !== 'number')
    return `Motor torque: the motor model of engine ${data.result.engineVersion}. A measured torque–speed table replaces the model where one exists.`;
  return (
    'Motor torque: model of a two-phase hybrid stepper, pull-out torque with the rotor free to lag, under the driver current ' +
    '(capped at the rated current) and the supply voltage; no ceiling where back-EMF reaches the supply ' +
    `(${fixed(ts.backEmfSpeedRevPerS, 1)} rev/s); the curve ends at ${fixed(ts.topRevPerS, 1)} rev/s, where its torque falls to 5 % of standstill ` +
    'or at five times that speed. The model leaves out mid-band resonance, iron loss and detent torque: a measured torque–speed table of ' +
    'the motor on this driver and supply replaces it and should be used where one exists.'
  );
}

/** Section 6: lowest resonance and where, ringing at the weakest point, and gantry racking. */
export function stiffnessSection(data: SheetData): Content[] {
  const r = data.result;
  const s = r.stiffness;
  const u = unitsOf(data);
  const tol = s.toleranceMm;
  const A = u.label('accel');
  const keys = data.design.plannedAccelMmPerS2 !== null ? (['x', 'y', 'worst', 'planned'] as const) : (['x', 'y', 'worst'] as const);
  const ringRows = keys.map((key) => {
    const f = s.ringing[key];
    const name = { x: 'Limit along X', y: 'Limit along Y', worst: 'Limit, worst direction', planned: 'Planned acceleration' }[key];
    return [
      name,
      numCell(u.n(f.accelMPerS2, 'accel', 'm/s^2', 3)),
      numCell(u.n(f.amplitudeMm, 'lengthFine', 'mm', 3), f.amplitudeMm > tol),
      numCell(u.n(f.accelForToleranceMPerS2, 'accel', 'm/s^2', 3)),
    ];
  });
  const rk = r.racking;
  const momentPer =
    u.system === 'imperial'
      ? `${fixed(rk.momentPerNewtonM * 39.37007874, 3)} lbf·in per lbf`
      : `${fixed(rk.momentPerNewtonM, 3)} N·m per newton`;
  const rating =
    typeof rk.yawMomentRatingNm === 'number'
      ? ` The guides are rated for ${u.q(rk.yawMomentRatingNm, 'moment', 'N m', 3)} about the vertical axis${rk.yawMomentRatingIsTypical ? ' (typical value for two small profile-rail carriages; use the guide maker’s rating)' : ''}.`
      : '';
  const racking =
    rk.momentPerNewtonM === 0
      ? r.mechanism === 'cartesian'
        ? 'The X belt is closed on the gantry, so its pull puts no moment on the gantry.'
        : 'Not computed for crossed belts: they would cancel the moment only if each belt shared its pull equally between its arms; with unequal arms a position-dependent moment remains, which this engine does not report yet.'
      : `The gantry feels ${momentPer} of X belt pull (belt turns ${u.q(rk.turnSpacingMm, 'length', 'mm', 3)} apart). ` +
        `At the peak X pull of ${u.q(rk.peakForceXN, 'force', 'N', 3)} that is ${u.q(rk.peakMomentNm, 'moment', 'N m', 3)}, taken by the Y guides as ` +
        `${u.q(rk.guideReactionN, 'force', 'N', 3)} over their ${u.q(rk.guideSpanMm, 'length', 'mm', 3)} span.${rating}`;
  return [
    block(
      heading('6', 'Stiffness, resonance and racking'),
      {
        columns: [
          {
            width: 140,
            stack: [
              { text: 'Lowest resonance', style: 'label' },
              { text: `${fixed(s.min.frequencyHz, 1)} Hz`, fontSize: 16, bold: true },
              { text: `at X ${u.q(s.min.xMm, 'length', 'mm', 4)}, Y ${u.q(s.min.yMm, 'length', 'mm', 4)}`, fontSize: 7.5 },
              { text: 'the weakest point of the travel (marked on the stiffness map)', style: 'note', margin: [0, 2, 0, 0] },
            ],
          },
          {
            width: '*',
            stack: [
              { text: `Ringing at the weakest point (tolerance ${u.q(tol, 'lengthFine', 'mm', 3)})`, style: 'h2', margin: [0, 0, 0, 3] },
              table(
                ['*', 62, 66, 112],
                [
                  th('Acceleration'),
                  th(`Accel.${bracket(A)}`, 'right'),
                  th(`Overshoot${bracket(u.label('lengthFine'))}`, 'right'),
                  th(`Accel. for tolerance${bracket(A)}`, 'right'),
                ],
                ringRows,
              ),
              safe('Overshoot after an abrupt change of acceleration, about a / (2πf)²; bold where it exceeds the tolerance.', {
                style: 'note',
                margin: [0, 3, 0, 0],
              }),
            ],
          },
        ],
        columnGap: 14,
      },
      { text: [{ text: 'Racking. ', bold: true }, racking], fontSize: 7.5, margin: [0, 8, 0, 0] },
    ),
  ];
}

/** Section 1: the parts list for ordering, lengths in the sheet's units. */
export function partsSection(data: SheetData): Content[] {
  const u = unitsOf(data);
  const rows = data.result.partsList.map((p) => [
    safe(p.item, { bold: true }),
    numCell(fixed(p.quantity, 0)),
    safe(p.specParts?.length ? u.parts(p.specParts) : p.spec),
  ]);
  return [heading('1', 'Parts to order'), table([150, 30, '*'], [th('Item'), th('Qty', 'right'), th('Specification')], rows)];
}
