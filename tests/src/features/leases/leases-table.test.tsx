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
    const x = a[sort] as string | number;
    const y = b[sort] as string | number;
    return (x < y ? -1 : x > y ? 1 : 0) * (desc ? -1 : 1);
  });
  const ratingsRiver = u.searchParams.get('ratingsRiverId');
  return { items: items.map((l) => (ratingsRiver ? { ...l, scenarioRatings: RATINGS[l.id] } : l)), total: items.length };
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
  it('lists leases sorted by lease id, then by area when the header is clicked', async () => {
    renderTable();
    await waitFor(() => expect(leaseIdsShown()).toEqual(['FB-001', 'FB-002', 'FB-003']));
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
