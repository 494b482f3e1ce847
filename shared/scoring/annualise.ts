/**
 * @module shared/scoring/annualise
 * Annualised expected exposure of a lease across flood scenarios (product.md §3
 * "Screening": an annualised figure weighted by exceedance probability).
 *
 * Expected exposure days per year, (c) derived: if D(p) is the number of exposure days
 * caused by the flood whose annual exceedance probability is p, the expected days in a year
 * are E[D] = ∫₀¹ D(p) dp (the annual maximum flood's exceedance probability is uniform on
 * 0..1). The integral is taken by the trapezoid rule over the scenario points sorted by p, that
 * is the sum over the AEP bands between neighbouring scenarios of the band's probability mass
 * (p₂ − p₁) × its days ((D₁ + D₂)/2), as expected annual damage is summed in flood-risk practice
 * ((c) common practice); each band is one of `segments`. End treatments, (c) chosen here:
 * - rare end, p from 0 to the rarest scenario: D held at the rarest scenario's value
 *   (floods rarer than any scenario are counted as that scenario; a lower bound, since
 *   rarer floods expose at least as much);
 * - frequent end, p from the most frequent scenario to 1: by default D falls linearly to 0 at
 *   p = 1 (the flow exceeded every year causes no exposure); `frequentTail: 'zero'` holds
 *   D at 0 there instead, the more conservative-low choice.
 */

/** One scenario's exposure. */
export interface ExposurePoint {
  /** Annual exceedance probability, in (0, 1). */
  readonly aep: number;
  /** Exposure days at that flood (e.g. days below tolerance), ≥ 0. */
  readonly days: number;
}

/** How exposure is extended from the most frequent scenario to p = 1. */
export type FrequentTail = 'linear-to-zero' | 'zero';

/** Options of {@link annualiseExposure}. */
export interface AnnualiseOptions {
  /** Default 'linear-to-zero', (c). */
  readonly frequentTail?: FrequentTail;
}

/** One piece of the integral. */
export interface AnnualSegment {
  /** Lower AEP of the piece. */
  readonly fromAep: number;
  /** Upper AEP of the piece. */
  readonly toAep: number;
  /** Contribution, days per year. */
  readonly daysPerYear: number;
}

/** Result of {@link annualiseExposure}. */
export interface AnnualExposure {
  /** E[days] = ∫₀¹ D(p) dp, days per year. */
  readonly expectedDaysPerYear: number;
  /**
   * Annual probability the lease sees any exposure: the largest scenario AEP with days > 0,
   * or 0 when no scenario exposes the lease. A lower bound when the frequent tail is linear.
   */
  readonly probabilityOfAnyExposure: number;
  /** 1 / probabilityOfAnyExposure, years, or null when it is 0. */
  readonly returnPeriodOfAnyExposureYears: number | null;
  /** Pieces of the integral, from p = 0 up. */
  readonly segments: readonly AnnualSegment[];
  readonly frequentTail: FrequentTail;
}

/**
 * Annualised expected exposure days across AEP scenarios (see the module comment for the
 * end treatment). Throws when a point's aep is outside (0, 1), days is negative or not
 * finite, two points share an aep, or there are no points.
 *
 * @param points - at least one scenario, in any order
 * @param options - {@link AnnualiseOptions}
 * @returns expected days per year and the probability of any exposure
 * @example
 * annualiseExposure([
 *   { aep: 0.5, days: 0 }, { aep: 0.1, days: 4 }, { aep: 0.02, days: 10 }, { aep: 0.01, days: 12 },
 * ]).expectedDaysPerYear; // => 0.12 + 0.11 + 0.56 + 0.8 + 0 = 1.59
 */
export function annualiseExposure(points: readonly ExposurePoint[], options: AnnualiseOptions = {}): AnnualExposure {
  const frequentTail = options.frequentTail ?? 'linear-to-zero';
  if (frequentTail !== 'linear-to-zero' && frequentTail !== 'zero') {
    throw new Error(`frequentTail must be 'linear-to-zero' or 'zero'; got ${String(frequentTail)}`);
  }
  if (!Array.isArray(points) || points.length === 0) {
    throw new Error('points must be a non-empty array of { aep, days }');
  }
  for (const [index, point] of points.entries()) {
    if (!(Number.isFinite(point.aep) && point.aep > 0 && point.aep < 1)) {
      throw new Error(`points[${index}].aep must be an annual exceedance probability in (0, 1); got ${point.aep}`);
    }
    if (!(Number.isFinite(point.days) && point.days >= 0)) {
      throw new Error(`points[${index}].days must be 0 or more days; got ${point.days}`);
    }
  }
  const sorted = [...points].sort((a, b) => a.aep - b.aep);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i].aep === sorted[i - 1].aep) {
      throw new Error(`points must have distinct aep values; ${sorted[i].aep} appears twice`);
    }
  }

  const segments: AnnualSegment[] = [];
  const rarest = sorted[0];
  segments.push({ fromAep: 0, toAep: rarest.aep, daysPerYear: rarest.aep * rarest.days });
  for (let i = 1; i < sorted.length; i++) {
    const a = sorted[i - 1];
    const b = sorted[i];
    segments.push({ fromAep: a.aep, toAep: b.aep, daysPerYear: ((a.days + b.days) / 2) * (b.aep - a.aep) });
  }
  const frequent = sorted[sorted.length - 1];
  segments.push({
    fromAep: frequent.aep,
    toAep: 1,
    daysPerYear: frequentTail === 'linear-to-zero' ? (frequent.days / 2) * (1 - frequent.aep) : 0,
  });
  const expectedDaysPerYear = segments.reduce((total, segment) => total + segment.daysPerYear, 0);
  const exposed = sorted.filter((point) => point.days > 0);
  const probabilityOfAnyExposure = exposed.length > 0 ? exposed[exposed.length - 1].aep : 0;
  return {
    expectedDaysPerYear,
    probabilityOfAnyExposure,
    returnPeriodOfAnyExposureYears: probabilityOfAnyExposure > 0 ? 1 / probabilityOfAnyExposure : null,
    segments,
    frequentTail,
  };
}
