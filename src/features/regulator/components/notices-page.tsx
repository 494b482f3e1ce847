import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { useSearchParams } from 'react-router-dom';
import { z } from 'zod';
import { noticeCreateSchema, ZONE_STATUS_LABEL, type ZoneStatus } from '#shared/schemas/zones';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { fmtFlow } from '../../../lib/format';
import { issueNotice, zoneKeys } from '../api/zones-api';
import { fmtWhen, ZoneStatusBadge } from './zone-status';

const noticeFormSchema = noticeCreateSchema.extend({ flow: z.number().positive({ error: 'flow must be greater than 0 m³/s' }).optional() });
type NoticeForm = z.infer<typeof noticeFormSchema>;

/** Issue a closure or reopening notice for chosen zones; every grower with a held lease there hears about it. */
export function NoticesPage() {
  const [params] = useSearchParams();
  const queryClient = useQueryClient();
  const zones = useQuery(zoneKeys.list());
  const notices = useQuery(zoneKeys.notices());
  const preselected = params.get('zone');
  const form = useForm<NoticeForm>({
    resolver: zodResolver(noticeFormSchema),
    defaultValues: { kind: 'closure', zoneIds: preselected ? [preselected] : [], message: '' },
  });
  const issue = useMutation({
    mutationFn: (v: NoticeForm) => issueNotice({ ...v, message: v.message || undefined }),
    onSuccess: () => {
      form.reset({ kind: form.getValues('kind'), zoneIds: [], message: '' });
      void queryClient.invalidateQueries({ queryKey: zoneKeys.all });
    },
  });
  const errors = form.formState.errors;

  return (
    <div className="space-y-6">
      <PageHeader title="Notices" question="Which zones are you closing or reopening, and who will be told?" />
      <form
        aria-label="Issue a notice"
        noValidate
        className="space-y-4 rounded-lg border border-sand-200 bg-white p-4"
        onSubmit={form.handleSubmit((v) => issue.mutate(v))}
      >
        <fieldset className="flex gap-6">
          <legend className="mb-1 text-sm font-semibold">Kind of notice</legend>
          <label className="flex items-center gap-2">
            <input type="radio" value="closure" {...form.register('kind')} /> Closure
          </label>
          <label className="flex items-center gap-2">
            <input type="radio" value="reopening" {...form.register('kind')} /> Reopening
          </label>
        </fieldset>
        <fieldset>
          <legend className="mb-1 text-sm font-semibold">Zones</legend>
          {zones.isPending ? (
            <Loading what="Loading the zones…" />
          ) : zones.isError ? (
            <LoadError error={zones.error} retry={() => zones.refetch()} />
          ) : zones.data.items.length === 0 ? (
            <Empty title="No zones yet" />
          ) : (
            <ul className="space-y-1">
              {zones.data.items.map((z) => (
                <li key={z.id}>
                  <label className="flex flex-wrap items-center gap-2">
                    <input type="checkbox" value={z.id} {...form.register('zoneIds')} />
                    <span className="font-semibold">{z.name}</span>
                    <ZoneStatusBadge status={z.status} />
                    <span className="text-sm text-shell-700">
                      since {fmtWhen(z.statusSince)} · {z.heldLeases} held leases
                      {z.earliestReopening ? ` · earliest reopening ${fmtWhen(z.earliestReopening)}` : ''}
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          )}
          {errors.zoneIds && (
            <p role="alert" className="text-sm font-semibold text-[#8a3b12]">
              {errors.zoneIds.message}
            </p>
          )}
        </fieldset>
        <TextField
          label="River flow that prompted it (m³/s, optional)"
          type="number"
          step="any"
          className="max-w-72"
          {...form.register('flow', { setValueAs: (v) => (v === '' || v == null ? undefined : Number(v)) })}
          error={errors.flow?.message}
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="notice-message" className="text-sm font-semibold">
            Message to growers (optional)
          </label>
          <textarea id="notice-message" rows={3} className="rounded-md border border-shell-300 px-3 py-2" {...form.register('message')} />
        </div>
        <p className="text-sm text-shell-700">
          Every grower with a held lease in the chosen zones gets an e-mail and a message in Brackline. A reopening needs the minimum
          closure to have passed and a passing sample result entered on the zone’s page.
        </p>
        <Button type="submit" disabled={issue.isPending}>
          {issue.isPending ? 'Issuing…' : 'Issue the notice'}
        </Button>
      </form>
      {issue.isError && (
        <Notice tone="problem" title="No notice was issued">
          {(issue.error as Error).message}
        </Notice>
      )}
      {issue.isSuccess && (
        <Notice tone="done" title={`${issue.data.kind === 'closure' ? 'Closure' : 'Reopening'} notice issued`}>
          {issue.data.zones.map((z) => z.name).join(', ')}: {issue.data.recipients} growers told, {issue.data.emailsSent} e-mails sent.
        </Notice>
      )}
      <h2 className="text-lg font-semibold text-deep-900">Notices issued</h2>
      {notices.isPending ? (
        <Loading what="Loading notices…" />
      ) : notices.isError ? (
        <LoadError error={notices.error} retry={() => notices.refetch()} />
      ) : notices.data.items.length === 0 ? (
        <Empty title="No notices yet" />
      ) : (
        <table aria-label="Notices issued" className="w-full border-collapse bg-white text-sm">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Issued</th>
              <th className="p-2">Kind</th>
              <th className="p-2">Zones (status before → after)</th>
              <th className="p-2">Flow</th>
              <th className="p-2">Growers told</th>
              <th className="p-2">Message</th>
            </tr>
          </thead>
          <tbody>
            {notices.data.items.map((n) => (
              <tr key={n.id} className="border-b border-shell-100 align-top">
                <td className="p-2 whitespace-nowrap">{fmtWhen(n.issuedAt)}</td>
                <td className="p-2">{n.kind === 'closure' ? 'Closure' : 'Reopening'}</td>
                <td className="p-2">
                  {n.zones.map((z) => (
                    <span key={z.id} className="block">
                      {z.name}: {ZONE_STATUS_LABEL[z.statusBefore as ZoneStatus] ?? z.statusBefore} →{' '}
                      {ZONE_STATUS_LABEL[z.statusAfter as ZoneStatus] ?? z.statusAfter}
                    </span>
                  ))}
                </td>
                <td className="p-2 tabular-nums">{n.flow != null ? fmtFlow(n.flow) : '—'}</td>
                <td className="p-2 tabular-nums">
                  {n.recipients} ({n.emailsSent} e-mails)
                </td>
                <td className="p-2">{n.message ?? ''}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
