import { fixed, grouped, sig, userTextRuns, utcStamp } from './format';
import { block, COLOR, type Content, type ContentObject, groupRow, heading, numCell, table, th } from './layout';
import { cautionIcon, SEVERITY_WORD, severityIcon } from './plots/glyphs';
import { legacyBelt, legacyMicrostep } from './legacy';
import type { DesignResult, Mechanism, SheetData } from './types';

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
              field('Engine version', result.engineVersion),
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
          ],
        },
        layout: {
          hLineWidth: (i: number) => (i === 0 || i === 3 ? 0.8 : 0.3),
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

/** Key figures of page 1 as a strip of labelled values. */
export function keyFigures(result: DesignResult, width: number): Content {
  const counts = { ok: 0, warn: 0, fail: 0 };
  for (const c of result.checks) counts[c.severity] += 1;
  const worst = result.envelope.axes.worst;
  const tiles: [string, string, string][] = [
    ['Travel X × Y', `${fixed(result.travel.xMm, 0)} × ${fixed(result.travel.yMm, 0)}`, 'mm'],
    ['Steps per mm (per motor)', fixed(result.drive.stepsPerMm, 3), 'microsteps per mm of belt'],
    ['Worst acceleration at rest', fixed(worst.accelMaxMPerS2, 1), `m/s² at ${fixed(worst.directionDeg, 0)}°`],
    [
      'Lowest resonance',
      fixed(result.stiffness.min.frequencyHz, 1),
      `Hz at X ${fixed(result.stiffness.min.xMm, 0)}, Y ${fixed(result.stiffness.min.yMm, 0)} mm`,
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

function checkValue(v: number | null): string {
  if (v === null) return '—';
  const s = sig(v, 4);
  return s.includes('.') ? s.replace(/0+$/, '').replace(/\.$/, '') : s;
}

/** Every check with its severity as a shape and a word (never colour alone). */
export function checksTable(result: DesignResult): Content[] {
  const order = { fail: 0, warn: 1, ok: 2 } as const;
  const sorted = [...result.checks].sort((a, b) => order[a.severity] - order[b.severity]);
  const rows = sorted.map((c) => [
    {
      columns: [
        { svg: severityIcon(c.severity, 9), width: 9 },
        { text: SEVERITY_WORD[c.severity], bold: true, fontSize: 7, margin: [4, 0.5, 0, 0] },
      ],
    },
    c.subject ? { stack: [safe(c.message), safe(c.subject, { fontSize: 6, color: COLOR.muted })] } : safe(c.message),
    numCell(checkValue(c.value)),
    numCell(checkValue(c.limit)),
    c.unit ? safe(c.unit) : { text: '—', color: COLOR.muted },
  ]);
  return [
    heading('1', 'Checks'),
    table([62, '*', 44, 44, 34], [th('Result'), th('Check'), th('Value', 'right'), th('Limit', 'right'), th('Unit')], rows),
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

/** The design inputs in the Design desk's four groups, with units. */
export function inputsSection(data: SheetData): Content[] {
  const d = data.design;
  const r = data.result;
  const [nameA, nameB] = motorNames(r);
  const inertia = (v: number | null): [string, string] => (v === null ? ['estimated', ''] : [sig(v * 1e7, 3), 'g·cm²']);
  const left: [string, Row[]][] = [
    [
      'Frame & travel',
      [
        ['Frame outside, X × Y', `${fixed(d.frame.outerXMm, 0)} × ${fixed(d.frame.outerYMm, 0)}`, 'mm'],
        ['Frame profile', fixed(d.frame.extrusionMm, 0), 'mm'],
        ['Carriage footprint, X × Y', `${fixed(d.frame.carriageXMm, 0)} × ${fixed(d.frame.carriageYMm, 0)}`, 'mm'],
        ['Gantry beam depth', fixed(d.frame.gantryYMm, 0), 'mm'],
        ['Clearance at each end stop', fixed(d.frame.clearanceMm, 1), 'mm'],
        ...(d.wantedTravel
          ? [['Wanted travel, X × Y', `${fixed(d.wantedTravel.xMm, 0)} × ${fixed(d.wantedTravel.yMm, 0)}`, 'mm'] as Row]
          : []),
        ['Usable travel, X × Y (result)', `${fixed(r.travel.xMm, 1)} × ${fixed(r.travel.yMm, 1)}`, 'mm'],
      ],
    ],
    [
      'Belts & pulleys',
      [
        ['Belt pitch', fixed(d.belt.pitchMm, 2), 'mm'],
        ['Belt width', fixed(d.belt.widthMm, 1), 'mm'],
        ['Belt mass per metre', sig(d.belt.linearMassKgPerM, 3), 'kg/m'],
        ['Belt axial stiffness EA', grouped(d.belt.axialStiffnessN), 'N'],
        ['Allowable tension (cords)', fixed(d.belt.allowableTensionN, 0), 'N'],
        [
          'Allowable load per tooth',
          d.belt.toothAllowableN === null ? 'typical value' : fixed(d.belt.toothAllowableN, 1),
          d.belt.toothAllowableN === null ? '' : 'N',
        ],
        ['Minimum pulley teeth (profile)', fixed(d.belt.minPulleyTeeth, 0), 'teeth'],
        ['Drive pulley', fixed(d.pulley.driveTeeth, 0), 'teeth'],
        ['Drive pulley inertia', ...inertia(d.pulley.driveInertiaKgM2)],
        ['Idlers', fixed(d.pulley.idlerTeeth, 0), 'teeth'],
        ['Idler inertia', ...inertia(d.pulley.idlerInertiaKgM2)],
        ['Pretension of each span', fixed(d.pretensionN, 1), 'N'],
      ],
    ],
  ];
  const curve = d.motor.torqueCurve && d.motor.torqueCurve.length > 0;
  const right: [string, Row[]][] = [
    [
      'Motors & drivers',
      [
        ['Step angle', fixed(d.motor.stepAngleDeg, 2), '°'],
        ['Holding torque', fixed(d.motor.holdingTorqueNm, 3), 'N·m'],
        ['Rated phase current', fixed(d.motor.ratedCurrentA, 2), 'A'],
        ['Phase resistance', fixed(d.motor.phaseResistanceOhm, 2), 'ohm'],
        ['Phase inductance', fixed(d.motor.phaseInductanceMh, 2), 'mH'],
        ['Rotor inertia', sig(d.motor.rotorInertiaKgM2 * 1e7, 3), 'g·cm²'],
        ['Motor mass', fixed(d.motor.massKg, 3), 'kg'],
        ['Torque–speed data', curve ? `table, ${d.motor.torqueCurve?.length} points` : 'motor model', ''],
        [
          'Shaft speed limit',
          d.motor.maxSpeedRevPerS === null ? 'none' : fixed(d.motor.maxSpeedRevPerS, 1),
          d.motor.maxSpeedRevPerS === null ? '' : 'rev/s',
        ],
        ...(d.mechanism === 'cartesian' ? [['Motors on Y', fixed(d.yMotors, 0), ''] as Row] : []),
        [`Direction of ${nameA}`, signWord(d.motorDirection.a), ''],
        [`Direction of ${nameB}`, signWord(d.motorDirection.b), ''],
        ['Driver microsteps', fixed(d.driver.microsteps, 0), 'per step'],
        ['Driver supply', fixed(d.driver.supplyV, 1), 'V'],
        ['Driver phase current (RMS)', fixed(d.driver.currentRmsA, 2), 'A'],
        ['Torque margin (share used)', fixed(d.torqueMargin * 100, 0), '%'],
      ],
    ],
    [
      'Moving masses',
      [
        ['Carriage', fixed(d.masses.carriageKg, 3), 'kg'],
        ['Tool', fixed(d.masses.toolKg, 3), 'kg'],
        ['Gantry', fixed(d.masses.gantryKg, 3), 'kg'],
        ['Moving mass in X / Y (result)', `${fixed(r.mass.xKg, 3)} / ${fixed(r.mass.yKg, 3)}`, 'kg'],
        ['Rotor + pulley as belt mass', fixed(r.mass.reflectedPerMotorKg, 3), 'kg'],
        ['Friction X / Y', `${fixed(d.frictionN.x, 1)} / ${fixed(d.frictionN.y, 1)}`, 'N'],
        ...(d.mechanism === 'hbot'
          ? [
              [
                'Guide yaw moment rating',
                d.guide.yawMomentRatingNm === null ? 'typical value' : fixed(d.guide.yawMomentRatingNm, 1),
                d.guide.yawMomentRatingNm === null ? '' : 'N·m',
              ] as Row,
            ]
          : []),
        ['Cruise speed', fixed(d.cruiseSpeedMmPerS, 0), 'mm/s'],
        [
          'Planned acceleration',
          d.plannedAccelMmPerS2 === null ? 'worst limit' : fixed(d.plannedAccelMmPerS2 / 1000, 2),
          d.plannedAccelMmPerS2 === null ? '' : 'm/s²',
        ],
        ['Tool mount lets go at', d.toolMount ? fixed(d.toolMount.holdN, 1) : 'none fitted', d.toolMount ? 'N' : ''],
        ['Ringing tolerance', fixed(d.ringingToleranceMm, 3), 'mm'],
      ],
    ],
  ];
  return [block(heading('2', 'Inputs'), { columns: [inputTable(left), inputTable(right)], columnGap: 14 })];
}

/** Drive numbers per motor and the sign convention. Plain numbers only. */
export function driveSection(data: SheetData): Content[] {
  const { drive } = data.result;
  const [nameA, nameB] = motorNames(data.result);
  const both = (value: string): Content[] => [numCell(value), numCell(value)];
  const unit = (u: string): ContentObject => ({ text: u, color: COLOR.muted });
  const rows: Content[][] = [
    ['Full steps per revolution', ...both(fixed(drive.fullStepsPerRev, 0)), unit('steps/rev')],
    ['Microsteps per full step', ...both(fixed(drive.microsteps, 0)), unit('')],
    ['Drive pulley pitch diameter', ...both(fixed(drive.pitchDiameterMm, 3)), unit('mm')],
    ['Belt travel per revolution', ...both(fixed(drive.travelPerRevMm, 3)), unit('mm/rev')],
    [
      { text: 'Steps per mm of belt', bold: true },
      numCell(fixed(drive.stepsPerMm, 3), true),
      numCell(fixed(drive.stepsPerMm, 3), true),
      unit('microsteps/mm'),
    ],
    ['Full-step length (belt)', ...both(fixed(drive.fullStepMm, 4)), unit('mm')],
    ['Microstep length (belt)', ...both(fixed(drive.microstepBeltMm, 5)), unit('mm')],
  ];
  const micro = drive.microstep;
  const old = legacyMicrostep(data.result);
  const carriage: Content[][] = micro
    ? [
        [
          'One motor steps once, the other holds',
          numCell(`${fixed(micro.oneMotorMm, 5)} toward ${fixed(micro.oneMotorDirectionDeg, 0)}°`),
          unit('mm'),
        ],
        [{ text: 'Smallest pure X or pure Y move', bold: true }, numCell(fixed(micro.axisMm, 5), true), unit('mm')],
        ['Smallest pure 45° diagonal move', numCell(fixed(micro.diagonalMm, 5)), unit('mm')],
      ]
    : old
      ? [
          [`Along X (engine ${data.result.engineVersion})`, numCell(fixed(old.x, 5)), unit('mm')],
          [`Along Y (engine ${data.result.engineVersion})`, numCell(fixed(old.y, 5)), unit('mm')],
          [`Along the diagonal (engine ${data.result.engineVersion})`, numCell(fixed(old.diagonal, 5)), unit('mm')],
        ]
      : [];
  const shaft =
    data.design.mechanism === 'cartesian' && data.design.yMotors === 1
      ? ' One Y motor turns both Y belts through a cross shaft, taken as rigid: its inertia and twist are neglected and both belts share the pull equally.'
      : '';
  return [
    block(
      heading('3', 'Drive numbers'),
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
  const rows: Content[][] = [
    ['Carriage +1 mm along +X', numCell(signed(k[0][0])), numCell(signed(k[1][0]))],
    ['Carriage +1 mm along +Y', numCell(signed(k[0][1])), numCell(signed(k[1][1]))],
  ];
  return [
    { text: 'Motor sign convention', style: 'h2', margin: [0, 10, 0, 3] },
    {
      columns: [
        { width: 250, ...table(['*', 58, 58], [th('Belt travel at each motor [mm]'), th(nameA, 'right'), th(nameB, 'right')], rows) },
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

/** Belt loops to cut, and per span the pretension and target pluck frequency at the parking position. */
export function beltsSection(data: SheetData): Content[] {
  const r = data.result;
  const loops = r.belts.map((b) => {
    const old = legacyBelt(b);
    return [
      safe(b.label, { bold: true }),
      numCell(fixed(b.cutLengthMm, 0), true),
      numCell(fixed(b.loopTeeth, 0), true),
      numCell(fixed(b.loopLengthMm, 1)),
      numCell(`${fixed(b.teethInMesh, 1)} (${fixed(b.driveWrapDeg, 0)}°)`),
      numCell(fixed(b.peakPullN, 1)),
      numCell(
        old
          ? `${fixed(old.tightSideN, 1)} / ${fixed(old.allowableTensionN, 0)}`
          : `${fixed(b.tension.worstTightN, 1)} / ${fixed(b.tension.tensileAllowableN, 0)}`,
      ),
      numCell(fixed(old ? old.slackSideN : b.tension.worstSlackN, 1), !old && b.tension.worstSlackN <= 0),
      numCell(
        old
          ? '—'
          : `${fixed(b.tension.toothLoadN, 2)} / ${fixed(b.tension.toothAllowableN, 1)}${b.tension.toothAllowableIsTypical ? '*' : ''}`,
      ),
    ];
  });
  const where = (p: { xMm: number; yMm: number; directionDeg: number }) =>
    `X ${fixed(p.xMm, 0)}, Y ${fixed(p.yMm, 0)} mm, moving toward ${fixed(p.directionDeg, 0)}°`;
  const worstRows = r.belts
    .filter((b) => !legacyBelt(b))
    .map((b) => [
      safe(b.label, { bold: true }),
      numCell(fixed(b.tension.worstTightN, 1)),
      { text: where(b.tension.worstTightAt) },
      numCell(fixed(b.tension.worstSlackN, 1), b.tension.worstSlackN <= 0),
      { text: where(b.tension.worstSlackAt) },
    ]);
  const typicalTooth = r.belts.some((b) => !legacyBelt(b) && b.tension.toothAllowableIsTypical);
  const isLegacy = r.belts.some((b) => legacyBelt(b));
  const spans = r.belts.flatMap((b) =>
    b.spans.map((s) => [
      safe(b.label),
      safe(s.label),
      numCell(fixed(s.lengthMm, 1)),
      { text: s.fixedLength ? 'no' : 'yes', alignment: 'center' },
      numCell(fixed(data.design.pretensionN, 1)),
      numCell(fixed(s.targetFrequencyHz, 1), true),
    ]),
  );
  const park = r.parking;
  const centre = Math.abs(park.xMm - r.travel.xMm / 2) < 0.05 && Math.abs(park.yMm - r.travel.yMm / 2) < 0.05;
  const parking =
    `Park the carriage at X ${fixed(park.xMm, 1)} mm, Y ${fixed(park.yMm, 1)} mm from the travel origin` +
    `${centre ? ' (the centre of travel)' : ''} with the motors unpowered, then pluck each span at its middle.`;
  return [
    block(
      heading('4', 'Belts'),
      { text: 'Loops to cut', style: 'h2', margin: [0, 0, 0, 3] },
      table(
        [52, 44, 34, '*', 54, 40, 62, 40, 56],
        [
          th('Belt'),
          th('Cut length [mm]', 'right'),
          th('Teeth', 'right'),
          th('Pitch-line loop [mm]', 'right'),
          th('Teeth in mesh (wrap)', 'right'),
          th('Peak pull [N]', 'right'),
          th(isLegacy ? 'Tight side / allowed [N]' : 'Worst tight / allowed [N]', 'right'),
          th(isLegacy ? 'Slack side [N]' : 'Worst slack [N]', 'right'),
          th('Tooth load / allowed [N]', 'right'),
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
              [th('Belt'), th('Tight [N]', 'right'), th('Where'), th('Slack [N]', 'right'), th('Where')],
              worstRows,
            ),
          ]
        : []),
    ),
    {
      stack: [
        { text: 'Span tension targets', style: 'h2', headlineLevel: 2 },
        { text: parking, bold: true, fontSize: 7.5, margin: [0, 0, 0, 4] },
      ],
    },
    table(
      [60, '*', 52, 52, 54, 64],
      [
        th('Belt'),
        th('Span'),
        th('Free length [mm]', 'right'),
        th('Moves with carriage', 'center'),
        th('Pretension [N]', 'right'),
        th('Target pluck [Hz]', 'right'),
      ],
      spans,
    ),
    {
      text:
        `Pluck frequency of a span f = (1 / 2L) · sqrt(T / m), with m = ${sig(data.design.belt.linearMassKgPerM, 3)} kg/m for this belt. ` +
        'Spans that do not move with the carriage can be checked at any position. Record measured frequencies against this sheet in the app; ' +
        'it reports the tension and flags a mismatch between belts.',
      style: 'note',
      margin: [0, 3, 0, 0],
    },
  ];
}

/** Acceleration and speed limits along X, Y, the diagonal and the worst direction. */
export function limitsSection(data: SheetData): Content[] {
  const env = data.result.envelope;
  const limiting = (deg: number): string => {
    const i = env.directionsDeg.findIndex((d) => Math.abs(d - deg) < 0.5);
    return limitingName(data.result, i >= 0 ? env.limitingMotor[i] : undefined);
  };
  const rows = (['x', 'y', 'diagonal', 'worst'] as const).map((key) => {
    const ax = env.axes[key];
    const name = { x: 'Along X', y: 'Along Y', diagonal: 'Along the diagonal', worst: 'Worst direction' }[key];
    return [
      { text: name, bold: key === 'worst' },
      numCell(fixed(ax.directionDeg, 0)),
      numCell(fixed(ax.accelMaxMPerS2, 2), key === 'worst'),
      numCell(fixed(ax.accelAtCruiseMPerS2, 2), key === 'worst'),
      numCell(fixed(ax.speedMaxMPerS * 1000, 0), key === 'worst'),
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
          th('Accel. at rest [m/s²]', 'right'),
          th(`Accel. at ${fixed(data.design.cruiseSpeedMmPerS, 0)} mm/s [m/s²]`, 'right'),
          th('Max speed [mm/s]', 'right'),
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

/** Lowest resonance and where, ringing at the weakest point, and gantry racking. */
export function stiffnessSection(data: SheetData): Content[] {
  const r = data.result;
  const s = r.stiffness;
  const tol = s.toleranceMm;
  const keys = data.design.plannedAccelMmPerS2 !== null ? (['x', 'y', 'worst', 'planned'] as const) : (['x', 'y', 'worst'] as const);
  const ringRows = keys.map((key) => {
    const f = s.ringing[key];
    const name = { x: 'Limit along X', y: 'Limit along Y', worst: 'Limit, worst direction', planned: 'Planned acceleration' }[key];
    return [
      name,
      numCell(fixed(f.accelMPerS2, 2)),
      numCell(fixed(f.amplitudeMm, 4), f.amplitudeMm > tol),
      numCell(fixed(f.accelForToleranceMPerS2, 2)),
    ];
  });
  const rk = r.racking;
  const rating =
    typeof rk.yawMomentRatingNm === 'number'
      ? ` The guides are rated for ${fixed(rk.yawMomentRatingNm, 1)} N·m about the vertical axis${rk.yawMomentRatingIsTypical ? ' (typical value for two small profile-rail carriages; use the guide maker’s rating)' : ''}.`
      : '';
  const racking =
    rk.momentPerNewtonM === 0
      ? r.mechanism === 'cartesian'
        ? 'The X belt is closed on the gantry, so its pull puts no moment on the gantry.'
        : 'Not computed for crossed belts: they would cancel the moment only if each belt shared its pull equally between its arms; with unequal arms a position-dependent moment remains, which this engine does not report yet.'
      : `The gantry feels ${sig(rk.momentPerNewtonM, 3)} N·m per newton of X belt pull (belt turns ${fixed(rk.turnSpacingMm, 0)} mm apart). ` +
        `At the peak X pull of ${fixed(rk.peakForceXN, 1)} N that is ${fixed(rk.peakMomentNm, 2)} N·m, taken by the Y guides as ` +
        `${fixed(rk.guideReactionN, 1)} N over their ${fixed(rk.guideSpanMm, 0)} mm span.${rating}`;
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
              { text: `at X ${fixed(s.min.xMm, 1)} mm, Y ${fixed(s.min.yMm, 1)} mm`, fontSize: 7.5 },
              { text: 'the weakest point of the travel (marked on the stiffness map)', style: 'note', margin: [0, 2, 0, 0] },
            ],
          },
          {
            width: '*',
            stack: [
              { text: `Ringing at the weakest point (tolerance ${fixed(tol, 3)} mm)`, style: 'h2', margin: [0, 0, 0, 3] },
              table(
                ['*', 62, 66, 112],
                [
                  th('Acceleration'),
                  th('Accel. [m/s²]', 'right'),
                  th('Overshoot [mm]', 'right'),
                  th('Accel. for tolerance [m/s²]', 'right'),
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

/** The parts list for ordering. */
export function partsSection(result: DesignResult): Content[] {
  const rows = result.partsList.map((p) => [safe(p.item, { bold: true }), numCell(fixed(p.quantity, 0)), safe(p.spec)]);
  return [heading('8', 'Parts list'), table([150, 30, '*'], [th('Item'), th('Qty', 'right'), th('Specification')], rows)];
}
