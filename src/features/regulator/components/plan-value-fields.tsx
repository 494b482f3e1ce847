import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import { TextField } from '../../../components/ui/text-field';

/** The three numbers of a zone's management plan, as both the zone page and the draw form ask for them. */
export interface PlanNumbers {
  triggerFlow?: number | null;
  minClosureDays?: number | null;
  indicatorStandard?: number | null;
}

/** An empty box means "not set" (null), not zero. */
export const numberOrNull = (v: unknown) => (v === '' || v == null ? null : Number(v));

export function PlanValueFields({
  register,
  errors,
  standardHint,
}: {
  register: UseFormRegister<PlanNumbers>;
  errors: FieldErrors<PlanNumbers>;
  standardHint?: string;
}) {
  return (
    <>
      <TextField
        label="Trigger flow (m³/s)"
        type="number"
        step="any"
        {...register('triggerFlow', { setValueAs: numberOrNull })}
        error={errors.triggerFlow?.message}
      />
      <TextField
        label="Minimum closure (days)"
        type="number"
        step="any"
        {...register('minClosureDays', { setValueAs: numberOrNull })}
        error={errors.minClosureDays?.message}
      />
      <TextField
        label="Indicator standard (per 100 mL)"
        type="number"
        step="any"
        hint={standardHint}
        {...register('indicatorStandard', { setValueAs: numberOrNull })}
        error={errors.indicatorStandard?.message}
      />
    </>
  );
}
