/**
 * Seeded generators for property tests: the engine's own mulberry32 (src/engine/demo/random.ts,
 * Tommy Ettinger's public-domain construction). Every property test states its seed, so a
 * failure repeats.
 */
export { mulberry32 } from '../../src/engine/demo/random';

/** Uniform in [lo, hi). */
export function uniform(rand: () => number, lo: number, hi: number): number {
  return lo + (hi - lo) * rand();
}

/** Log relative error (digits of agreement), as NIST StRD reports accuracy; exact agreement → 15. */
export function lre(computed: number, certified: number): number {
  if (computed === certified) return 15;
  const rel = certified === 0 ? Math.abs(computed) : Math.abs(computed - certified) / Math.abs(certified);
  return Math.min(15, -Math.log10(rel));
}

/** expect-style check with an explicit relative tolerance. */
export function relClose(actual: number, expected: number, rel: number): boolean {
  return Math.abs(actual - expected) <= rel * Math.max(Math.abs(expected), Number.MIN_VALUE);
}
