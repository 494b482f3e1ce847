/** Numbers with units and sensible precision (ui.md "Words"). */
import { getSpeciesTolerance, isSpeciesId } from '#shared/biology/species-tolerance';

export function fmtNumber(value: number | null | undefined, digits = 0): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toLocaleString('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: digits });
}

export function fmtFlow(m3s: number): string {
  return `${fmtNumber(m3s, m3s < 100 ? 1 : 0)} m³/s`;
}

export function fmtPercent(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined) return '—';
  return `${Math.round(fraction * 100)}%`;
}

export function fmtSalinity(psu: number | null | undefined): string {
  return psu === null || psu === undefined ? 'not reached' : `${fmtNumber(psu, 1)} psu`;
}

export function fmtIndicator(per100: number | null | undefined): string {
  return per100 === null || per100 === undefined ? 'not reached' : `${fmtNumber(per100, per100 < 10 ? 1 : 0)} per 100 mL`;
}

export function fmtDays(days: number | null | undefined): string {
  if (days === null || days === undefined) return '—';
  return `${fmtNumber(days, days < 10 && days % 1 ? 1 : 0)} ${days === 1 ? 'day' : 'days'}`;
}

export function fmtArea(m2: number): string {
  return `${fmtNumber(m2 / 10_000, 2)} ha`;
}

/** "1-in-10-year" from an annual exceedance probability of 0.1. */
export function returnPeriodLabel(aep: number): string {
  return `1-in-${fmtNumber(1 / aep, 0)}-year`;
}

export function speciesName(id: string | null | undefined): string {
  if (!id) return '—';
  if (!isSpeciesId(id)) return id;
  const name = getSpeciesTolerance(id).commonName;
  return name.charAt(0).toUpperCase() + name.slice(1);
}

export function speciesPlural(id: string | null | undefined): string {
  if (!id || !isSpeciesId(id)) return 'this species';
  return getSpeciesTolerance(id).commonNamePlural;
}

/** A date and time in the reader's locale, e.g. "2 Dec 2026, 05:40". */
export function fmtDateTime(iso: string | Date): string {
  return new Date(iso).toLocaleString(undefined, { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
}
