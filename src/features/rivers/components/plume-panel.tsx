import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { PlumeResult } from '#shared/physics/compute-plume';
import { type PlumeProfiles, plumeProfiles, type RiverPlumeSettings, riverPlume } from '#shared/physics/river-plume';
import type { Scenario } from '#shared/schemas/river';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { LoadError, Loading } from '../../../components/ui/states';
import { fmtNumber } from '../../../lib/format';
import { riverKeys } from '../api/rivers-api';

const REGIME: Record<PlumeResult['regime'], string> = {
  'surface-advected': 'Surface-advected (floats clear of the bed)',
  intermediate: 'Intermediate (touches the bed near the coast)',
  'bottom-advected': 'Bottom-advected (held against the bed)',
  'equatorial-jet': 'Near the equator: radial spread, no coastal current',
};

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };
/** Scientific notation for very small numbers, e.g. 9.597 × 10⁻⁵. */
const sci = (v: number, digits: number, unit: string) => {
  const [m, e] = v.toExponential(digits - 1).split('e');
  const exp = String(Number(e)).replace(/./g, (c) => SUPERSCRIPT[c] ?? c);
  return `${m} × 10${exp}${unit ? ` ${unit}` : ''}`;
};
const fmt = (v: number | null | undefined, digits: number, unit: string) => (v === undefined || v === null || !Number.isFinite(v) ? '—' : `${v.toLocaleString('en', { maximumSignificantDigits: digits })}${unit ? ` ${unit}` : ''}`);

/** The rows of the numbers table: label, symbol, value and where it comes from. */
function rows(p: PlumeResult): { key: string; label: string; value: string; source: string }[] {
  return [
    { key: 'g', label: 'Reduced gravity g′', value: fmt(p.reducedGravity, 4, 'm/s²'), source: 'EOS-80 densities of river and sea water' },
    { key: 'f', label: 'Coriolis parameter f', value: sci(p.coriolis, 4, 's⁻¹'), source: 'f = 2Ω sin(latitude)' },
    { key: 'regime', label: 'Regime', value: REGIME[p.regime], source: 'Yankovsky & Chapman (1997)' },
    { key: 'ys', label: 'Bulge offshore extent y_s', value: fmt(p.bulgeOffshoreExtent / 1000, 3, 'km'), source: 'Yankovsky & Chapman (1997)' },
    { key: 'H0', label: 'Coastal current depth H0', value: fmt(p.depth, 3, 'm'), source: 'Geostrophic transport, zero potential vorticity' },
    { key: 'W0', label: 'Coastal current width W0', value: fmt(p.width / 1000, 3, 'km'), source: 'Zero-PV geostrophic current' },
    { key: 'U0', label: 'Mean current speed U0', value: fmt(p.meanSpeed, 3, 'm/s'), source: 'Zero-PV geostrophic current' },
    { key: 'cp', label: 'Nose speed c_p', value: fmt(p.noseSpeed, 3, 'm/s'), source: p.slopeWidth ? 'Lentz & Helfrich (2002), sloping shelf' : 'Lentz & Helfrich (2002), wall limit' },
    { key: 'reach', label: 'Reach along the coast', value: p.reach === undefined ? '—' : fmt(p.reach / 1000, 3, 'km'), source: 'Nose speed × flood duration' },
  ];
}

