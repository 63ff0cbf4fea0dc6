import { formatSignificant, makeCheck, qty, severityOf } from './checkText';
import type { BeltReport, Check, RingingFigure } from './types';

// What each check compares and why its limits are where they are: docs/models/checks.md.

/** Highest share of available torque common practice lets a stepper design use (50–70 % of pull-out). */
export const TORQUE_MARGIN_LIMIT = 0.7;
/** Teeth in mesh for full belt capacity (belt makers' common practice). */
export const MIN_TEETH_IN_MESH = 6;
/** Below this many teeth in mesh the belt keeps under 40 % of its capacity: treated as a failure (our judgement). */
export const FAIL_TEETH_IN_MESH = 3;
/** Share of an allowable above which a belt or guide load is flagged before it fails (our judgement). */
export const LOAD_WARN_SHARE = 0.8;
/** Slack side below this share of the pretension: the belt may jump teeth under peak pull (our judgement). */
export const RATCHET_WARN_SHARE = 0.25;
/** Planned acceleration or cruise speed within this share of the worst direction's limit warns (our judgement). */
export const PLAN_WARN_SHARE = 0.9;
/** Ringing beyond this many tolerances is a failure rather than a warning (our judgement). */
export const RINGING_FAIL_FACTOR = 5;
/**
 * A detachable tool mount should hold its working load m_tool·a_max with this margin, to ride out jerk and
 * vibration the rigid-body figure leaves out (our judgement).
 */
export const TOOL_HOLD_MARGIN = 1.5;
/**
 * A mount holding more than this many times its working load barely lets go in a crash, which defeats the
 * point of a break-away mount (our judgement).
 */
export const TOOL_RELEASE_FACTOR = 5;
/** Travel below this share of the outer frame size is flagged as a poorly used frame (our judgement). */
export const TRAVEL_SHARE_WARN = 0.5;

/**
 * Teeth-in-mesh derating of belt capacity: full capacity from 6 teeth, 20 % less for each tooth missing.
 * @param teethInMesh - teeth in mesh on the small pulley (fractional; whole teeth count)
 * @returns capacity factor 0 … 1 [-]
 * @see belt manufacturers' engineering literature, "for each tooth less than 6, you lose 20 % of the rated load" (common practice)
 */
export function teethInMeshFactor(teethInMesh: number): number {
  const whole = Math.floor(teethInMesh + 1e-9);
  return Math.max(0, Math.min(1, 1 - 0.2 * (MIN_TEETH_IN_MESH - whole)));
}

/** What the checks look at (SI unless the name says otherwise). */
export interface CheckInput {
  torqueMargin: number;
  currentRmsA: number;
  ratedCurrentA: number;
  belts: BeltReport[];
  pretensionN: number;
  driveTeeth: number;
  idlerTeeth: number;
  minPulleyTeeth: number;
  ringingPlanned: RingingFigure;
  ringingToleranceMm: number;
  /** Planned acceleration if the designer set one [m/s²]. */
  plannedAccelMPerS2: number | null;
  /** What the stage can hold in its worst direction up to cruise speed, and that direction [m/s², °]. */
  worstAccelMPerS2: number;
  worstAccelDirectionDeg: number;
  cruiseSpeedMPerS: number;
  /** Top speed in the worst direction, and that direction [m/s, °]. */
  worstSpeedMPerS: number;
  worstSpeedDirectionDeg: number;
  travel: { xMm: number; yMm: number };
  outer: { xMm: number; yMm: number };
  wantedTravel: { xMm: number; yMm: number } | null;
  toolKg: number;
  toolHoldN: number | null;
  /** Acceleration the tool sees: the planned one, else the best the motors give anywhere [m/s²]. */
  toolAccelMPerS2: number;
  /** H loop only: peak racking moment and the guides' rating [N·m] (null when the mechanism has no racking). */
  racking: { momentNm: number; ratingNm: number; ratingIsTypical: boolean } | null;
}

/** "belt A" → "Belt A": a label as the subject of a sentence. */
const cap = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);

