// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { Calibration } from '../../../../shared/schemas/monitoring';
import { CalibrationResult } from '../../../../src/features/calibration/components/calibration-panel';
import { RowProblemsTable } from '../../../../src/features/calibration/components/upload-panel';

const skill = (rmse: number, skillScore: number) => ({
  salinity: { n: 40, censored: 0, censoredMet: 0, bias: 0.1, rmse, skill: skillScore, indexOfAgreement: 0.9 },
  indicator: { n: 36, censored: 4, censoredMet: 3, bias: 0.2, rmse, skill: skillScore, indexOfAgreement: 0.8 },
  n: 40,
  censored: 4,
});

const BASE: Calibration = {
  id: 'c1',
  riverId: 'r1',
  createdAt: '2026-12-02T06:00:00.000Z',
  createdBy: 'u1',
  status: 'fitted',
  options: { lagDays: 1, fitAlongshoreShare: false, fitNearFieldFraction: true },
  fittedNames: ['entrainmentCoefficient', 't90Hours', 'nearFieldFreshwaterFraction'],
  start: { entrainmentCoefficient: 3e-5, t90Hours: 13.33, alongshoreShare: 0.6, nearFieldFreshwaterFraction: 0.5 },
  fitted: { entrainmentCoefficient: 7.2e-5, t90Hours: 27.3, alongshoreShare: 0.6, nearFieldFreshwaterFraction: 0.09 },
  settingsPatch: { entrainmentCoefficient: 7.2e-5, t90DayHours: 16.4, t90NightHours: 81.9, nearFieldFreshwaterFraction: 0.09 },
  previous: null,
  before: skill(10, -42),
  after: skill(1.3, 0.25),
  samples: 40,
  years: 2,
  flowRange: { min: 27, max: 752 },
  converged: true,
  cautions: [
    'Rests on 40 samples over 2 years, at flows from 27 m³/s to 752 m³/s.',
    'The model predicts; the authority decides on closures and classification.',
  ],
  appliedAt: null,
  rolledBackAt: null,
  canApply: true,
};

function show(c: Calibration) {
  render(
    <QueryClientProvider client={new QueryClient()}>
      <CalibrationResult calibration={c} riverName="Amberlin River" />
    </QueryClientProvider>,
  );
}

afterEach(cleanup);

describe('CalibrationResult', () => {
  it('shows before and after side by side in plain words, with the cautions and an apply button', () => {
    show(BASE);
    const values = screen.getByRole('table', { name: 'Settings before and after the fit' });
    expect(within(values).getByRole('row', { name: /Entrainment coefficient 3.00e-5 7.20e-5/ })).toBeTruthy();
    expect(within(values).getByRole('row', { name: /Share carried alongshore 0.60 kept/ })).toBeTruthy();
    expect(screen.getByText(/Applying writes entrainment coefficient 7.20e-5, T90 by day 16.4 h, T90 by night 81.9 h/)).toBeTruthy();
    expect(screen.getByText('Rests on 40 samples over 2 years, at flows from 27 m³/s to 752 m³/s.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Apply to Amberlin River' })).toBeTruthy();
    expect(screen.queryByText(/\bsafe\b/i)).toBeNull();
  });

  it('without the right to apply, says who can; once applied, offers the rollback and names what it replaced', () => {
    show({ ...BASE, canApply: false });
    expect(screen.queryByRole('button', { name: /Apply/ })).toBeNull();
    expect(screen.getByText(/Only the river’s creator, a regulator of its jurisdiction or an admin can apply/)).toBeTruthy();
    cleanup();
    show({
      ...BASE,
      status: 'applied',
      previous: { entrainmentCoefficient: 3e-5, t90DayHours: 8, t90NightHours: 40, nearFieldFreshwaterFraction: 0.5 },
    });
    expect(screen.getByRole('button', { name: 'Roll back to the previous values' })).toBeTruthy();
    expect(screen.getByText(/Replaced: entrainment coefficient 3.00e-5, T90 by day 8.0 h/)).toBeTruthy();
  });
});

describe('RowProblemsTable', () => {
  it('lists each problem with its row and column', () => {
    render(
      <RowProblemsTable
        label="Problems"
        problems={[
          { row: 3, column: 'salinity', message: 'Salinity 52 is outside 0–45 psu.' },
          { row: 7, message: 'The row has neither a salinity nor an indicator value.' },
        ]}
      />,
    );
    const rows = within(screen.getByRole('table', { name: 'Problems' })).getAllByRole('row');
    expect(rows.map((r) => r.textContent)).toEqual([
      'RowColumnWhat is wrong',
      '3salinitySalinity 52 is outside 0–45 psu.',
      '7—The row has neither a salinity nor an indicator value.',
    ]);
  });
});