function CrossShoreChart({ profiles }: { profiles: PlumeProfiles }) {
  return (
    <figure className="m-0" aria-label="Cross-shore profile: thickness and salinity against distance from the coast">
      <figcaption className="mb-1 text-sm font-semibold">Across the coastal current, {fmtNumber(profiles.sectionAlongKm, 1)} km downcoast of the mouth</figcaption>
      <div style={{ height: 260 }} data-testid="cross-shore-chart">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={profiles.crossShore} margin={{ top: 8, right: 28, bottom: 28, left: 8 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis dataKey="offshoreKm" type="number" domain={[0, 'dataMax']} fontSize={11} tickFormatter={(v: number) => fmtNumber(v, 1)} label={{ value: 'Distance from the coast (km)', position: 'insideBottom', offset: -16, fontSize: 11 }} />
            <YAxis yAxisId="h" fontSize={11} reversed tickFormatter={(v: number) => v.toLocaleString('en', { maximumSignificantDigits: 2 })} label={{ value: 'Thickness (m, downward)', angle: -90, position: 'insideLeft', fontSize: 11, dy: 60 }} />
            <YAxis yAxisId="s" orientation="right" width={60} fontSize={11} domain={[0, 'auto']} label={{ value: 'Salinity (psu)', angle: 90, position: 'insideRight', fontSize: 11, dy: -40 }} />
            <Tooltip labelFormatter={(v) => `${fmtNumber(Number(v), 2)} km from the coast`} formatter={(v, name) => [fmtNumber(v as number, 2), name]} />
            <Legend verticalAlign="top" height={24} wrapperStyle={{ fontSize: 12 }} />
            <Line yAxisId="h" dataKey="thickness" name="Fresh layer thickness (m)" stroke="#173d61" strokeWidth={2} dot={false} isAnimationActive={false} />
            <Line yAxisId="s" dataKey="salinity" name="Surface salinity (psu)" stroke="#9c7a3f" strokeDasharray="6 3" strokeWidth={2} dot={false} isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

function AlongshoreChart({ profiles }: { profiles: PlumeProfiles }) {
  const data = profiles.alongshore.map((p) => ({ ...p, indicator: p.indicator > 0.01 ? p.indicator : null }));
  return (
    <figure className="m-0" aria-label="Alongshore profile: salinity and indicator against distance from the mouth">
      <figcaption className="mb-1 text-sm font-semibold">Along the coast from the mouth (at the shore)</figcaption>
      <div style={{ height: 260 }} data-testid="alongshore-chart">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 8, right: 28, bottom: 28, left: 8 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis dataKey="alongKm" type="number" domain={[0, 'dataMax']} fontSize={11} tickFormatter={(v: number) => fmtNumber(v, 0)} label={{ value: 'Distance downcoast from the mouth (km)', position: 'insideBottom', offset: -16, fontSize: 11 }} />
            <YAxis yAxisId="s" fontSize={11} domain={[0, 'auto']} label={{ value: 'Salinity (psu)', angle: -90, position: 'insideLeft', fontSize: 11, dy: 40 }} />
            <YAxis yAxisId="c" orientation="right" scale="log" domain={['auto', 'auto']} allowDataOverflow fontSize={11} width={70} tickFormatter={(v: number) => v.toLocaleString('en', { maximumSignificantDigits: 2 })} label={{ value: 'per 100 mL', angle: 90, position: 'insideRight', fontSize: 11, dy: -30 }} />
            <Tooltip labelFormatter={(v) => `${fmtNumber(Number(v), 1)} km from the mouth`} formatter={(v, name) => [fmtNumber(v as number, 1), name]} />
            <Legend verticalAlign="top" height={24} wrapperStyle={{ fontSize: 12 }} />
            <Line yAxisId="s" dataKey="salinity" name="Salinity (psu)" stroke="#9c7a3f" strokeWidth={2} dot={false} isAnimationActive={false} />
            <Line yAxisId="c" dataKey="indicator" name="Faecal indicator (per 100 mL, log scale)" stroke="#4f1a3f" strokeDasharray="4 3" strokeWidth={2} dot={false} isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

/**
 * The plume numbers of one scenario: as saved (computed by the server) and, while the settings
 * form holds unsaved changes, as they would be (the same engine, in the browser).
 */
export function PlumePanel({ scenario, preview }: { scenario: Scenario; preview: RiverPlumeSettings | null }) {
  const saved = useQuery(riverKeys.plume(scenario.id));
  const previewed = useMemo(() => {
    if (!preview) return null;
    try {
      const { plume, params } = riverPlume(preview, { discharge: scenario.discharge, durationHours: scenario.durationHours });
      return { plume, profiles: plumeProfiles(plume, params) };
    } catch (err) {
      return { error: (err as Error).message };
    }
  }, [preview, scenario]);

  if (saved.isPending) return <Loading what="Computing the plume…" />;
  if (saved.isError) return <LoadError error={saved.error} retry={() => saved.refetch()} />;
  const savedRows = rows(saved.data.plume);
  const previewPlume = previewed && 'plume' in previewed ? previewed.plume : null;
  const previewRows = previewPlume ? rows(previewPlume) : null;
  const shown = previewPlume ?? saved.data.plume;
  const profiles = (previewed && 'profiles' in previewed ? previewed.profiles : undefined) ?? saved.data.profiles;
  return (
    <div className="space-y-4" data-testid="plume-panel">
      <p className="text-sm text-shell-700">
        {scenario.name}: {fmtNumber(scenario.discharge, 0)} m³/s for {fmtNumber(scenario.durationHours, 0)} hours. The plume turns{' '}
        {shown.turnsTo === 'right' ? 'to the right of the outflow (looking seaward)' : shown.turnsTo === 'left' ? 'to the left of the outflow (looking seaward)' : 'neither way'}.
      </p>
      {previewed && 'error' in previewed && <Notice tone="problem" title="Your changes cannot be previewed">{previewed.error}</Notice>}
      <div className="grid gap-4 xl:grid-cols-[3fr_2fr]">
        <table className="w-full border-collapse bg-white text-sm tabular-nums" data-testid="plume-numbers">
          <caption className="p-2 text-left font-semibold text-deep-900">The plume’s numbers</caption>
          <thead>
            <tr className="border-b border-shell-300 text-left">
              <th scope="col" className="p-2">Quantity</th>
              <th scope="col" className="p-2">Saved settings</th>
              {previewRows && <th scope="col" className="bg-sand-100 p-2">With your unsaved changes</th>}
              <th scope="col" className="p-2">Source</th>
            </tr>
          </thead>
          <tbody>
            {savedRows.map((r, i) => (
              <tr key={r.key} className="border-t border-shell-100">
                <th scope="row" className="p-2 text-left font-semibold">{r.label}</th>
                <td className="p-2" data-testid={`saved-${r.key}`}>{r.value}</td>
                {previewRows && (
                  <td className={`bg-sand-100 p-2 ${previewRows[i].value !== r.value ? 'font-semibold' : ''}`} data-testid={`preview-${r.key}`}>
                    {previewRows[i].value}
                  </td>
                )}
                <td className="p-2 text-xs text-shell-700">{r.source}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <div className="space-y-3">
          {shown.warnings.length > 0 ? (
            <Notice tone="problem" title="Assumptions these inputs break">
              <ul className="list-disc pl-5">
                {shown.warnings.map((w) => (
                  <li key={w}>{w}</li>
                ))}
              </ul>
            </Notice>
          ) : (
            <Notice tone="info" title="Assumptions these inputs break">
              <p>None of the model’s checks is tripped by these inputs. The general assumptions below still hold.</p>
            </Notice>
          )}
          <details className="rounded-lg border border-sand-200 bg-white p-3 text-sm">
            <summary className="cursor-pointer font-semibold">Assumptions behind every number</summary>
            <ul className="mt-2 list-disc pl-5">
              {shown.assumptions.map((a) => (
                <li key={a}>{a}</li>
              ))}
            </ul>
          </details>
          <Cautions compact />
        </div>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <CrossShoreChart profiles={profiles} />
        <AlongshoreChart profiles={profiles} />
      </div>
      {previewRows && <p className="text-xs text-shell-700">The charts show your unsaved changes. Save the settings to keep them; the server then recomputes and re-screens the leases.</p>}
    </div>
  );
}
