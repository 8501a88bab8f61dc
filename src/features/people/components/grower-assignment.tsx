import { Controller, type Control, type FieldErrors } from 'react-hook-form';
import type { Role } from '@shared/schemas/auth.schema';
import { FormField } from '@/components/ui/form-field';
import { recordOptions, Select } from '@/components/ui/input';

export type GrowerOption = { id: string; name: string };

type AssignmentValues = { role: Role; growerId?: string | null; growerIds?: string[] };

/**
 * Which growers a person sees: a farmer belongs to one grower, a consultant reads the growers ticked here.
 * Admins and agronomists see every grower of the workspace, so nothing is asked for them.
 */
export function GrowerAssignment<T extends AssignmentValues>({
  role,
  control,
  errors,
  growers,
}: {
  role: Role;
  control: Control<T>;
  errors: FieldErrors<T>;
  growers: GrowerOption[];
}) {
  const c = control as unknown as Control<AssignmentValues>;
  const e = errors as FieldErrors<AssignmentValues>;
  if (role === 'farmer') {
    return (
      <Controller
        control={c}
        name="growerId"
        render={({ field }) => (
          <FormField
            label="Grower"
            error={e.growerId?.message}
            hint="A farmer sees this grower's fields, planters and prescriptions only."
          >
            <Select
              value={field.value ?? ''}
              onChange={(ev) => field.onChange(ev.target.value || null)}
              onBlur={field.onBlur}
              ref={field.ref}
              placeholder="Choose a grower"
              options={recordOptions(growers)}
            />
          </FormField>
        )}
      />
    );
  }
  if (role === 'consultant') {
    return (
      <Controller
        control={c}
        name="growerIds"
        render={({ field }) => {
          const chosen = new Set(field.value ?? []);
          const toggle = (id: string, on: boolean) => {
            const next = new Set(chosen);
            if (on) next.add(id);
            else next.delete(id);
            field.onChange(growers.map((g) => g.id).filter((gid) => next.has(gid)));
          };
          return (
            <fieldset>
              <legend className="text-sm font-medium">Growers this consultant reads</legend>
              <p className="mb-1.5 text-xs text-ink-soft">A consultant sees only the growers ticked here.</p>
              {growers.length === 0 ? (
                <p className="text-sm text-ink-faint">No growers yet.</p>
              ) : (
                <div className="grid max-h-56 gap-1 overflow-auto rounded-card border border-ink-line bg-paper-raised p-2 sm:grid-cols-2">
                  {growers.map((g) => (
                    <label key={g.id} className="flex items-center gap-2 text-sm">
                      <input
                        type="checkbox"
                        className="size-4 accent-clay-600"
                        checked={chosen.has(g.id)}
                        onChange={(ev) => toggle(g.id, ev.target.checked)}
                        onBlur={field.onBlur}
                      />
                      {g.name}
                    </label>
                  ))}
                </div>
              )}
              {e.growerIds?.message ? (
                <p className="mt-1 text-xs font-medium text-danger">{e.growerIds.message}</p>
              ) : null}
            </fieldset>
          );
        }}
      />
    );
  }
  return (
    <p className="text-sm text-ink-soft">
      {role === 'admin' ? 'An admin' : 'An agronomist'} sees every grower of the workspace.
    </p>
  );
}

/** Keeps only the assignment that fits the role before sending. */
export function assignmentFor(
  role: Role,
  growerId: string | null | undefined,
  growerIds: string[] | undefined,
) {
  if (role === 'farmer') return { growerId: growerId ?? null, growerIds: [] };
  if (role === 'consultant') return { growerId: null, growerIds: growerIds ?? [] };
  return { growerId: null, growerIds: [] };
}
