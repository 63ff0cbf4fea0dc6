import { EngineInputError, evaluateValidDesign, safeParseDesign, type DesignInput, type DesignResult } from '@/engine';
import type { RevisionSummaryFigures } from '@/contracts';
import { validationError, type ErrorDetail } from '../errors';
import { revisionFingerprint } from './revisionFingerprint';
import { parseJson } from './storedJson';

// The content of a new revision: the validated inputs, the full engine result, its fingerprint and list figures.
// Pure (no database), so the engine pool's workers and the demo seeders run it without loading the models.

/** The list figures of a result. */
export function summaryFigures(result: DesignResult): RevisionSummaryFigures {
  const checks = { ok: 0, warn: 0, fail: 0 };
  for (const check of result.checks) checks[check.severity] += 1;
  return {
    checks,
    stepsPerMm: result.drive.stepsPerMm,
    travel: { xMm: result.travel.xMm, yMm: result.travel.yMm },
    worstAccelMPerS2: result.envelope.axes.worst.accelMaxMPerS2,
    lowestFrequencyHz: result.stiffness.min.frequencyHz,
  };
}

function engineIssues(issues: { path: string; message: string }[]): ErrorDetail[] {
  return issues.map((i) => ({ path: ['inputs', i.path].filter(Boolean).join('.'), message: i.message }));
}

/**
 * Validates stored inputs and runs the engine on them: the content of a new revision (pure; also used by the demo
 * seeder). @throws AppError 400 with the paths of invalid inputs
 */
export function freezeDesign(storedInputs: unknown): {
  inputs: DesignInput;
  result: DesignResult;
  fingerprint: string;
  summary: RevisionSummaryFigures;
} {
  const parsed = safeParseDesign(parseJson(storedInputs));
  if (!parsed.ok)
    throw validationError(engineIssues(parsed.issues), 'The design is not valid; fix the marked inputs before submitting it.');
  let result: DesignResult;
  try {
    result = evaluateValidDesign(parsed.value);
  } catch (err) {
    if (err instanceof EngineInputError)
      throw validationError(engineIssues(err.issues), 'The design is not valid; fix the marked inputs before submitting it.');
    throw err;
  }
  // Freeze what the database will hand back: a JSON round trip turns non-finite numbers into null, so the
  // fingerprint computed now equals the one recomputed from the stored row.
  const frozen = JSON.parse(JSON.stringify({ inputs: parsed.value, result })) as { inputs: DesignInput; result: DesignResult };
  return { ...frozen, fingerprint: revisionFingerprint(frozen.inputs, frozen.result), summary: summaryFigures(frozen.result) };
}
