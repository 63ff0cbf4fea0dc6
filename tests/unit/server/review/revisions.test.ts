import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, parseDesign } from '@/engine';
import { diffInputs, diffKeyResults, flattenLeaves } from '../../../../server/services/revisionDiff';
import { freezeDesign } from '../../../../server/services/freezeRevision';
import { canonicalJson, revisionFingerprint } from '../../../../server/services/revisionFingerprint';
import { isOwnWork, mayComment, mayReadRevision } from '../../../../server/services/access';
import type { PublicUser } from '../../../../server/services/users.service';

const user = (id: number, roles: PublicUser['roles']): PublicUser => ({
  id,
  email: `u${id}@example.test`,
  name: `U${id}`,
  roles,
  disabled: false,
  isInvited: false,
  createdAt: '',
});

describe('canonicalJson', () => {
  it('when keys come in another order, then the text is the same', () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { y: 1, x: 2 }], c: 'é' } })).toBe(
      canonicalJson({ a: { c: 'é', d: [3, { x: 2, y: 1 }] }, b: 1 }),
    );
    expect(canonicalJson({ b: 1, a: 2 })).toBe('{"a":2,"b":1}');
  });

  it.each([
    [{ a: undefined, b: 1 }, '{"b":1}'],
    [[1, undefined, NaN, Infinity], '[1,null,null,null]'],
    [{ n: -0, e: 1e-7, big: 1e21 }, '{"big":1e+21,"e":1e-7,"n":0}'],
    ['line\n"quoted"', '"line\\n\\"quoted\\""'],
    [null, 'null'],
  ])('when given %j, then it writes %s (as JSON.stringify would for each value)', (value, expected) => {
    expect(canonicalJson(value)).toBe(expected);
  });

  it('when the value round-trips through JSON, then the text does not change', () => {
    const result = evaluateDesign(defaultDesign('hbot'));
    const once = canonicalJson(result);
    expect(canonicalJson(JSON.parse(JSON.stringify(result)))).toBe(once);
  });
});

describe('revisionFingerprint', () => {
  it('when computed, then it is the SHA-256 of the canonical {inputs, result}', () => {
    const inputs = { z: 1, a: 'x' };
    const result = { k: [1, 2] };
    const expected = createHash('sha256').update('{"inputs":{"a":"x","z":1},"result":{"k":[1,2]}}').digest('hex');
    expect(revisionFingerprint(inputs, result)).toBe(expected);
  });

  it('when one input changes, then the fingerprint changes', () => {
    const doc = defaultDesign('corexy');
    const other = { ...doc, pretensionN: doc.pretensionN + 1 };
    expect(revisionFingerprint(doc, {})).not.toBe(revisionFingerprint(other, {}));
  });
});

describe('freezeDesign', () => {
  it('when the stored inputs are valid, then it returns the normalised inputs, the full engine result and a matching fingerprint', () => {
    const doc = defaultDesign('cartesian');
    const frozen = freezeDesign(JSON.stringify(doc));
    expect(frozen.inputs).toEqual(parseDesign(doc));
    expect(frozen.result).toEqual(JSON.parse(JSON.stringify(evaluateDesign(doc))));
    expect(frozen.fingerprint).toBe(revisionFingerprint(frozen.inputs, frozen.result));
    expect(frozen.summary.stepsPerMm).toBe(frozen.result.drive.stepsPerMm);
    const counts = frozen.summary.checks;
    expect(counts.ok + counts.warn + counts.fail).toBe(frozen.result.checks.length);
  });

  it('when the stored inputs are invalid, then a 400 names the input under "inputs."', () => {
    const doc = { ...defaultDesign('corexy'), pulley: { ...defaultDesign('corexy').pulley, driveTeeth: -3 } };
    try {
      freezeDesign(doc);
      expect.unreachable('freezeDesign accepted a negative tooth count');
    } catch (err) {
      const e = err as { status: number; details: { path: string }[] };
      expect(e.status).toBe(400);
      expect(e.details.map((d) => d.path)).toContain('inputs.pulley.driveTeeth');
    }
  });
});

