// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { LeasesTable } from '../../../../src/features/leases/components/leases-table';

const LEASES = [
  { id: '1', leaseId: 'FB-002', holder: 'Saltreed Oysters', species: 'pacific-oyster', status: 'held', areaM2: 52_000 },
  { id: '2', leaseId: 'FB-001', holder: 'Saltreed Oysters', species: 'blue-mussel', status: 'candidate', areaM2: 91_000 },
  { id: '3', leaseId: 'FB-003', holder: 'Carrick Mussel Lines', species: 'blue-mussel', status: 'held', areaM2: 14_000 },
].map((l) => ({ ...l, notes: null, ownerId: 'u', ownerName: 'Ida Marsh', onLand: false, importId: null, createdAt: '', updatedAt: '' }));

// Yearly figures as the server gives them (rating from the issue #14 cut points: 10 days → High, 0.05 → Moderate).
const ANNUAL: Record<
  string,
  { annualRating: string | null; closureDaysPerYear: number | null; harmfulSalinityChancePerYear: number | null }
> = {
  '1': { annualRating: 'moderate', closureDaysPerYear: 0, harmfulSalinityChancePerYear: 0.05 },
  '2': { annualRating: 'high', closureDaysPerYear: 10, harmfulSalinityChancePerYear: 0 },
  '3': { annualRating: 'moderate', closureDaysPerYear: 3, harmfulSalinityChancePerYear: 0 },
};
const RANK = ['low', 'moderate', 'high', 'severe'];
/** The server's sort=annualRating: the rating, then closure days, then the chance. */
const annualKey = (id: string) => [
  RANK.indexOf(ANNUAL[id].annualRating ?? ''),
  ANNUAL[id].closureDaysPerYear ?? -1,
  ANNUAL[id].harmfulSalinityChancePerYear ?? -1,
];

const RIVERS = { items: [{ id: 'r1', name: 'Amberlin River', hasFlowRecord: true, settings: {}, defaultsUsed: [] }] };
const SCENARIOS = {
  items: [
    { id: 's100', riverId: 'r1', name: '1-in-100-year flood', kind: 'aep', aep: 0.01, discharge: 2759, durationHours: 120 },
    { id: 's2', riverId: 'r1', name: '1-in-2-year flood', kind: 'aep', aep: 0.5, discharge: 800, durationHours: 72 },
  ],
};
const RATINGS: Record<string, Record<string, string>> = {
  '1': { s2: 'low', s100: 'high' },
  '2': { s2: 'moderate', s100: 'severe' },
  '3': {},
};

/** A stand-in for GET /api/v1/leases that sorts and filters as the server does (and the rivers and scenarios it needs). */
function fakeLeasesApi(url: string) {
  const u = new URL(url, 'http://localhost');
  if (u.pathname.endsWith('/rivers')) return RIVERS;
  if (u.pathname.endsWith('/scenarios')) return SCENARIOS;
  const q = u.searchParams.get('q')?.toLowerCase();
  const status = u.searchParams.get('status');
  const sort = (u.searchParams.get('sort') ?? 'leaseId') as keyof (typeof LEASES)[number];
  const desc = u.searchParams.get('order') === 'desc';
  const items = LEASES.filter(
    (l) => (!q || l.leaseId.toLowerCase().includes(q) || l.holder.toLowerCase().includes(q)) && (!status || l.status === status),
  ).sort((a, b) => {
    if ((sort as string) === 'annualRating') {
      const [ka, kb] = [annualKey(a.id), annualKey(b.id)];
      const k = ka.findIndex((v, i) => v !== kb[i]);
      return (k < 0 ? 0 : ka[k] - kb[k]) * (desc ? -1 : 1);
    }
    const x = a[sort] as string | number;
    const y = b[sort] as string | number;
    return (x < y ? -1 : x > y ? 1 : 0) * (desc ? -1 : 1);
  });
  const ratingsRiver = u.searchParams.get('ratingsRiverId');
  const withAnnual = items.map((l) => ({ ...l, ...ANNUAL[l.id] }));
  return { items: withAnnual.map((l) => (ratingsRiver ? { ...l, scenarioRatings: RATINGS[l.id] } : l)), total: items.length };
}

