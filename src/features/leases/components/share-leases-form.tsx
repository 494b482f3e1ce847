import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { type ShareForm, type ShareResult, shareFormSchema } from '#shared/schemas/sharing';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/text-field';
import { leaseKeys, shareLeases } from '../api/leases-api';

/** The bulk action "Share with an adviser": the selected leases go to one adviser's (or regulator's) account. */
export function ShareLeasesForm({ leaseIds, onShared }: { leaseIds: string[]; onShared: (result: ShareResult) => void }) {
  const queryClient = useQueryClient();
  const form = useForm<ShareForm>({ resolver: zodResolver(shareFormSchema), mode: 'onSubmit', defaultValues: { email: '' } });
  const share = useMutation({
    mutationFn: (v: ShareForm) => shareLeases({ leaseIds, email: v.email }),
    onSuccess: (result) => {
      form.reset({ email: '' });
      onShared(result);
      void queryClient.invalidateQueries({ queryKey: leaseKeys.all });
    },
  });
  const n = leaseIds.length;

  return (
    <div className="basis-full space-y-2 border-t border-deep-100 pt-2">
      <form
        className="flex flex-wrap items-end gap-2"
        aria-label="Share with an adviser"
        noValidate
        onSubmit={form.handleSubmit((v) => share.mutate(v))}
      >
        <TextField
          label="Share with an adviser: their e-mail"
          type="email"
          autoComplete="off"
          placeholder="adviser@example.org"
          hint="Their Brackline account (adviser or regulator) will see these leases and can write notes on them."
          className="min-w-72"
          {...form.register('email')}
          error={form.formState.errors.email?.message}
        />
        <Button type="submit" disabled={share.isPending || n === 0} className="mb-6">
          {share.isPending ? 'Sharing…' : `Share ${n} ${n === 1 ? 'lease' : 'leases'}`}
        </Button>
      </form>
      {share.isPending && (
        <p role="status">
          Sharing {n} {n === 1 ? 'lease' : 'leases'}…
        </p>
      )}
      {share.isError && (
        <Notice tone="problem" title="Nothing was shared">
          {(share.error as Error).message}
        </Notice>
      )}
    </div>
  );
}
