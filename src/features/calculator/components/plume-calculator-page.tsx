import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { computePlume, type PlumeResult } from '#shared/physics/compute-plume';
import { type PlumeRequest, PlumeRequestSchema } from '#shared/schemas/plume';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { TextField } from '../../../components/ui/text-field';

/** An invented demo river mouth, for a first look. */
const EXAMPLE: PlumeRequest = {
  latitude: 41.2,
  discharge: 650,
  riverSalinity: 0.2,
  riverTemperature: 12,
  seaSalinity: 33.5,
  seaTemperature: 11,
  mouthWidth: 900,
  mouthDepth: 5,
  shelfSlope: 0.003,
  alongshoreShare: 0.6,
  floodDurationHours: 72,
};

const FIELDS: { name: keyof PlumeRequest; label: string; unit: string; hint: string; step: string }[] = [
  { name: 'latitude', label: 'Latitude of the mouth', unit: '°', hint: 'North positive, −90 to 90.', step: '0.01' },
  { name: 'discharge', label: 'River flow', unit: 'm³/s', hint: 'The flood flow to test, above 0.', step: '1' },
  { name: 'riverSalinity', label: 'River salinity', unit: 'psu', hint: '0 to 42; river water is near 0.', step: '0.1' },
  { name: 'riverTemperature', label: 'River temperature', unit: '°C', hint: '−2 to 40.', step: '0.1' },
  { name: 'seaSalinity', label: 'Sea salinity', unit: 'psu', hint: '0 to 42; open coast is near 33–35.', step: '0.1' },
  { name: 'seaTemperature', label: 'Sea temperature', unit: '°C', hint: '−2 to 40.', step: '0.1' },
  { name: 'mouthWidth', label: 'Mouth width', unit: 'm', hint: 'Above 0.', step: '1' },
  { name: 'mouthDepth', label: 'Mouth depth', unit: 'm', hint: 'Above 0.', step: '0.1' },
  { name: 'shelfSlope', label: 'Bottom slope off the mouth', unit: 'm/m', hint: '0 to 0.5, e.g. 0.003 = 3 m per km. Leave empty if unknown.', step: '0.0001' },
  { name: 'alongshoreShare', label: 'Share of flow carried alongshore', unit: '', hint: '0.3 to 1; 0.6 by default (from memory of lab and model studies).', step: '0.05' },
  { name: 'floodDurationHours', label: 'Flood duration', unit: 'h', hint: 'How long the flood flow lasts, for the reach.', step: '1' },
];

function fmt(value: number | undefined | null, digits: number, unit: string): string {
  if (value === undefined || value === null || !Number.isFinite(value)) return '—';
  return `${value.toLocaleString(undefined, { maximumSignificantDigits: digits })}${unit ? ` ${unit}` : ''}`;
}

const REGIME_WORDS: Record<PlumeResult['regime'], string> = {
  'surface-advected': 'Surface-advected: the fresh layer floats clear of the sea bed',
  intermediate: 'Intermediate: touches the bed near the coast, floats further out',
  'bottom-advected': 'Bottom-advected: the fresh water is held against the sea bed',
  'equatorial-jet': 'Near the equator: no rotating current; a radial jet estimate instead',
};

const TURN_WORDS = { right: 'to the right of the outflow (looking seaward)', left: 'to the left of the outflow (looking seaward)', none: 'neither way (too close to the equator)' };

