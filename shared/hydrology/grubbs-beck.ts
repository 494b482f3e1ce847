/**
 * @module shared/hydrology/grubbs-beck
 * Low-outlier tests for annual peak series in log10 space: the single Grubbs–Beck test of
 * Bulletin 17B and the Multiple Grubbs–Beck Test (MGBT) of Cohn et al. (2013) that Bulletin
 * 17C uses to find potentially influential low flows (PILFs). Both only flag values; they do
 * not refit the distribution with the flagged values censored.
 */

import gamma from '@stdlib/math-base-special-gamma';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { requireFiniteArray, requireOpenProbability } from './check-values';

/** A flagged low value. */
export interface LowOutlier {
  /** Index in the input array. */
  index: number;
  /** The flagged value [input units]. */
  value: number;
}

/** The result of {@link grubbsBeckTest}. */
export interface GrubbsBeckResult {
  n: number;
  /** false when n is outside 10…149, where the critical-value formula is not defined. */
  applicable: boolean;
  /** One-sided 10 % critical value K_N, or null when not applicable. */
  criticalValue: number | null;
  /** Low-outlier threshold 10^(ȳ − K_N s) [input units], or null when not applicable. */
  threshold: number | null;
  /** Values below the threshold, smallest first. */
  lowOutliers: LowOutlier[];
}

/** The result of {@link multipleGrubbsBeckTest}. */
export interface MultipleGrubbsBeckResult {
  n: number;
  /** false when n < 10, where the test is not applied. */
  applicable: boolean;
  /** Number of low outliers (PILFs) k. */
  numberOfLowOutliers: number;
  /** The smallest value kept, x(k+1); values below it are low outliers; null when k = 0. */
  threshold: number | null;
  /** The k smallest values, smallest first. */
  lowOutliers: LowOutlier[];
  /** p-value of the r-th smallest value, r = 1 … ⌊n/2⌋ (index r − 1). */
  pValues: number[];
}

/** Options of {@link multipleGrubbsBeckTest}. */
export interface MultipleGrubbsBeckOptions {
  /** Significance of the outward sweep from the median; default 0.005. */
  alphaOut?: number;
  /** Significance of the inward sweep from the smallest value; default 0.10. */
  alphaIn?: number;
}

/**
 * One-sided 10 % Grubbs–Beck critical value for a normal sample of size n:
 * K_N ≈ −0.9043 + 3.345 √(log10 n) − 0.4046 log10 n.
 *
 * @param n - sample size, 10…149
 * @returns K_N (dimensionless)
 * @throws RangeError if n is not a whole number in 10…149
 * @example
 * grubbsBeckCriticalValue(10); // => 2.036
 * grubbsBeckCriticalValue(24); // => 2.467
 * Source: (b) from memory: Bulletin 17B (IACWD 1982), Appendix 4 (approximation of the
 * Grubbs & Beck 1972 table); brief to this module.
 */
export function grubbsBeckCriticalValue(n: number): number {
  if (!Number.isInteger(n) || n < 10 || n > 149) {
    throw new RangeError(`n must be a whole number of peaks from 10 to 149 for the Grubbs–Beck critical value (got ${String(n)})`);
  }
  const l = Math.log10(n);
  return -0.9043 + 3.345 * Math.sqrt(l) - 0.4046 * l;
}

/**
 * Bulletin 17B single Grubbs–Beck low-outlier test: with y = log10 Q, mean ȳ and standard
 * deviation s (n − 1), values below 10^(ȳ − K_N s) are low outliers at the 10 % level.
 * Not applicable (nothing flagged) for n outside 10…149.
 *
 * @param peaks - annual peaks, all > 0 (any units)
 * @returns { n, applicable, criticalValue, threshold, lowOutliers }
 * @throws RangeError if fewer than 3 peaks or a peak is ≤ 0
 * @example
 * grubbsBeckTest(fishkillPeaks); // => { n: 24, criticalValue: 2.467, threshold: 577, lowOutliers: [] } (cfs)
 * Source: (b) from memory: Bulletin 17B (IACWD 1982), science.md §7.4 and the brief.
 */
