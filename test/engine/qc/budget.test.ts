/**
 * One cell never computes for seconds: the exact chain of a rule is charged by its work (states ×
 * classes × controls per run, run after run) and refuses beyond a fixed budget with #NUM! and a
 * message, before it would take more than about 0.2 s. The budget is counted in steps, not time,
 * so the same input gets the same answer on any machine. The published multirules stay far
 * inside it.
 */
import { detectionProbability, MAX_CHAIN_WORK } from '../../../src/engine/qc/power';
import { qcRisk, qcRunSize, clearRiskCaches } from '../../../src/engine/qc/risk';
import { evaluate } from '../../../src/registry';

/** A rule of about 5,000 states with a range term (the largest the machine compiles). */
const COSTLY = '70-0.1s/70-x/R-4s';

function errorOf(f: () => unknown): { code?: string; message?: string } {
  try {
    f();
  } catch (e) {
    return e as { code?: string; message?: string };
  }
  return {};
}

describe('the work budget of the exact chain', () => {
  test('a costly rule with many controls over many runs is #NUM!, saying what to change', () => {
    const e = errorOf(() => detectionProbability(COSTLY, 100, 0.5, 10000));
    expect(e.code).toBe('#NUM!');
    expect(e.message).toMatch(/too costly to evaluate in a cell \(more than 150 million steps\): use fewer controls per run, fewer runs, or smaller counts/);
  });

  test('the same rule with few runs is computed (the budget counts the work actually done)', () => {
    const p = detectionProbability(COSTLY, 2, 1, 3);
    expect(p).toBeGreaterThan(0);
    expect(p).toBeLessThanOrEqual(1);
  });

  test('the published multirules are computed even at the largest n and runs accepted', () => {
    for (const rule of ['1-3s/2-2s/R-4s', '1-3s/2-2s/R-4s/4-1s', '1-3s/2-2s/R-4s/4-1s/10-x']) {
      const p = detectionProbability(rule, 100, 0, 10000);
      expect(p).toBeGreaterThanOrEqual(0);
      expect(p).toBeLessThanOrEqual(1);
    }
  });

  test('QC.RISK and QC.RUNSIZE share one budget over their whole search of the shift', () => {
    clearRiskCaches();
    expect(errorOf(() => qcRisk(6, 1, 1.5, COSTLY, 4, 100)).code).toBe('#NUM!');
    expect(errorOf(() => qcRunSize(6, 1, 1.5, '50-0.5s/49-1s/R-4s/1-3s', 20)).code).toBe('#NUM!');
    // The common multirule with four controls is far inside it.
    expect(qcRisk(6, 1, 1.5, '1-3s/2-2s/R-4s/4-1s', 4, 100)).toBeGreaterThan(0);
  });

  test('through the worksheet function the error reaches the cell with its message', () => {
    const out = evaluate('QC.DETECT', [COSTLY, 100, 0.5, 10000])[0][0] as { error: string; message: string };
    expect(out.error).toBe('#NUM!');
    expect(out.message).toMatch(/too costly/);
    expect(MAX_CHAIN_WORK).toBe(150_000_000);
  });
});