function motorChecks(c: CheckInput): Check[] {
  const over = c.torqueMargin > TORQUE_MARGIN_LIMIT;
  const above = c.currentRmsA > c.ratedCurrentA;
  return [
    makeCheck({
      id: 'torque-margin',
      severity: severityOf(false, over),
      value: c.torqueMargin,
      limit: TORQUE_MARGIN_LIMIT,
      kind: 'ratio',
      parts: over
        ? [
            'Torque margin ',
            qty(c.torqueMargin, 'ratio'),
            ' is above ',
            qty(TORQUE_MARGIN_LIMIT, 'ratio'),
            ': a stepper run that close to its pull-out torque risks lost steps (common practice: 50–70 %).',
          ]
        : ['Torque margin ', qty(c.torqueMargin, 'ratio'), ' is within common practice (50–70 % of the pull-out torque).'],
    }),
    makeCheck({
      id: 'driver-current',
      severity: severityOf(false, above),
      value: c.currentRmsA,
      limit: c.ratedCurrentA,
      kind: 'currentA',
      parts: above
        ? [
            'Driver current (RMS) ',
            qty(c.currentRmsA, 'currentA'),
            ' is above the Rated current ',
            qty(c.ratedCurrentA, 'currentA'),
            ': the extra current buys no torque (the results use the rated current) and overheats the motor.',
          ]
        : ['Driver current (RMS) ', qty(c.currentRmsA, 'currentA'), ' is within the Rated current ', qty(c.ratedCurrentA, 'currentA'), '.'],
    }),
  ];
}

function pulleyCheck(c: CheckInput): Check {
  const minTeeth = Math.min(c.driveTeeth, c.idlerTeeth);
  const small = minTeeth < c.minPulleyTeeth;
  return makeCheck({
    id: 'pulley-min-teeth',
    severity: severityOf(small, false),
    value: minTeeth,
    limit: c.minPulleyTeeth,
    kind: 'count',
    unit: 'teeth',
    parts: small
      ? [
          'A ',
          qty(minTeeth, 'count'),
          '-tooth pulley is smaller than the Smallest pulley for this belt, ',
          qty(c.minPulleyTeeth, 'count'),
          ' teeth.',
        ]
      : [
          'The smallest pulley has ',
          qty(minTeeth, 'count'),
          ' teeth, at least the Smallest pulley for this belt (',
          qty(c.minPulleyTeeth, 'count'),
          ').',
        ],
  });
}