export function grubbsBeckTest(peaks: readonly number[]): GrubbsBeckResult {
  requirePositivePeaks(peaks);
  const n = peaks.length;
  if (n < 10 || n > 149) return { n, applicable: false, criticalValue: null, threshold: null, lowOutliers: [] };
  const y = peaks.map((q) => Math.log10(q));
  const mean = y.reduce((a, b) => a + b, 0) / n;
  const sd = Math.sqrt(y.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
  const criticalValue = grubbsBeckCriticalValue(n);
  const threshold = 10 ** (mean - criticalValue * sd);
  const lowOutliers = peaks
    .map((value, index) => ({ index, value }))
    .filter((p) => p.value < threshold)
    .sort((a, b) => a.value - b.value || a.index - b.index);
  return { n, applicable: true, criticalValue, threshold, lowOutliers };
}

/**
 * Multiple Grubbs–Beck Test (MGBT). With the log10 peaks sorted ascending, z(1) ≤ … ≤ z(n),
 * the statistic of the r-th smallest is w_r = (z(r) − mean of z(r+1…n)) / (s.d. of z(r+1…n)),
 * r = 1 … ⌊n/2⌋, and its p-value is P(W_r ≤ w_r) for a normal sample ({@link mgbtPValue}).
 * Sweeps: outward from the median, k1 = the largest r whose p-value is below alphaOut
 * (0.005); inward from the smallest, k2 = the number of consecutive smallest values whose
 * p-values are all below alphaIn (0.10). The number of low outliers is k = max(k1, k2).
 * The test is not applied for n < 10.
 *
 * @param peaks - annual peaks, all > 0 (any units), at least 3
 * @param options - { alphaOut = 0.005, alphaIn = 0.10 }, each 0…1 exclusive
 * @returns { n, applicable, numberOfLowOutliers, threshold, lowOutliers, pValues }
 * @throws RangeError if fewer than 3 peaks, a peak is ≤ 0, or an alpha is outside (0, 1)
 * @example
 * multipleGrubbsBeckTest([...peaks, 3]).lowOutliers; // => [{ index: 40, value: 3 }] when 3 cfs is far below the rest
 * Source: (b) from memory / reading: Cohn, England, Berenbrock, Mason, Stedinger & Lamontagne
 * (2013), "A generalized Grubbs-Beck test statistic for detecting multiple potentially
 * influential low outliers in flood series", Water Resources Research 49(8), 5047–5058; the
 * 0.005 / 0.10 sweep levels as used with Bulletin 17C (England et al. 2018, (a) existence).
 */
export function multipleGrubbsBeckTest(peaks: readonly number[], options: MultipleGrubbsBeckOptions = {}): MultipleGrubbsBeckResult {
  requirePositivePeaks(peaks);
  const alphaOut = requireOpenProbability('alphaOut', options.alphaOut ?? 0.005);
  const alphaIn = requireOpenProbability('alphaIn', options.alphaIn ?? 0.1);
  const n = peaks.length;
  const order = peaks.map((value, index) => ({ value, index })).sort((a, b) => a.value - b.value || a.index - b.index);
  if (n < 10) {
    return { n, applicable: false, numberOfLowOutliers: 0, threshold: null, lowOutliers: [], pValues: [] };
  }
  const z = order.map((o) => Math.log10(o.value));
  const half = Math.floor(n / 2);
  // Suffix sums of deviations from the overall mean, for the mean and variance of z(r+1…n).
  const centre = z.reduce((a, b) => a + b, 0) / n;
  const pValues: number[] = [];
  let s1 = 0;
  let s2 = 0;
  for (let i = n - 1; i >= half; i--) {
    const d = z[i] - centre;
    s1 += d;
    s2 += d * d;
  }
  const w: number[] = new Array(half);
  for (let r = half; r >= 1; r--) {
    // z(r+1…n) are indices r … n−1.
    if (r < half) {
      const d = z[r] - centre;
      s1 += d;
      s2 += d * d;
    }
    const m = n - r;
    const mean = s1 / m;
    const variance = (s2 - m * mean * mean) / (m - 1);
    w[r - 1] = variance > 0 ? (z[r - 1] - centre - mean) / Math.sqrt(variance) : 0;
  }
  for (let r = 1; r <= half; r++) pValues.push(mgbtPValue(n, r, w[r - 1]));

  let kOut = 0;
  for (let r = half; r >= 1; r--) {
    if (pValues[r - 1] < alphaOut) {
      kOut = r;
      break;
    }
  }
  let kIn = 0;
  while (kIn < half && pValues[kIn] < alphaIn) kIn++;
  const k = Math.max(kOut, kIn);
  return {
    n,
    applicable: true,
    numberOfLowOutliers: k,
    threshold: k > 0 ? order[k].value : null,
    lowOutliers: order.slice(0, k).map((o) => ({ index: o.index, value: o.value })),
    pValues,
  };
}

/**
 * p-value of the MGBT statistic: P(W_r ≤ η) for the r-th smallest of n independent standard
 * normal values, W_r = (Z(r) − mean of the n − r larger values)/(their standard deviation).
 * Computed as in Cohn et al. (2013): conditionally on Z(r) = ζ the larger values are normal
 * truncated below at ζ; their sample mean is taken as normal and their sample variance as
 * gamma with the truncated-normal moments, the mean is decorrelated from the standard
 * deviation, and the ratio is a noncentral t (normal approximation for df > 20); the result is
 * integrated over the distribution of Z(r). Returns 0.5 (no evidence) for n < 10 or r > n/2.
 *
 * @param n - sample size, ≥ 3
 * @param r - rank from the smallest, 1 … n/2
 * @param eta - the observed statistic w_r (usually negative)
 * @returns the p-value, 0…1
 * @example
 * mgbtPValue(24, 1, -3.5); // => 0.005 or so: a very low smallest value
 * Source: (b) Cohn et al. (2013), Water Resources Research 49(8), 5047–5058, appendix
 * (conditional-moments approximation), as also used with Bulletin 17C; checked here by
 * simulation (c).
 */
export function mgbtPValue(n: number, r: number, eta: number): number {
  if (!Number.isInteger(n) || n < 3) throw new RangeError(`n must be a whole number of at least 3 (got ${String(n)})`);
  if (!Number.isInteger(r) || r < 1) throw new RangeError(`r must be a whole number of at least 1 (got ${String(r)})`);
  if (typeof eta !== 'number' || Number.isNaN(eta)) throw new RangeError(`eta must be a number (got ${String(eta)})`);
  if (n < 10 || r > n / 2) return 0.5;
  const logCoef = logGamma(n + 1) - logGamma(r) - logGamma(n - r + 1) - 0.5 * Math.log(2 * Math.PI);
  // Z(r) lies near Blom's position Φ⁻¹((r − 0.375)/(n + 0.25)) with spread about
  // √(p(1 − p)/(n + 2))/φ(z0); integrate over −12…+10 of those spreads (tails below 1e-8).
  const p0 = (r - 0.375) / (n + 0.25);
  const z0 = normalQuantile(p0, 0, 1);
  const spread = Math.sqrt((p0 * (1 - p0)) / (n + 2)) / (Math.exp(-0.5 * z0 * z0) / Math.sqrt(2 * Math.PI));
  const a = Math.max(-9, z0 - 12 * spread);
  const b = Math.min(9, z0 + 10 * spread);
  const integrand = (x: number): number => {
    // Φ(x) and 1 − Φ(x) from one evaluation, taking the tail that is accurate.
    const tail = normalCdf(-Math.abs(x), 0, 1);
    const lower = x < 0 ? tail : 1 - tail;
    const upper = x < 0 ? 1 - tail : tail;
    if (lower <= 0 || upper <= 0) return 0;
    const logDensity = logCoef + (r - 1) * Math.log(lower) + (n - r) * Math.log(upper) - 0.5 * x * x;
    return Math.exp(logDensity) * conditionalExceedance(n, r, eta, x, upper);
  };
  const p = gaussLegendre(integrand, a, b, OUTER_PANELS);
  return Math.min(1, Math.max(0, p));
}

/** @private P(W_r ≤ η | Z(r) = zr) = 1 − F_t(q; df, ncp); `upper` is 1 − Φ(zr). */
function conditionalExceedance(n: number, r: number, eta: number, zr: number, upper: number): number {
  const m = n - r;
  const phi = Math.exp(-0.5 * zr * zr) / Math.sqrt(2 * Math.PI);
  const h = phi / Math.max(1e-10, upper);
  // Raw moments of a standard normal truncated below at zr.
  const e1 = h;
  const e2 = 1 + h * zr;
  const e3 = 2 * e1 + h * zr * zr;
  const e4 = 3 * e2 + h * zr ** 3;
  const muM = e1;
  const muS2 = e2 - e1 * e1;
  const varM = muS2 / m;
  const central4 = e4 - 4 * e3 * e1 + 6 * e2 * e1 * e1 - 3 * e1 ** 4;
  const varS2 = (central4 - muS2 * muS2) / m + (2 / ((m - 1) * m)) * muS2 * muS2;
  const alpha = (muS2 * muS2) / varS2;
  const beta = muS2 / alpha;
  const covMS2 = (e3 - 3 * e2 * e1 + 2 * e1 ** 3) / Math.sqrt(m * (m - 1));
  const muS = Math.sqrt(beta) * Math.exp(logGammaRatioHalf(alpha));
  const covMS = covMS2 / (2 * muS);
  const varS = muS2 - muS * muS;
  const lambda = covMS / varS;
  const etaP = eta + lambda;
  const muMP = muM - lambda * muS;
  const varMP = varM - (covMS * covMS) / varS;
  const df = 2 * alpha;
  const ncp = (muMP - zr) / Math.sqrt(varMP);
  const q = -Math.sqrt(muS2 / varMP) * etaP;
  return 1 - noncentralTCdf(q, df, ncp);
}

/** @private Noncentral t CDF: normal approximation for df > 20, else integrated over the chi variate. */
function noncentralTCdf(t: number, df: number, ncp: number): number {
  if (df > 20) {
    const z = (t * (1 - 1 / (4 * df)) - ncp) / Math.sqrt(1 + (t * t) / (2 * df));
    return normalCdf(z, 0, 1);
  }
  const nu = Math.max(df, 0.5);
  // s = sqrt(χ²_ν/ν) has density 2 (ν/2)^(ν/2) s^(ν−1) e^(−ν s²/2) / Γ(ν/2).
  const logC = Math.LN2 + (nu / 2) * Math.log(nu / 2) - logGamma(nu / 2);
  const sMax = Math.sqrt((nu + 12 * Math.sqrt(2 * nu) + 60) / nu);
  const f = (s: number): number => (s <= 0 ? 0 : Math.exp(logC + (nu - 1) * Math.log(s) - (nu * s * s) / 2) * normalCdf(t * s - ncp, 0, 1));
  return Math.min(1, Math.max(0, gaussLegendre(f, 0, sMax, INNER_PANELS)));
}

/**
 * Gauss–Legendre panels over Z(r) and over the chi variate. (c) Checked against grids 4–5×
 * finer: p-values agree within 3e-4 (the integrand jumps where df crosses 20, between the
 * exact and the approximate noncentral t), far inside the 0.005 and 0.10 test levels.
 */
const OUTER_PANELS = 10;
const INNER_PANELS = 4;

const GL_NODES = [
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498, 0.525532409916329,
  0.7966664774136267, 0.9602898564975363,
];
const GL_WEIGHTS = [
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362, 0.3137066458778873, 0.2223810344533745,
  0.1012285362903763,
];

/** @private Composite 8-point Gauss–Legendre quadrature of f over [a, b] in `panels` panels. */
function gaussLegendre(f: (x: number) => number, a: number, b: number, panels: number): number {
  const h = (b - a) / panels;
  let total = 0;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * h;
    for (let i = 0; i < GL_NODES.length; i++) total += GL_WEIGHTS[i] * f(mid + 0.5 * h * GL_NODES[i]);
  }
  return 0.5 * h * total;
}

