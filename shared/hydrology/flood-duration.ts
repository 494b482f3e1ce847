/**
 * @module shared/hydrology/flood-duration
 * How long floods last: events above a flow threshold, and the typical time a flood stays
 * above half its peak.
 */

import { annualMaxima } from './annual-maxima';
import { empiricalQuantile } from './empirical-quantile';
import type { FlowReading } from './parse-flow-record';

/** One run of consecutive readings above a threshold. */
export interface FloodEvent {
  /** First reading above the threshold, ISO 8601 UTC. */
  start: string;
  /** Last reading above the threshold, ISO 8601 UTC. */
  end: string;
  /** Largest discharge in the event [readings' units]. */
  peak: number;
  /** Time of the peak, ISO 8601 UTC. */
  peakTime: string;
  /** Duration [h] = (end − start) + one reading interval. */
  durationHours: number;
  /** Readings in the event. */
  readings: number;
}

/** The result of {@link floodEvents}. */
export interface FloodDurationSummary {
  /** The threshold used [readings' units]. */
  threshold: number;
  /** The record's reading interval [h]: the median spacing of consecutive readings (24 for daily). */
  stepHours: number;
  /** Events in time order. */
  events: FloodEvent[];
  /** Median event duration [h], or null with no events. */
  medianHours: number | null;
  /** Mean event duration [h], or null with no events. */
  meanHours: number | null;
}

/** One annual peak and how long its flood stayed above a fraction of the peak. */
export interface PeakDuration {
  waterYear: number;
  /** The annual peak [readings' units]. */
  peak: number;
  peakTime: string;
  /** First and last reading above fraction × peak around the peak, ISO 8601 UTC. */
  start: string;
  end: string;
  /** Duration above fraction × peak [h]. */
  durationHours: number;
}

/** The result of {@link typicalDurationForPeak}. */
export interface TypicalPeakDuration {
  /** The fraction of each peak used as the threshold (default 0.5). */
  fraction: number;
  stepHours: number;
  events: PeakDuration[];
  /** Median over the annual peak events [h], or null with none. */
  medianHours: number | null;
  /** Mean over the annual peak events [h], or null with none. */
  meanHours: number | null;
}

/** Options of {@link typicalDurationForPeak}. */
export interface TypicalDurationOptions {
  /** First day of the water year, 'MM-DD'; default '10-01'. */
  waterYearStart?: string;
  /** Threshold as a fraction of each peak, 0 < fraction < 1; default 0.5. */
  fraction?: number;
  /** Use only complete water years (≥ 330 days with data) when there are any; default true. */
  completeYearsOnly?: boolean;
}

/**
 * Flood events above a threshold: runs of consecutive readings with discharge strictly above
 * `threshold`. A run ends at the first reading at or below the threshold or at a hole in the
 * record longer than 1.5 reading intervals. Each reading stands for one reading interval Δ
 * (the median spacing of the record), so an event's duration is (last − first) + Δ: one day
 * for a single daily value above the threshold.
 *
 * @param readings - readings in time order (the parser's output), discharge ≥ 0
 * @param threshold - flow threshold X, ≥ 0, in the readings' units
 * @returns { threshold, stepHours, events, medianHours, meanHours }
 * @throws RangeError if threshold is negative or not finite, or the readings are not in time order
 * @example
 * floodEvents(dailyReadings, 250);
 * // => { threshold: 250, stepHours: 24, events: [{ start, end, peak: 410, durationHours: 72, ... }], medianHours: 48, meanHours: 55.2 }
 * Source: (c) common practice (runs above a threshold; the one-interval convention is ours).
 */
export function floodEvents(readings: readonly FlowReading[], threshold: number): FloodDurationSummary {
  if (typeof threshold !== 'number' || !Number.isFinite(threshold) || threshold < 0) {
    throw new RangeError(`threshold must be a finite discharge of at least 0 (got ${String(threshold)})`);
  }
  const ms = timesOf(readings);
  const step = medianStep(ms);
  const events: FloodEvent[] = [];
  let i = 0;
  while (i < readings.length) {
    if (readings[i].discharge <= threshold) {
      i++;
      continue;
    }
    const first = i;
    let peak = first;
    while (i + 1 < readings.length && readings[i + 1].discharge > threshold && ms[i + 1] - ms[i] <= 1.5 * step) {
      i++;
      if (readings[i].discharge > readings[peak].discharge) peak = i;
    }
    events.push({
      start: readings[first].time,
      end: readings[i].time,
      peak: readings[peak].discharge,
      peakTime: readings[peak].time,
      durationHours: (ms[i] - ms[first] + step) / 3_600_000,
      readings: i - first + 1,
    });
    i++;
  }
  const durations = events.map((e) => e.durationHours);
  return { threshold, stepHours: step / 3_600_000, events, ...centre(durations) };
}