function beltChecks(c: CheckInput, b: BeltReport): Check[] {
  const subject = cap(b.label);
  const t = b.tension;
  const whole = Math.floor(b.teethInMesh + 1e-9);
  const where = (p: { xMm: number; yMm: number; directionDeg: number }) => [
    ' at X ',
    qty(p.xMm, 'lengthMm'),
    ', Y ',
    qty(p.yMm, 'lengthMm'),
    ', moving toward ',
    qty(p.directionDeg, 'angleDeg'),
  ];
  const tightOver = t.worstTightN > t.tensileAllowableN;
  const slackGone = t.worstSlackN <= 0;
  const ratchet = t.worstSlackN < RATCHET_WARN_SHARE * t.pretensionN;
  const toothOver = t.toothLoadN > t.toothAllowableN || t.countedTeeth <= 0;
  const typical = t.toothAllowableIsTypical ? ' (typical value; enter the belt maker’s figure)' : '';
  return [
    makeCheck({
      id: 'teeth-in-mesh',
      subject,
      severity: severityOf(whole < FAIL_TEETH_IN_MESH, whole < MIN_TEETH_IN_MESH),
      value: whole,
      limit: MIN_TEETH_IN_MESH,
      kind: 'count',
      unit: 'teeth',
      parts:
        whole < MIN_TEETH_IN_MESH
          ? [
              `${subject}: `,
              qty(whole, 'count'),
              ' teeth in mesh on the drive pulley (',
              qty(b.driveWrapDeg, 'angleDeg'),
              ' wrap); below 6 each missing tooth costs 20 % of the tooth capacity (common practice).',
            ]
          : [`${subject}: `, qty(whole, 'count'), ' teeth in mesh on the drive pulley, at least 6 (common practice).'],
    }),
    makeCheck({
      id: 'belt-tensile',
      subject,
      severity: severityOf(tightOver, t.worstTightN > LOAD_WARN_SHARE * t.tensileAllowableN),
      value: t.worstTightN,
      limit: t.tensileAllowableN,
      kind: 'forceN',
      parts: [
        `${subject}: the tight side reaches `,
        qty(t.worstTightN, 'forceN'),
        ...where(t.worstTightAt),
        tightOver ? ', above the Allowable tension ' : ', against an Allowable tension of ',
        qty(t.tensileAllowableN, 'forceN'),
        '.',
      ],
    }),
    makeCheck({
      id: 'belt-slack',
      subject,
      severity: severityOf(slackGone, false),
      value: t.worstSlackN,
      limit: 0,
      kind: 'forceN',
      parts: slackGone
        ? [
            `${subject}: the slack side goes slack (`,
            qty(t.worstSlackN, 'forceN'),
            ')',
            ...where(t.worstSlackAt),
            '; raise the Belt pretension above ',
            qty(t.pretensionN - t.worstSlackN, 'forceN'),
            ' or lower the pull.',
          ]
        : [
            `${subject}: the slack side keeps at least `,
            qty(t.worstSlackN, 'forceN'),
            ' everywhere on the travel (lowest',
            ...where(t.worstSlackAt),
            ').',
          ],
    }),
    makeCheck({
      id: 'belt-ratcheting',
      subject,
      severity: severityOf(false, ratchet),
      value: t.worstSlackN,
      limit: RATCHET_WARN_SHARE * t.pretensionN,
      kind: 'forceN',
      parts: ratchet
        ? [
            `${subject}: the slack side falls to `,
            qty(t.worstSlackN, 'forceN'),
            ', below ',
            qty(RATCHET_WARN_SHARE, 'ratio'),
            ' of the Belt pretension: under peak pull the belt may jump teeth on the drive pulley.',
          ]
        : [
            `${subject}: the slack side keeps more than `,
            qty(RATCHET_WARN_SHARE, 'ratio'),
            ' of the Belt pretension, so the teeth stay seated.',
          ],
    }),
    makeCheck({
      id: 'belt-tooth-load',
      subject,
      severity: severityOf(toothOver, t.toothLoadN > LOAD_WARN_SHARE * t.toothAllowableN),
      value: t.toothLoadN,
      limit: t.toothAllowableN,
      kind: 'forceN',
      parts: [
        `${subject}: the peak pull `,
        qty(t.peakPullN, 'forceN'),
        ` over ${formatSignificant(t.countedTeeth)} counted teeth loads each tooth with `,
        qty(t.toothLoadN, 'forceN'),
        toothOver ? ', above the Allowable load per tooth ' : ', against an Allowable load per tooth of ',
        qty(t.toothAllowableN, 'forceN'),
        `${typical}.`,
      ],
    }),
  ];
}

function ringingCheck(c: CheckInput): Check {
  const amp = c.ringingPlanned.amplitudeMm;
  const over = amp > c.ringingToleranceMm;
  return makeCheck({
    id: 'resonance',
    severity: severityOf(amp > RINGING_FAIL_FACTOR * c.ringingToleranceMm, over),
    value: amp,
    limit: c.ringingToleranceMm,
    kind: 'lengthMm',
    parts: over
      ? [
          'At ',
          qty(c.ringingPlanned.accelMPerS2, 'accelMPerS2'),
          ' the carriage rings by about ',
          qty(amp, 'lengthMm'),
          ' at the weakest point, more than the Ringing tolerance ',
          qty(c.ringingToleranceMm, 'lengthMm'),
          '; keep the acceleration under ',
          qty(c.ringingPlanned.accelForToleranceMPerS2, 'accelMPerS2'),
          ' or stiffen the belts.',
        ]
      : [
          'At ',
          qty(c.ringingPlanned.accelMPerS2, 'accelMPerS2'),
          ' the carriage rings by about ',
          qty(amp, 'lengthMm'),
          ' at the weakest point, within the Ringing tolerance ',
          qty(c.ringingToleranceMm, 'lengthMm'),
          '.',
        ],
  });
}

