import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { MAX_NOTE_CHARS, noteCreateSchema } from '#shared/schemas/sharing';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { ROLE_LABEL } from '../../../config/navigation';
import { addLeaseNote, leaseNoteKeys } from '../api/lease-notes-api';

type NoteForm = z.input<typeof noteCreateSchema>;

const when = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** "Adviser notes": what the holder and the advisers a lease is shared with have written about it, newest first. */
export function LeaseNotes({ leaseId, canWrite }: { leaseId: string; canWrite: boolean }) {
  const queryClient = useQueryClient();
  const notes = useQuery(leaseNoteKeys.list(leaseId));
  const form = useForm<NoteForm, unknown, z.output<typeof noteCreateSchema>>({
    resolver: zodResolver(noteCreateSchema),
    defaultValues: { body: '' },
  });
  const add = useMutation({
    mutationFn: (v: z.output<typeof noteCreateSchema>) => addLeaseNote(leaseId, v),
    onSuccess: () => {
      form.reset({ body: '' });
      void queryClient.invalidateQueries({ queryKey: leaseNoteKeys.list(leaseId).queryKey });
    },
  });
  const fieldId = useId();
  const error = form.formState.errors.body?.message;

  return (
    <section aria-labelledby="notes-title" className="space-y-3 break-inside-avoid">
      <h2 id="notes-title" className="font-semibold text-deep-900">
        Adviser notes
      </h2>
      {notes.isPending ? (
        <Loading what="Loading notes…" />
      ) : notes.isError ? (
        <LoadError error={notes.error} retry={() => notes.refetch()} />
      ) : notes.data.items.length === 0 ? (
        <Empty title="No notes yet">
          {canWrite ? 'Write the first one below.' : 'Notes written by the holder and the advisers this lease is shared with appear here.'}
        </Empty>
      ) : (
        <ol className="space-y-2" aria-label="Notes, newest first">
          {notes.data.items.map((n) => (
            <li key={n.id} className="rounded-md border border-sand-200 bg-white p-3">
              <p className="text-xs text-shell-700">
                <span className="font-semibold text-shell-900">{n.author.name ?? 'Someone'}</span> · {ROLE_LABEL[n.author.role]} ·{' '}
                <time dateTime={n.createdAt}>{when(n.createdAt)}</time>
              </p>
              <p className="mt-1 whitespace-pre-wrap text-sm">{n.body}</p>
            </li>
          ))}
        </ol>
      )}
      {canWrite && (
        <form className="no-print space-y-2" noValidate onSubmit={form.handleSubmit((v) => add.mutate(v))}>
          <label htmlFor={fieldId} className="block text-sm font-semibold">
            Add a note
          </label>
          <textarea
            id={fieldId}
            rows={3}
            maxLength={MAX_NOTE_CHARS}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${fieldId}-error` : undefined}
            className={`w-full rounded-md border bg-white px-3 py-2 text-sm ${error ? 'border-[#8a3b12]' : 'border-shell-300'}`}
            {...form.register('body')}
          />
          {error && (
            <p id={`${fieldId}-error`} role="alert" className="text-sm font-semibold text-[#8a3b12]">
              {error}
            </p>
          )}
          <Button type="submit" disabled={add.isPending}>
            {add.isPending ? 'Saving the note…' : 'Save note'}
          </Button>
          {add.isError && <Notice tone="problem">{(add.error as Error).message}</Notice>}
        </form>
      )}
    </section>
  );
}
