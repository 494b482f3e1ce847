import { useQuery } from '@tanstack/react-query';
import { exposureKeys, type ScreeningRow } from '../../../lib/exposure-api';

/** Scenarios in reading order: floods from frequent to rare, then seasonal and typed flows by flow. */
export function orderScenarios(rows: ScreeningRow[]): ScreeningRow[] {
  return [...rows].sort((a, b) => {
    if (a.aep !== null && b.aep !== null) return b.aep - a.aep;
    if (a.aep !== null) return -1;
    if (b.aep !== null) return 1;
    return a.discharge - b.discharge;
  });
}

/** The band of the lease's species limit, e.g. "salinity-under-15" for Pacific oysters. */
export function speciesBandId(row: ScreeningRow | undefined): string | undefined {
  const limit = row?.numbers.chronicLowerSalinity;
  return typeof limit === 'number' ? `salinity-under-${limit}` : undefined;
}

/** Everything the lease report shows: the lease, its screenings for every river, and the rivers. */
export function useLeaseReport(leaseId: string) {
  const lease = useQuery(exposureKeys.lease(leaseId));
  const screenings = useQuery(exposureKeys.screenings({ leaseId }));
  const rivers = useQuery(exposureKeys.rivers());
  return { lease, screenings, rivers };
}
