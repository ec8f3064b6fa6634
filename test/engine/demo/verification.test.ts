/**
 * The demo's invented verification study. The results are generated from a fixed seed; these
 * checks hold the generator to its design (common practice, no source: the CLSI EP15-A3 design of
 * 5 days × 5 replicates per material, two materials per analyte).
 */
import { demoTable, demoVerification, reportedDecimals, REPLICATION_DAYS, REPLICATES_PER_DAY, VERIFICATION_MATERIALS } from '../../../src/engine/demo';

describe('demo verification study', () => {
  test('three of the demo analytes, in their units, two materials each, 5 days × 5 replicates, the same on every call', () => {
    const a = demoVerification();
    expect(a).toEqual(demoVerification());
    expect(a).toHaveLength(3);
    const table = demoTable();
    for (const x of a) {
      const row = table.rows.find((r) => r.analyte === x.analyte);
      expect(row?.unit).toBe(x.unit);
      expect(x.materials.map((m) => m.material)).toEqual(['Level 1', 'Level 2']);
      expect(x.materials).toHaveLength(VERIFICATION_MATERIALS);
      for (const m of x.materials) {
        expect(m.replication).toHaveLength(REPLICATION_DAYS * REPLICATES_PER_DAY);
        for (let d = 1; d <= REPLICATION_DAYS; d++) expect(m.replication.filter((r) => r.day === `Day ${d}`)).toHaveLength(REPLICATES_PER_DAY);
        // Results as an analyser reports them at the material's level (about three significant digits).
        const f = 10 ** reportedDecimals(m.level);
        for (const r of m.replication) expect(Math.abs(r.result * f - Math.round(r.result * f))).toBeLessThan(1e-6);
        expect(m.claim.repeatability).toBeGreaterThan(0);
        expect(m.claim.withinLab).toBeGreaterThanOrEqual(m.claim.repeatability);
      }
      // One material per analyte carries an assigned value (the trueness block), with an uncertainty above 0.
      const assigned = x.materials.filter((m) => m.assigned);
      expect(assigned).toHaveLength(1);
      expect(assigned[0].assigned!.u).toBeGreaterThan(0);
    }
  });
});