/**
 * Typical flood duration for a peak: for each water year's annual peak, the time the flow
 * stays above `fraction` × that peak (default half), taken around the peak as in
 * {@link floodEvents}; then the median and mean over the years. Use the median as the
 * duration of a design flood: a flood of peak Q lasts about `medianHours` above Q/2.
 *
 * @param readings - readings in time order (the parser's output), discharge ≥ 0
 * @param options - { waterYearStart = '10-01', fraction = 0.5 (0…1 exclusive), completeYearsOnly = true }
 * @returns { fraction, stepHours, events, medianHours, meanHours }
 * @throws RangeError if fraction is outside (0, 1), the water-year start is invalid, or the
 *   readings are not in time order
 * @example
 * typicalDurationForPeak(dailyReadings).medianHours; // => 96 (four days above half the peak)
 * Source: (c) common practice: the duration above half the peak is a usual width measure of a
 * flood hydrograph; the median over annual peaks is our choice.
 */
export function typicalDurationForPeak(readings: readonly FlowReading[], options: TypicalDurationOptions = {}): TypicalPeakDuration {
  const fraction = options.fraction ?? 0.5;
  if (typeof fraction !== 'number' || !(fraction > 0 && fraction < 1)) {
    throw new RangeError(`fraction must be between 0 and 1, both excluded (got ${String(fraction)})`);
  }
  const ms = timesOf(readings);
  const step = medianStep(ms);
  const maxima = annualMaxima(readings, { waterYearStart: options.waterYearStart });
  const complete = maxima.filter((m) => m.complete);
  const chosen = (options.completeYearsOnly ?? true) && complete.length > 0 ? complete : maxima;
  const indexByTime = new Map<string, number>();
  readings.forEach((r, i) => {
    if (!indexByTime.has(r.time)) indexByTime.set(r.time, i);
  });

  const events: PeakDuration[] = [];
  for (const m of chosen) {
    const at = indexByTime.get(m.time);
    if (at === undefined || m.discharge <= 0) continue;
    const level = fraction * m.discharge;
    let lo = at;
    let hi = at;
    while (lo > 0 && readings[lo - 1].discharge > level && ms[lo] - ms[lo - 1] <= 1.5 * step) lo--;
    while (hi + 1 < readings.length && readings[hi + 1].discharge > level && ms[hi + 1] - ms[hi] <= 1.5 * step) hi++;
    events.push({
      waterYear: m.waterYear,
      peak: m.discharge,
      peakTime: m.time,
      start: readings[lo].time,
      end: readings[hi].time,
      durationHours: (ms[hi] - ms[lo] + step) / 3_600_000,
    });
  }
  return { fraction, stepHours: step / 3_600_000, events, ...centre(events.map((e) => e.durationHours)) };
}

/** @private Epoch milliseconds of each reading; throws if they are not in time order. */
function timesOf(readings: readonly FlowReading[]): number[] {
  const ms = readings.map((r) => Date.parse(r.time));
  for (let i = 0; i < ms.length; i++) {
    if (!Number.isFinite(ms[i])) throw new RangeError(`readings[${i}].time must be an ISO 8601 time (got '${readings[i].time}')`);
    if (i > 0 && ms[i] < ms[i - 1]) {
      throw new RangeError(`readings must be in time order (readings[${i}] at ${readings[i].time} comes before the one above it)`);
    }
  }
  return ms;
}

/** @private Median positive spacing [ms]; one day if there is none. */
function medianStep(ms: number[]): number {
  const steps: number[] = [];
  for (let i = 1; i < ms.length; i++) if (ms[i] > ms[i - 1]) steps.push(ms[i] - ms[i - 1]);
  if (steps.length === 0) return 86_400_000;
  steps.sort((a, b) => a - b);
  return empiricalQuantile(steps, 0.5, 'type7');
}

/** @private Median and mean, or nulls for an empty list. */
function centre(values: number[]): { medianHours: number | null; meanHours: number | null } {
  if (values.length === 0) return { medianHours: null, meanHours: null };
  const sorted = [...values].sort((a, b) => a - b);
  return {
    medianHours: empiricalQuantile(sorted, 0.5, 'type7'),
    meanHours: values.reduce((a, b) => a + b, 0) / values.length,
  };
}

