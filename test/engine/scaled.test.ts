/**
 * Scaled arithmetic (src/engine/scaled.ts): a double times a power of two. Checked against exact
 * integer arithmetic (BigInt: a double is M·2^E exactly; sums, products and quotients of two
 * doubles are rounded to binary64, nearest, ties to even, subnormals included, by the rules of
 * IEEE 754), against decimal.js for roots, and against plain double arithmetic, which it must
 * reproduce bit for bit where no intermediate leaves the normal range. Seed 20261208.
 */
import { compare, exponentOf, hypotenuse, ldexp, minus, over, plus, root, scaled, times, toDouble } from '../../src/engine/scaled';
import { D, exact } from '../support/highprecision';
import { mulberry32 } from '../support/prng';

// ---- exact binary arithmetic ------------------------------------------------------------------

const VIEW = new DataView(new ArrayBuffer(8));

/** A finite double as [M, E] with value M·2^E exactly. */
function bits(x: number): [bigint, number] {
  VIEW.setFloat64(0, x);
  const b = VIEW.getBigUint64(0);
  const field = Number((b >> 52n) & 0x7ffn);
  const frac = b & ((1n << 52n) - 1n);
  const M = field === 0 ? frac : frac | (1n << 52n);
  return [b >> 63n ? -M : M, field === 0 ? -1074 : field - 1075];
}

const bitLength = (a: bigint): number => a.toString(2).length;

/** M·2^E rounded to the nearest double, ties to even, subnormals and overflow included. */
function round(M: bigint, E: number): number {
  if (M === 0n) return 0;
  const neg = M < 0n;
  let q = neg ? -M : M;
  let p = E;
  const keep = Math.max(p + bitLength(q) - 53, -1074);
  if (keep > p) {
    const shift = BigInt(keep - p);
    const r = q & ((1n << shift) - 1n);
    const half = 1n << (shift - 1n);
    q >>= shift;
    p = keep;
    if (r > half || (r === half && (q & 1n) === 1n)) q += 1n;
  }
  if (q === 0n) return neg ? -0 : 0;
  while (q >= 1n << 53n) {
    q >>= 1n; // only the carry 2^53 of a rounding, exact
    p += 1;
  }
  while (q < 1n << 52n && p > -1074) {
    q <<= 1n;
    p -= 1;
  }
  let out: bigint;
  if (q < 1n << 52n) out = q; // subnormal (p = −1074)
  else {
    const field = p + 1075;
    if (field >= 2047) return neg ? -Infinity : Infinity;
    out = (BigInt(field) << 52n) | (q - (1n << 52n));
  }
  VIEW.setBigUint64(0, neg ? out | (1n << 63n) : out);
  return VIEW.getFloat64(0);
}

function exactSum(a: number, b: number): [bigint, number] {
  const [Ma, Ea] = bits(a);
  const [Mb, Eb] = bits(b);
  const E = Math.min(Ea, Eb);
  return [(Ma << BigInt(Ea - E)) + (Mb << BigInt(Eb - E)), E];
}

const exactProduct = (a: number, b: number): number => {
  const [Ma, Ea] = bits(a);
  const [Mb, Eb] = bits(b);
  return round(Ma * Mb, Ea + Eb);
};

/** a/b rounded once: 300 quotient bits and a sticky bit for the remainder. */
const exactQuotient = (a: number, b: number): number => {
  const [Ma, Ea] = bits(a);
  const [Mb, Eb] = bits(b);
  const num = Ma << 300n;
  let q = num / Mb;
  const r = num % Mb;
  let e = Ea - Eb - 300;
  if (r !== 0n) {
    q = q * 2n + (q < 0n || (q === 0n && (Ma < 0n) !== (Mb < 0n)) ? -1n : 1n);
    e -= 1;
  }
  return round(q, e);
};

const rand = mulberry32(20261208);

/** A double of any size, subnormals included. */
function anySize(): number {
  const e = Math.floor(rand() * 2098) - 1074;
  const v = (1 + rand()) * 2 ** Math.max(e, -1022) * 2 ** Math.min(0, e + 1022);
  return rand() < 0.3 ? -v : v;
}

