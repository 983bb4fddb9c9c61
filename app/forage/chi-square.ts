// The chi-square distribution's upper tail, for the test of "no selection" that goes with the
// selection ratios (Manly et al. 2002: X² against I − 1 degrees of freedom). Pure module.
//
// P(X² ≥ x) for k degrees of freedom is the regularised upper incomplete gamma Q(k/2, x/2),
// computed by its series below a + 1 and by its continued fraction above (the classic pairing,
// e.g. Press et al., Numerical Recipes, §6.2; written here from that description).

const EPSILON = 1e-15;
const MAX_ITERATIONS = 500;

/** ln Γ(x) for x > 0: Lanczos approximation (g = 7, 9 coefficients), about 15 digits. */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma: x must be positive, got ${x}`);
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let sum = c[0]!;
  for (let i = 1; i < 9; i++) sum += c[i]! / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** Regularised lower incomplete gamma P(a, x) by its power series (converges fast for x < a + 1). */
function lowerSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < MAX_ITERATIONS; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPSILON) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

/** Regularised upper incomplete gamma Q(a, x) by Lentz's continued fraction (for x ≥ a + 1). */
function upperFraction(a: number, x: number): number {
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPSILON) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/** P(X² ≥ statistic) for a chi-square variable with `degreesOfFreedom` (> 0) degrees of freedom. */
export function chiSquareUpperTail(statistic: number, degreesOfFreedom: number): number {
  if (!(degreesOfFreedom > 0)) throw new RangeError(`chiSquareUpperTail: degrees of freedom must be positive, got ${degreesOfFreedom}`);
  if (Number.isNaN(statistic)) throw new RangeError("chiSquareUpperTail: the statistic is NaN");
  if (statistic <= 0) return 1;
  const a = degreesOfFreedom / 2;
  const x = statistic / 2;
  return x < a + 1 ? 1 - lowerSeries(a, x) : upperFraction(a, x);
}
