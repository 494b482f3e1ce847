// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { OverviewPage } from '../../../src/app/routes/overview-page';

const lease = (
  id: string,
  leaseId: string,
  annualRating: string | null,
  closureDaysPerYear: number | null,
  harmfulSalinityChancePerYear: number | null,
  worstRating: string | null = annualRating,
) => ({
  id,
  leaseId,
  holder: null,
  species: 'pacific-oyster',
  status: 'held',
  notes: null,
  ownerId: 'u',
  ownerName: 'Ida',
  areaM2: 10000,
  onLand: false,
  importId: null,
  createdAt: '',
  updatedAt: '',
  worstRating,
  expectedDaysPerYear: closureDaysPerYear,
  probabilityAnyExposure: harmfulSalinityChancePerYear,
  annualRating,
  closureDaysPerYear,
  harmfulSalinityChancePerYear,
});

// The server ranks (tests/server/routes/rivers-screening.test.ts checks its order); the page shows its pages as they come.
const RANKED = [
  lease('c', 'FB-SEVERE', 'severe', 31, 0),
  lease('d', 'FB-HIGH-CHANCE', 'high', 12, 0.2),
  lease('e', 'FB-TWO-RIVERS', 'moderate', 2.5, 0.0396),
  lease('f', 'FB-PENDING', null, null, null, 'high'),
  lease('g', 'FB-FAR', null, null, null, null),
];
/** 60 leases in all: the first page holds the five above and twenty more. */
const TOTAL = 60;
const requested: URL[] = [];
/** How many leases the mocked server holds now (leases can be deleted between two pages). */
let serverTotal = TOTAL;

beforeEach(() => {
  requested.length = 0;
  serverTotal = TOTAL;
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      const u = new URL(url, 'http://localhost');
      requested.push(u);
      const path = u.pathname;
      const offset = Number(u.searchParams.get('offset') ?? 0);
      const body =
        path === '/api/v1/account/me'
          ? { id: 'u', email: 'grower@brackline.test', name: 'Ida', role: 'grower' }
          : path === '/api/v1/leases'
            ? {
                total: serverTotal,
                items: Array.from({ length: Math.max(0, Math.min(25, serverTotal - offset)) }, (_, k) =>
                  offset + k < RANKED.length ? RANKED[offset + k] : lease(`x${offset + k}`, `FB-L${offset + k}`, 'low', 0.1, 0.001),
                ),
              }
            : path === '/api/v1/overview/closures'
              ? { distanceM: 5000, items: [] }
              : { items: [] };
      return new Response(JSON.stringify(body), { status: 200, headers: { 'Content-Type': 'application/json' } });
    }),
  );
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderOverview() {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <MemoryRouter>
        <OverviewPage />
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

describe('Overview', () => {
  it('shows the server’s ranking a page of 25 at a time, with the figures the rating comes from', async () => {
    renderOverview();
    const table = await screen.findByRole('table', { name: 'Leases by yearly rating' });
    const ask = requested.find((u) => u.pathname === '/api/v1/leases')!;
    expect(Object.fromEntries(ask.searchParams)).toMatchObject({ sort: 'annualRating', order: 'desc', limit: '25', offset: '0', withGeometry: 'false' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(25);
    expect(rows.slice(0, 5).map((r) => within(r).getByRole('link').textContent)).toEqual(['FB-SEVERE', 'FB-HIGH-CHANCE', 'FB-TWO-RIVERS', 'FB-PENDING', 'FB-FAR']);
    const ratingOf = (r: HTMLElement) => r.querySelector('[data-rating]')?.getAttribute('data-rating') ?? null;
    expect(rows.slice(0, 5).map(ratingOf)).toEqual(['severe', 'high', 'moderate', null, null]);
    const two = within(rows[2])
      .getAllByRole('cell')
      .map((c) => c.textContent);
    expect(two[2]).toBe('2.5 days');
    expect(two[3]).toBe('4.0% a year (about 1 year in 25)');
    expect(within(rows[3]).getByText('Being re-screened')).toBeTruthy();
    expect(within(rows[4]).getByText('Not screened by any river yet')).toBeTruthy();
    expect(screen.getByTestId('ranking-range').textContent).toBe('1–25 of 60');
    // The next page is read from the server, not sliced from a list already held.
    fireEvent.click(screen.getByRole('button', { name: 'Next 25' }));
    await waitFor(() => expect(screen.getByTestId('ranking-range').textContent).toBe('26–50 of 60'));
    expect(requested.some((u) => u.pathname === '/api/v1/leases' && u.searchParams.get('offset') === '25')).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Next 25' }));
    await waitFor(() => expect(screen.getByTestId('ranking-range').textContent).toBe('51–60 of 60'));
    expect((screen.getByRole('button', { name: 'Next 25' }) as HTMLButtonElement).disabled).toBe(true);
  });

  it('goes back to the first page when leases deleted meanwhile leave the page past the end', async () => {
    renderOverview();
    await screen.findByRole('table', { name: 'Leases by yearly rating' });
    serverTotal = 20;
    fireEvent.click(screen.getByRole('button', { name: 'Next 25' }));
    await waitFor(() => expect(screen.getByTestId('ranking-range').textContent).toBe('1–20 of 20'));
    expect(within(screen.getByRole('table', { name: 'Leases by yearly rating' })).getAllByRole('row')).toHaveLength(21);
  });

  it('says how the yearly rating is set, with the cut points and their reasons', async () => {
    renderOverview();
    await screen.findByRole('table', { name: 'Leases by yearly rating' });
    expect(screen.getByText('How the yearly rating is set')).toBeTruthy();
    const cuts = within(screen.getByRole('list', { name: 'Yearly rating cut points' }))
      .getAllByRole('listitem')
      .map((li) => li.textContent);
    expect(cuts[0]).toMatch(/^Severe: 30 or more closure days a year, or a chance a year of 0.5 \(1 year in 2\) or more/);
    expect(cuts[1]).toMatch(/^High: 10 or more closure days a year, or a chance a year of 0.2 \(1 year in 5\) or more/);
    expect(cuts[2]).toMatch(/^Moderate: 2 or more closure days a year, or a chance a year of 0.05 \(1 year in 20\) or more/);
    expect(cuts[3]).toBe('Low: fewer than 2 closure days a year and a chance under 0.05 (1 year in 20).');
    expect(screen.getByText(/conditionally approved areas/)).toBeTruthy();
    expect(screen.getByText(/common practice for screening, not regulatory values/)).toBeTruthy();
    // ui.md: never "safe".
    await waitFor(() => expect(document.body.textContent).not.toMatch(/\bsafe\b/i));
  });
});