/** @private ln Γ(x) for x > 0: from Γ below 150, Stirling's series above. */
function logGamma(x: number): number {
  if (x < 150) return Math.log(gamma(x));
  const inv = 1 / x;
  const inv2 = inv * inv;
  return (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + inv * (1 / 12 - inv2 * (1 / 360 - inv2 / 1260));
}

/**
 * @private ln(Γ(a + ½)/Γ(a)), a > 0: exact below 8, else the asymptotic series
 * √a (1 − 1/(8a) + 1/(128a²) + 5/(1024a³) − 21/(32768a⁴)) (error < 5e-8 for a ≥ 8).
 */
function logGammaRatioHalf(a: number): number {
  if (a < 8) return Math.log(gamma(a + 0.5) / gamma(a));
  const i = 1 / a;
  return 0.5 * Math.log(a) + Math.log(1 + i * (-1 / 8 + i * (1 / 128 + i * (5 / 1024 - (i * 21) / 32768))));
}

/** @private Throws unless peaks are at least 3 finite values, all > 0. */
function requirePositivePeaks(peaks: readonly number[]): void {
  requireFiniteArray('peaks', peaks, 3);
  peaks.forEach((q, i) => {
    if (q <= 0) throw new RangeError(`peaks[${i}] must be greater than 0 for a test on logarithms (got ${q})`);
  });
}