/** The result of {@link durationsForFlows}. */
export interface FlowDurations {
  /** Duration [h] for each flow given, in the same order; never shorter for a larger flow. */
  hours: number[];
  /** Fitted exponent b of duration ∝ peak^b (0 when the record cannot show one). */
  exponent: number;
  /** Annual peak events the fit rests on. */
  events: number;
  /** Plain-English warnings (too short a record, no growth shown, extrapolation). */
  warnings: string[];
}

/** Fewer annual peak events than this cannot show how duration changes with flood size, (c). */
export const MIN_DURATION_EVENTS = 10;

/**
 * Flood duration for each design flow from the record's own hydrographs: each annual peak's time
 * above half of it ({@link typicalDurationForPeak}) is regressed on the peak in log–log space,
 * duration = a·peak^b by least squares, and read off at each flow. A rarer (larger) flood so lasts
 * longer when the record shows it; b is kept ≥ 0 so a larger flood never lasts less (a record
 * whose larger floods happen to be shorter gives every flow the median). Beyond the largest
 * recorded peak the line is carried on but capped at twice the longest recorded duration.
 * With fewer than {@link MIN_DURATION_EVENTS} events every flow gets the median, and a warning
 * says the record is too short.
 *
 * @param events - annual peak events (typicalDurationForPeak(…).events), each { peak, durationHours }
 * @param flows - design flows [readings' units], > 0
 * @param minEvents - events needed for the fit (default 10)
 * @returns { hours per flow, exponent b, events, warnings }
 * @example
 * durationsForFlows(typicalDurationForPeak(readings).events, [300, 600, 1200]).hours; // => [72, 96, 130] (for a record whose larger floods last longer)
 * Source: (c) common practice: duration above half the peak as the width of a hydrograph
 * (science.md §1.11); a power law of peak fitted by least squares in log space is our choice.
 */
export function durationsForFlows(
  events: readonly Pick<PeakDuration, 'peak' | 'durationHours'>[],
  flows: readonly number[],
  minEvents = MIN_DURATION_EVENTS,
): FlowDurations {
  for (const q of flows) {
    if (!(typeof q === 'number' && Number.isFinite(q) && q > 0)) throw new RangeError(`flows must be positive discharges (got ${String(q)})`);
  }
  const usable = events.filter((e) => e.peak > 0 && e.durationHours > 0);
  const warnings: string[] = [];
  const median = centre(usable.map((e) => e.durationHours)).medianHours;
  if (usable.length === 0) {
    warnings.push('The record has no flood peaks to measure durations from: every flood was given 72 hours.');
    return { hours: flows.map(() => 72), exponent: 0, events: 0, warnings };
  }
  if (usable.length < minEvents) {
    warnings.push(
      `The record holds only ${usable.length} annual flood${usable.length === 1 ? '' : 's'} (at least ${minEvents} are needed to show how much longer a larger flood lasts): every flood was given the median duration, ${Math.round(median as number)} hours.`,
    );
    return { hours: flows.map(() => median as number), exponent: 0, events: usable.length, warnings };
  }
  const xs = usable.map((e) => Math.log(e.peak));
  const ys = usable.map((e) => Math.log(e.durationHours));
  const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
  const my = ys.reduce((a, b) => a + b, 0) / ys.length;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < xs.length; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  let exponent = sxx > 0 ? sxy / sxx : 0;
  if (!(exponent > 0)) {
    warnings.push("In this record larger floods do not last longer than smaller ones: every flood was given the median duration.");
    return { hours: flows.map(() => median as number), exponent: 0, events: usable.length, warnings };
  }
  exponent = Math.min(exponent, 2);
  const largest = Math.max(...usable.map((e) => e.peak));
  const longest = Math.max(...usable.map((e) => e.durationHours));
  if (flows.some((q) => q > largest)) {
    warnings.push(
      `Durations of floods above the largest recorded peak (${Math.round(largest)}) are extrapolated from the record's own floods (capped at twice its longest, ${Math.round(2 * longest)} hours).`,
    );
  }
  const hours = flows.map((q) => Math.min(2 * longest, Math.exp(my + exponent * (Math.log(q) - mx))));
  return { hours, exponent, events: usable.length, warnings };
}
