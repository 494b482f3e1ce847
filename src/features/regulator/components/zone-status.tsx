import { ZONE_STATUS_LABEL, type ZoneStatus } from '#shared/schemas/zones';

/** Status in words first; colour and outline only as second cues (no red/green pair). */
const STYLE: Record<ZoneStatus, string> = {
  open: 'border border-estuary-700 bg-white text-estuary-900',
  closed: 'border border-deep-900 bg-deep-900 text-white',
  'reopening-pending': 'border border-dashed border-deep-700 bg-sand-100 text-deep-900',
};

export function ZoneStatusBadge({ status }: { status: ZoneStatus }) {
  return <span className={`inline-block rounded px-2 py-0.5 text-xs font-semibold ${STYLE[status]}`}>{ZONE_STATUS_LABEL[status]}</span>;
}

export function fmtWhen(iso: string | null | undefined): string {
  if (!iso) return '—';
  return new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}