describe('ldexp and exponentOf', () => {
  test('exponentOf gives e with 2^(e−1) ≤ |x| < 2^e, subnormals included (IEEE 754 binary64 layout)', () => {
    expect(exponentOf(1)).toBe(1);
    expect(exponentOf(0.5)).toBe(0);
    expect(exponentOf(Number.MAX_VALUE)).toBe(1024);
    expect(exponentOf(2.2250738585072014e-308)).toBe(-1021);
    expect(exponentOf(5e-324)).toBe(-1073);
    expect(exponentOf(-3e-320)).toBe(exponentOf(3e-320));
    for (let i = 0; i < 2000; i++) {
      const x = Math.abs(anySize());
      const e = exponentOf(x);
      expect([x, exact(x).gte(new D(2).pow(e - 1)) && exact(x).lt(new D(2).pow(e))]).toEqual([x, true]);
    }
  });

  test('ldexp(x, n) is x·2^n rounded once, to nearest even, into the subnormal range (exact integer arithmetic)', () => {
    for (let i = 0; i < 3000; i++) {
      const x = 1 + rand() * (rand() < 0.5 ? 1 : 2 ** -30);
      const n = Math.floor(rand() * 2300) - 1150;
      const [M, E] = bits(x);
      const want = round(M, E + n);
      expect([x, n, ldexp(x, n)]).toEqual([x, n, want]);
    }
  });

  test('ldexp beyond the largest double is Infinity, below half the smallest subnormal 0', () => {
    expect(ldexp(1, 1024)).toBe(Infinity);
    expect(ldexp(0.75, 1024)).toBe(0.75 * 2 ** 1023 * 2);
    expect(ldexp(1, 1025)).toBe(Infinity);
    expect(ldexp(Number.MAX_VALUE, -1)).toBe(Number.MAX_VALUE / 2);
    expect(ldexp(1, -1075)).toBe(0); // a tie: to even
    expect(ldexp(1.5, -1075)).toBe(5e-324);
    expect(ldexp(1, -1074)).toBe(5e-324);
    expect(ldexp(1, -5000)).toBe(0);
  });
});

describe('scaled operations', () => {
  test('in the normal range each operation gives the bits of the double operation (1000 seeded cases each)', () => {
    for (let i = 0; i < 1000; i++) {
      const a = (rand() - 0.3) * 10 ** (rand() * 200 - 100);
      const b = (rand() - 0.3) * 10 ** (rand() * 200 - 100);
      const A = scaled(a);
      const B = scaled(b);
      expect([a, b, toDouble(times(A, B)), toDouble(over(A, B)), toDouble(plus(A, B)), toDouble(minus(A, B))]).toEqual([a, b, a * b, a / b, a + b, a - b]);
      expect([a, toDouble(root(scaled(Math.abs(a))))]).toEqual([a, Math.sqrt(Math.abs(a))]);
      expect([a, b, toDouble(hypotenuse(A, B))]).toEqual([a, b, Math.hypot(a, b)]);
    }
  });

  /**
   * The mantissa is rounded to 53 bits, then once more onto the subnormal grid: a subnormal
   * result is the correctly rounded one or its neighbour (one step of 4.9e-324), never further.
   */
  const within = (got: number, want: number): boolean =>
    got === want || (Math.abs(want) < 2.2250738585072014e-308 && Math.abs(got - want) <= 5e-324);

  test('products and quotients of any doubles are the exact value rounded once (within one subnormal step below 2.2e-308)', () => {
    let subnormal = 0;
    let neighbour = 0;
    for (let i = 0; i < 4000; i++) {
      const a = anySize();
      const b = anySize();
      const p = toDouble(times(scaled(a), scaled(b)));
      const q = toDouble(over(scaled(a), scaled(b)));
      const wp = exactProduct(a, b);
      const wq = exactQuotient(a, b);
      expect([a, b, within(p, wp), within(q, wq)]).toEqual([a, b, true, true]);
      for (const [got, want] of [[p, wp], [q, wq]]) {
        if (want !== 0 && Math.abs(want) < 2.2250738585072014e-308) {
          subnormal++;
          if (got !== want) neighbour++;
        }
      }
    }
    expect(subnormal).toBeGreaterThan(50);
    expect(neighbour / subnormal).toBeLessThan(0.05);
  });

  test('a sum of any doubles is the exact sum rounded once; a comparison is exact', () => {
    for (let i = 0; i < 4000; i++) {
      const a = anySize();
      const b = rand() < 0.2 ? -a * (1 + 2 ** -52) : anySize();
      const [M, E] = exactSum(a, b);
      expect([a, b, toDouble(plus(scaled(a), scaled(b)))]).toEqual([a, b, round(M, E)]);
      const [Md] = exactSum(a, -b);
      expect([a, b, compare(scaled(a), scaled(b))]).toEqual([a, b, Md > 0n ? 1 : Md < 0n ? -1 : 0]);
    }
  });

  test('the hypotenuse of any doubles is within two units in the last place of √(a² + b²) (Math.hypot on aligned mantissas, which is not correctly rounded in V8)', () => {
    for (let i = 0; i < 2000; i++) {
      const a = anySize();
      const b = anySize();
      const want = exact(a).pow(2).plus(exact(b).pow(2)).sqrt();
      const got = toDouble(hypotenuse(scaled(a), scaled(b)));
      if (!Number.isFinite(got)) {
        expect([a, b, want.gt(exact(Number.MAX_VALUE))]).toEqual([a, b, true]);
      } else {
        const ulp = new D(2).pow(Math.max(exponentOf(got) - 53, -1074)).times(2);
        expect([a, b, exact(got).minus(want).abs().lte(ulp)]).toEqual([a, b, true]);
      }
    }
  });
});
