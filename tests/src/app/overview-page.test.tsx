// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { OverviewPage } from '../../../src/app/routes/overview-page';

const item = (
  leaseId: string,
  leaseCode: string,
  riverName: string,
  closureDaysPerYear: number | null,
  harmfulSalinityChancePerYear: number | null,
) => ({
  leaseId,
  leaseCode,
  riverId: riverName,
  riverName,
  expectedDaysPerYear: 1,
  probabilityAnyExposure: 0.1,
  indicatorDaysPerYear: closureDaysPerYear,
  probabilityIndicatorAboveStandard: 0.1,
  worstRating: 'severe',
  closureDaysPerYear,
  harmfulSalinityChancePerYear,
  annualRating: null, // the page rates each lease over all its rivers itself
  details: {},
});

// Hand-made figures; the expected ratings follow the issue #14 cut points (30/10/2 days, 0.5/0.2/0.05 a year).
const ANNUAL = {
  items: [
    item('a', 'FB-LOW', 'Amberlin River', 0.5, 0.01), // low
    item('b', 'FB-HIGH-DAYS', 'Amberlin River', 12, 0), // high, 12 days
    item('c', 'FB-SEVERE', 'Amberlin River', 31, 0), // severe
    item('d', 'FB-HIGH-CHANCE', 'Amberlin River', 12, 0.2), // high, 12 days, higher chance than FB-HIGH-DAYS
    // Two rivers: 1 + 1.5 closure days = 2.5 → moderate; chances 0.02 and 0.02 → 1 − 0.98² = 0.0396
    item('e', 'FB-TWO-RIVERS', 'Amberlin River', 1, 0.02),
    item('e', 'FB-TWO-RIVERS', 'Tolley Brook', 1.5, 0.02),
    item('f', 'FB-PENDING', 'Amberlin River', null, null), // stored before the yearly rating: last
  ],
};

beforeEach(() => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      const path = new URL(url, 'http://localhost').pathname;
      const body =
        path === '/api/v1/account/me'
          ? { id: 'u', email: 'grower@brackline.test', name: 'Ida', role: 'grower' }
          : path === '/api/v1/screenings/annual'
            ? ANNUAL
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
  it('ranks leases by the yearly rating, then closure days, then the chance, unrated last', async () => {
    renderOverview();
    const table = await screen.findByRole('table', { name: 'Leases by yearly rating' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows.map((r) => within(r).getByRole('link').textContent)).toEqual([
      'FB-SEVERE',
      'FB-HIGH-CHANCE',
      'FB-HIGH-DAYS',
      'FB-TWO-RIVERS',
      'FB-LOW',
      'FB-PENDING',
    ]);
    const ratingOf = (r: HTMLElement) => r.querySelector('[data-rating]')?.getAttribute('data-rating') ?? null;
    expect(rows.map(ratingOf)).toEqual(['severe', 'high', 'high', 'moderate', 'low', null]);
    // The figures the rating comes from sit beside it.
    const two = within(rows[3])
      .getAllByRole('cell')
      .map((c) => c.textContent);
    expect(two[2]).toBe('2.5 days');
    expect(two[3]).toBe('4.0% a year (about 1 year in 25)');
    expect(within(rows[5]).getByText('Being re-screened')).toBeTruthy();
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