describe('flattenLeaves and diffInputs', () => {
  it('when flattened, then nested objects give dotted paths and lists stay whole', () => {
    expect([...flattenLeaves({ a: { b: 1, c: [1, 2] }, d: null })]).toEqual([
      ['a.b', 1],
      ['a.c', [1, 2]],
      ['d', null],
    ]);
  });

  it('when one value changes, one path appears and another disappears, then each is reported once with old and new', () => {
    const before = { frame: { outerXMm: 400, outerYMm: 300 }, wantedTravel: { xMm: 200 }, motor: { torqueCurve: [{ s: 1 }] } };
    const after = { frame: { outerXMm: 450, outerYMm: 300 }, toolMount: 'x', motor: { torqueCurve: [{ s: 1 }] } };
    expect(diffInputs(before, after)).toEqual([
      { path: 'frame.outerXMm', change: 'changed', old: 400, new: 450 },
      { path: 'toolMount', change: 'added', old: null, new: 'x' },
      { path: 'wantedTravel.xMm', change: 'removed', old: 200, new: null },
    ]);
  });

  it('when there is no previous document, then every leaf is added', () => {
    const changes = diffInputs(null, { a: 1, b: { c: 2 } });
    expect(changes).toEqual([
      { path: 'a', change: 'added', old: null, new: 1 },
      { path: 'b.c', change: 'added', old: null, new: 2 },
    ]);
  });

  it('when the job points change, then the diff shows their number instead of the whole list', () => {
    // Arrange
    const before = { job: { points: [{ xMm: 1, yMm: 1 }] } };
    const moved = { job: { points: [{ xMm: 2, yMm: 1 }] } };
    const grown = {
      job: {
        points: [
          { xMm: 1, yMm: 1 },
          { xMm: 5, yMm: 5 },
        ],
      },
    };
    // Act / Assert
    expect(diffInputs(before, moved)).toEqual([{ path: 'job.points', change: 'changed', old: '1 point', new: '1 point, moved' }]);
    expect(diffInputs(before, grown)).toEqual([{ path: 'job.points', change: 'changed', old: '1 point', new: '2 points' }]);
  });

  it('when nothing changed, then the diff is empty', () => {
    const doc = defaultDesign('corexy');
    expect(diffInputs(doc, JSON.parse(JSON.stringify(doc)))).toEqual([]);
  });
});

describe('diffKeyResults', () => {
  it('when microsteps double, then steps per mm doubles and is marked changed while travel is not', () => {
    const doc = defaultDesign('corexy');
    const before = evaluateDesign(doc);
    const after = evaluateDesign({ ...doc, driver: { ...doc.driver, microsteps: doc.driver.microsteps * 2 } });
    const rows = diffKeyResults(before, after);
    const steps = rows.find((r) => r.key === 'drive.stepsPerMm')!;
    const travel = rows.find((r) => r.key === 'travel.xMm')!;
    expect(steps.isChanged).toBe(true);
    expect(steps.new! / steps.old!).toBeCloseTo(2, 12);
    expect(travel).toMatchObject({ isChanged: false, old: before.travel.xMm, new: after.travel.xMm });
    for (const belt of after.belts)
      expect(rows.find((r) => r.key === `belts.${belt.id}.cutLengthMm`)).toMatchObject({ new: belt.cutLengthMm });
  });

  it('when there is no previous result, then every row is new with old null', () => {
    const withJob = {
      ...defaultDesign('hbot'),
      job: {
        points: [
          { xMm: 10, yMm: 10 },
          { xMm: 100, yMm: 50 },
        ],
      },
    };
    const rows = diffKeyResults(null, evaluateDesign(withJob));
    expect(rows.length).toBeGreaterThan(15);
    expect(rows.every((r) => r.isChanged && r.old === null && r.new !== null)).toBe(true);
  });
});

describe('diffKeyResults (second layer)', () => {
  it('when the previous revision was frozen by an engine without the second layer, then its figures show as new', () => {
    // Arrange
    const after = evaluateDesign(defaultDesign('corexy'));
    const { errorBudget: _e, ...older } = after;
    // Act
    const rows = diffKeyResults(older as typeof after, after);
    // Assert
    expect(rows.find((r) => r.key === 'errorBudget.worst.totalMm')).toMatchObject({
      old: null,
      new: after.errorBudget.worst.totalMm,
      isChanged: true,
    });
    expect(rows.find((r) => r.key === 'travel.xMm')).toMatchObject({ isChanged: false });
  });
});

describe('who may read, comment and decide', () => {
  const revision = { authorId: 1, status: 'in_review' as const };
  const design = { ownerId: 1 };

  it.each([
    ['the owner', user(1, ['designer']), true],
    ['a reviewer', user(2, ['reviewer']), true],
    ['an admin', user(3, ['admin']), true],
    ['a maker', user(4, ['maker']), false],
    ['another designer', user(5, ['designer']), false],
  ])('when %s asks about a revision in review, then reading is %s', (_who, actor, expected) => {
    expect(mayReadRevision(actor, revision, design)).toBe(expected);
    expect(mayComment(actor, revision, design)).toBe(expected);
  });

  it('when the revision is approved, then makers and other designers may read it but a user without a role may not', () => {
    const approved = { ...revision, status: 'approved' as const };
    expect(mayReadRevision(user(4, ['maker']), approved, design)).toBe(true);
    expect(mayReadRevision(user(5, ['designer']), approved, design)).toBe(true);
    expect(mayReadRevision(user(6, []), approved, design)).toBe(false);
  });

  it('when an admin submitted on behalf of the owner, then it is own work for both', () => {
    const byAdmin = { authorId: 9 };
    expect(isOwnWork(user(9, ['admin']), byAdmin, { ownerId: 1 })).toBe(true);
    expect(isOwnWork(user(1, ['designer', 'reviewer']), byAdmin, { ownerId: 1 })).toBe(true);
    expect(isOwnWork(user(2, ['reviewer']), byAdmin, { ownerId: 1 })).toBe(false);
  });
});
