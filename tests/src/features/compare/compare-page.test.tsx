// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ComparePage } from '../../../../src/features/compare/components/compare-page';

// Yearly figures as the server gives them; ratings from the issue #14 cut points (30/10/2 days, 0.5/0.2/0.05 a year).
const lease = (
  id: string,
  leaseId: string,
  annualRating: string | null,
  closureDaysPerYear: number | null,
  harmfulSalinityChancePerYear: number | null,
) => ({
  id,
  leaseId,
  holder: 'Saltreed Oysters',
  species: 'pacific-oyster',
  status: 'held',
  notes: null,
  ownerId: 'u',
  ownerName: null,
  areaM2: 90_000,
  onLand: false,
  importId: null,
  worstRating: 'severe',
  expectedDaysPerYear: 1,
  probabilityAnyExposure: 0.5,
  annualRating,
  closureDaysPerYear,
  harmfulSalinityChancePerYear,
  createdAt: '',
  updatedAt: '',
});
const LEASES = {
  items: [
    lease('a', 'FB-A', 'low', 0.2, 0),
    lease('b', 'FB-B', 'high', 4, 0.2),
    lease('c', 'FB-C', 'high', 11, 0),
    lease('d', 'FB-D', 'severe', 0, 0.5),
  ],
  total: 4,
};

beforeEach(() => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      const u = new URL(url, 'http://localhost');
      const body = u.pathname === '/api/v1/leases' ? LEASES : { items: [], total: 0 };
      return new Response(JSON.stringify(body), { status: 200, headers: { 'Content-Type': 'application/json' } });
    }),
  );
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('Compare', () => {
  it('puts the chosen sites side by side, worst yearly rating first, then closure days, with how the rating is set', async () => {
    const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <MemoryRouter initialEntries={['/compare?ids=a,b,c,d']}>
          <ComparePage />
        </MemoryRouter>
      </QueryClientProvider>,
    );
    const table = await screen.findByRole('table', { name: 'Leases compared' });
    const heads = within(table)
      .getAllByRole('columnheader')
      .slice(1)
      .map((h) => within(h).getByRole('link').textContent);
    // FB-D Severe; FB-C High with 11 closure days before FB-B High with 4; FB-A Low.
    expect(heads).toEqual(['FB-D', 'FB-C', 'FB-B', 'FB-A']);
    const yearly = within(table).getByRole('rowheader', { name: 'Yearly rating' }).closest('tr')!;
    expect([...yearly.querySelectorAll('[data-rating]')].map((b) => b.getAttribute('data-rating'))).toEqual([
      'severe',
      'high',
      'high',
      'low',
    ]);
    expect(yearly.textContent).toContain('11 days closed a year');
    expect(screen.getByText('How the yearly rating is set')).toBeTruthy();
    expect(within(screen.getByRole('list', { name: 'Yearly rating cut points' })).getAllByRole('listitem')[1].textContent).toMatch(
      /^High: 10 or more closure days a year, or a chance a year of 0.2 \(1 year in 5\) or more/,
    );
  }, 20_000);
});