const requests: string[] = [];
beforeEach(() => {
  requests.length = 0;
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      requests.push(url);
      return new Response(JSON.stringify(fakeLeasesApi(url)), { status: 200, headers: { 'Content-Type': 'application/json' } });
    }),
  );
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderTable() {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <MemoryRouter>
        <LeasesTable canEdit />
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

const leaseIdsShown = () =>
  within(screen.getByRole('table', { name: 'Leases' }))
    .getAllByRole('link')
    .map((a) => a.textContent);

describe('LeasesTable', () => {
  it('lists leases worst yearly rating first (then closure days, then the chance), with the figures and how the rating is set', async () => {
    renderTable();
    // FB-001 High (10 days); FB-003 Moderate with 3 closure days before FB-002 Moderate with 0 days and a 0.05 chance.
    await waitFor(() => expect(leaseIdsShown()).toEqual(['FB-001', 'FB-003', 'FB-002']));
    expect(requests.find((r) => r.includes('/leases?'))).toMatch(/sort=annualRating&order=desc/);
    const table = screen.getByRole('table', { name: 'Leases' });
    const header = within(table)
      .getByRole('button', { name: /Yearly rating/ })
      .closest('th')!;
    expect(header.getAttribute('aria-sort')).toBe('descending');
    const row = within(table).getByRole('link', { name: 'FB-002' }).closest('tr')!;
    expect(row.querySelector('[data-rating]')?.getAttribute('data-rating')).toBe('moderate');
    expect(row.textContent).toContain('0 days closed a yearharmful salinity: 1 year in 20');
    expect(screen.getByText('How the yearly rating is set')).toBeTruthy();
    expect(within(screen.getByRole('list', { name: 'Yearly rating cut points' })).getAllByRole('listitem')).toHaveLength(4);
  }, 20_000);

  it('sorts by lease id, then by area when the header is clicked', async () => {
    renderTable();
    await waitFor(() => expect(leaseIdsShown()).toHaveLength(3));
    await act(async () => fireEvent.click(screen.getByRole('button', { name: /Lease id/ })));
    await waitFor(() => expect(requests.at(-1)).toMatch(/sort=leaseId/));
    const idOrder = new URL(requests.at(-1)!, 'http://x').searchParams.get('order');
    await waitFor(() =>
      expect(leaseIdsShown()).toEqual(idOrder === 'desc' ? ['FB-003', 'FB-002', 'FB-001'] : ['FB-001', 'FB-002', 'FB-003']),
    );
    const areaButton = screen.getByRole('button', { name: /Area/ });
    await act(async () => fireEvent.click(areaButton));
    await waitFor(() => expect(requests.at(-1)).toMatch(/sort=areaM2/));
    const order = new URL(requests.at(-1)!, 'http://x').searchParams.get('order');
    await waitFor(() =>
      expect(leaseIdsShown()).toEqual(order === 'desc' ? ['FB-001', 'FB-002', 'FB-003'] : ['FB-003', 'FB-002', 'FB-001']),
    );
    const header = areaButton.closest('th')!;
    expect(header.getAttribute('aria-sort')).toBe(order === 'desc' ? 'descending' : 'ascending');
  });

  it('filters by text and by status through the server', async () => {
    renderTable();
    await waitFor(() => expect(leaseIdsShown()).toHaveLength(3));
    fireEvent.change(screen.getByLabelText('Find a lease'), { target: { value: 'carrick' } });
    await waitFor(() => expect(leaseIdsShown()).toEqual(['FB-003']));
    expect(requests.at(-1)).toMatch(/q=carrick/);
    fireEvent.change(screen.getByLabelText('Find a lease'), { target: { value: '' } });
    fireEvent.change(screen.getByRole('combobox', { name: 'Status' }), { target: { value: 'candidate' } });
    await waitFor(() => expect(leaseIdsShown()).toEqual(['FB-001']));
    expect(requests.at(-1)).toMatch(/status=candidate/);
  });

  it('shows an empty state that says how to clear the filters', async () => {
    renderTable();
    await waitFor(() => expect(leaseIdsShown()).toHaveLength(3));
    fireEvent.change(screen.getByLabelText('Find a lease'), { target: { value: 'no-such-lease' } });
    await screen.findByText('No lease matches these filters');
    expect(screen.getByText(/Clear the search or the status filter/)).toBeTruthy();
  });

  it("shows each lease's rating at every flood of the chosen river, the most frequent flood first", async () => {
    renderTable();
    await waitFor(() => expect(requests.some((r) => r.includes('ratingsRiverId=r1'))).toBe(true));
    const table = screen.getByRole('table', { name: 'Leases' });
    await waitFor(() => expect(within(table).getByText('1-in-2-year')).toBeTruthy());
    const headers = within(table)
      .getAllByRole('columnheader')
      .map((h) => h.textContent);
    expect(headers.indexOf('1-in-2-year')).toBeLessThan(headers.indexOf('1-in-100-year'));
    // FB-001 (id 2) is Moderate at the 1-in-2 and Severe at the 1-in-100-year flood.
    const row = within(table).getByRole('link', { name: 'FB-001' }).closest('tr')!;
    const cells = within(row)
      .getAllByRole('cell')
      .map((c) => c.textContent ?? '');
    expect(cells.at(-2)).toContain('Moderate');
    expect(cells.at(-1)).toContain('Severe');
  });
});