/** The plume model for one river and one flow, computed in the browser as you type. */
export function PlumeCalculatorPage() {
  const form = useForm<PlumeRequest>({ resolver: zodResolver(PlumeRequestSchema), mode: 'onChange', defaultValues: EXAMPLE });
  const values = useWatch({ control: form.control });
  const outcome = useMemo(() => {
    const cleaned = Object.fromEntries(Object.entries(values).filter(([, v]) => v !== undefined && v !== null && !Number.isNaN(v)));
    const parsed = PlumeRequestSchema.safeParse(cleaned);
    if (!parsed.success) return { problems: parsed.error.issues.map((i) => i.message) };
    try {
      return { result: computePlume(parsed.data) };
    } catch (err) {
      return { problems: [(err as Error).message] };
    }
  }, [values]);

  return (
    <div className="space-y-6">
      <PageHeader title="Plume calculator" question="For this river mouth and flow, how far does the flood water spread, and which way does it turn?" />
      <div className="grid gap-6 lg:grid-cols-[22rem_1fr]">
        <form className="grid gap-3 rounded-lg border border-sand-200 bg-white p-4" noValidate onSubmit={(e) => e.preventDefault()} aria-label="River and flow">
          {FIELDS.map((f) => (
            <TextField
              key={f.name}
              label={`${f.label}${f.unit ? ` (${f.unit})` : ''}`}
              type="number"
              step={f.step}
              inputMode="decimal"
              hint={f.hint}
              {...form.register(f.name, { setValueAs: (v) => (v === '' || v === null ? undefined : Number(v)) })}
              error={form.formState.errors[f.name]?.message}
            />
          ))}
        </form>
        <section aria-live="polite" aria-label="Results" className="space-y-4">
          <Cautions compact />
          {'problems' in outcome && outcome.problems ? (
            <Notice tone="problem" title="Fix these inputs to see results">
              <ul className="list-disc pl-5">
                {outcome.problems.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            </Notice>
          ) : outcome.result ? (
            <PlumeNumbers result={outcome.result} />
          ) : null}
        </section>
      </div>
    </div>
  );
}

function PlumeNumbers({ result: r }: { result: PlumeResult }) {
  const rows: [string, string, string][] = [
    ['Regime', REGIME_WORDS[r.regime], 'Yankovsky & Chapman (1997)'],
    ['Turns', TURN_WORDS[r.turnsTo], 'Rotation of the Earth (Coriolis)'],
    ['Reduced gravity g′', fmt(r.reducedGravity, 4, 'm/s²'), 'EOS-80 densities of river and sea water'],
    ['Coriolis parameter f', fmt(r.coriolis, 4, '1/s'), 'f = 2Ω sin(latitude)'],
    ['Bulge offshore extent y_s', fmt(r.bulgeOffshoreExtent / 1000, 3, 'km'), 'Yankovsky & Chapman (1997)'],
    ['Coastal current depth H0', fmt(r.depth, 3, 'm'), 'Geostrophic transport, zero-PV current'],
    ['Coastal current width W0', fmt(r.width / 1000, 3, 'km'), 'Zero-PV geostrophic current'],
    ['Mean current speed U0', fmt(r.meanSpeed, 3, 'm/s'), 'Zero-PV geostrophic current'],
    ['Nose speed', fmt(r.noseSpeed, 3, 'm/s'), r.slopeWidth ? 'Lentz & Helfrich (2002), sloping shelf' : 'Lentz & Helfrich (2002), wall limit'],
    ['Reach along the coast', r.reach === undefined ? 'give a flood duration' : fmt(r.reach / 1000, 3, 'km'), 'Nose speed × flood duration'],
  ];
  return (
    <div className="space-y-4">
      <table className="w-full border-collapse rounded-lg bg-white text-sm">
        <caption className="p-2 text-left font-semibold text-deep-900">The plume's numbers</caption>
        <tbody>
          {rows.map(([name, value, source]) => (
            <tr key={name} className="border-t border-shell-100">
              <th scope="row" className="p-2 text-left font-semibold">
                {name}
              </th>
              <td className="p-2" data-testid={`plume-${name}`}>
                {value}
              </td>
              <td className="p-2 text-xs text-shell-700">{source}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {r.warnings.length > 0 && (
        <Notice tone="problem" title="Where these numbers stretch the model">
          <ul className="list-disc pl-5">
            {r.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Notice>
      )}
      <details className="rounded-lg border border-sand-200 bg-white p-3 text-sm">
        <summary className="cursor-pointer font-semibold">Assumptions behind every number</summary>
        <ul className="mt-2 list-disc pl-5">
          {r.assumptions.map((a) => (
            <li key={a}>{a}</li>
          ))}
        </ul>
      </details>
    </div>
  );
}