function planChecks(c: CheckInput): Check[] {
  const out: Check[] = [];
  if (c.plannedAccelMPerS2 !== null) {
    const a = c.plannedAccelMPerS2;
    const lim = c.worstAccelMPerS2;
    out.push(
      makeCheck({
        id: 'planned-acceleration',
        severity: severityOf(a > lim, a > PLAN_WARN_SHARE * lim),
        value: a,
        limit: lim,
        kind: 'accelMPerS2',
        parts:
          a > lim
            ? [
                'The Planned acceleration ',
                qty(a, 'accelMPerS2'),
                ' is more than the stage can hold moving at ',
                qty(c.worstAccelDirectionDeg, 'angleDeg'),
                ' (',
                qty(lim, 'accelMPerS2'),
                ', its worst direction up to the Cruise speed).',
              ]
            : a > PLAN_WARN_SHARE * lim
              ? [
                  'The Planned acceleration ',
                  qty(a, 'accelMPerS2'),
                  ' is within 10 % of what the stage can hold moving at ',
                  qty(c.worstAccelDirectionDeg, 'angleDeg'),
                  ' (',
                  qty(lim, 'accelMPerS2'),
                  ').',
                ]
              : [
                  'The Planned acceleration ',
                  qty(a, 'accelMPerS2'),
                  ' is within what the stage can hold in every direction (worst ',
                  qty(lim, 'accelMPerS2'),
                  ' at ',
                  qty(c.worstAccelDirectionDeg, 'angleDeg'),
                  ').',
                ],
      }),
    );
  }
  const v = c.cruiseSpeedMPerS;
  const vl = c.worstSpeedMPerS;
  out.push(
    makeCheck({
      id: 'cruise-speed',
      severity: severityOf(v > vl, v > PLAN_WARN_SHARE * vl),
      value: v,
      limit: vl,
      kind: 'speedMPerS',
      parts:
        v > vl
          ? [
              'The Cruise speed ',
              qty(v, 'speedMPerS'),
              ' is above the top speed moving at ',
              qty(c.worstSpeedDirectionDeg, 'angleDeg'),
              ' (',
              qty(vl, 'speedMPerS'),
              ', the worst direction).',
            ]
          : v > PLAN_WARN_SHARE * vl
            ? [
                'The Cruise speed ',
                qty(v, 'speedMPerS'),
                ' is within 10 % of the top speed moving at ',
                qty(c.worstSpeedDirectionDeg, 'angleDeg'),
                ' (',
                qty(vl, 'speedMPerS'),
                ').',
              ]
            : [
                'The Cruise speed ',
                qty(v, 'speedMPerS'),
                ' is reachable in every direction (worst ',
                qty(vl, 'speedMPerS'),
                ' at ',
                qty(c.worstSpeedDirectionDeg, 'angleDeg'),
                ').',
              ],
    }),
  );
  return out;
}

function travelChecks(c: CheckInput): Check[] {
  const out: Check[] = [];
  if (c.wantedTravel) {
    for (const axis of ['x', 'y'] as const) {
      const have = axis === 'x' ? c.travel.xMm : c.travel.yMm;
      const want = axis === 'x' ? c.wantedTravel.xMm : c.wantedTravel.yMm;
      const name = axis === 'x' ? 'X' : 'Y';
      out.push(
        makeCheck({
          id: 'travel-wanted',
          subject: `${name} travel`,
          severity: severityOf(have < want, false),
          value: have,
          limit: want,
          kind: 'lengthMm',
          parts:
            have < want
              ? [`${name} travel `, qty(have, 'lengthMm'), ` is short of the Wanted travel ${name} `, qty(want, 'lengthMm'), '.']
              : [`${name} travel `, qty(have, 'lengthMm'), ` covers the Wanted travel ${name} `, qty(want, 'lengthMm'), '.'],
        }),
      );
    }
  }
  const share = Math.min(c.travel.xMm / c.outer.xMm, c.travel.yMm / c.outer.yMm);
  out.push(
    makeCheck({
      id: 'travel-vs-frame',
      severity: severityOf(false, share < TRAVEL_SHARE_WARN),
      value: share,
      limit: TRAVEL_SHARE_WARN,
      kind: 'ratio',
      parts:
        share < TRAVEL_SHARE_WARN
          ? [
              'Only ',
              qty(share, 'ratio'),
              ' of the frame size is usable travel along one axis; carriage, clearances or pulleys take most of it.',
            ]
          : ['At least ', qty(share, 'ratio'), ' of the frame size is usable travel along each axis.'],
    }),
  );
  return out;
}

function toolChecks(c: CheckInput): Check[] {
  if (c.toolHoldN === null) return [];
  const need = c.toolKg * c.toolAccelMPerS2;
  const hold = c.toolHoldN;
  const out: Check[] = [
    makeCheck({
      id: 'tool-mount-hold',
      severity: severityOf(hold < need, hold < TOOL_HOLD_MARGIN * need),
      value: hold,
      limit: TOOL_HOLD_MARGIN * need,
      kind: 'forceN',
      parts:
        hold < TOOL_HOLD_MARGIN * need
          ? [
              'The Tool mount hold force ',
              qty(hold, 'forceN'),
              ' is short of the ',
              qty(TOOL_HOLD_MARGIN * need, 'forceN'),
              ` the tool needs at `,
              qty(c.toolAccelMPerS2, 'accelMPerS2'),
              ` with a ${TOOL_HOLD_MARGIN}× margin.`,
            ]
          : [
              'The Tool mount hold force ',
              qty(hold, 'forceN'),
              ` is at least ${TOOL_HOLD_MARGIN}× the `,
              qty(need, 'forceN'),
              ' the tool needs at ',
              qty(c.toolAccelMPerS2, 'accelMPerS2'),
              '.',
            ],
    }),
  ];
  if (need > 0) {
    const tight = hold > TOOL_RELEASE_FACTOR * need;
    out.push(
      makeCheck({
        id: 'tool-mount-release',
        severity: severityOf(false, tight),
        value: hold,
        limit: TOOL_RELEASE_FACTOR * need,
        kind: 'forceN',
        parts: tight
          ? [
              'The Tool mount hold force ',
              qty(hold, 'forceN'),
              ` is more than ${TOOL_RELEASE_FACTOR}× the working load `,
              qty(need, 'forceN'),
              ': it will hardly let go in a crash.',
            ]
          : [
              'The Tool mount hold force is at most ',
              `${TOOL_RELEASE_FACTOR}× the working load `,
              qty(need, 'forceN'),
              ', so it can still let go in a crash.',
            ],
      }),
    );
  }
  return out;
}

function rackingCheck(c: CheckInput): Check[] {
  if (!c.racking) return [];
  const { momentNm, ratingNm, ratingIsTypical } = c.racking;
  const typical = ratingIsTypical ? ' (typical value for two small profile-rail carriages; enter your guides’ rating)' : '';
  return [
    makeCheck({
      id: 'racking',
      subject: 'Y guides',
      severity: severityOf(momentNm > ratingNm, momentNm > LOAD_WARN_SHARE * ratingNm),
      value: momentNm,
      limit: ratingNm,
      kind: 'momentNm',
      parts: [
        'The H-shaped belt twists the gantry with up to ',
        qty(momentNm, 'momentNm'),
        momentNm > ratingNm ? ', above the Guide yaw moment rating ' : ', against a Guide yaw moment rating of ',
        qty(ratingNm, 'momentNm'),
        `${typical}.`,
      ],
    }),
  ];
}

/**
 * The design checks, each {id, severity, message, value, limit, unit, kind, parts, subject}, in a stable order.
 * Messages use the labels the Design desk shows and metric units; `parts` carries the numbers for other units.
 * @param c - the numbers the checks compare
 * @returns checks
 * @see docs/models/checks.md
 */
export function designChecks(c: CheckInput): Check[] {
  return [
    ...motorChecks(c),
    pulleyCheck(c),
    ...c.belts.flatMap((b) => beltChecks(c, b)),
    ...rackingCheck(c),
    ringingCheck(c),
    ...planChecks(c),
    ...travelChecks(c),
    ...toolChecks(c),
  ];
}
