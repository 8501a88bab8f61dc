import { FormField } from '@/components/ui/form-field';
import { Input, Select } from '@/components/ui/input';

export type ZoneMapBasics = { seasonId: string; name: string };

/** What is missing before a zone map can be made, or null. */
export const basicsProblem = (b: ZoneMapBasics) =>
  !b.seasonId
    ? 'Choose the crop season the zone map is for.'
    : !b.name.trim()
      ? 'Give the zone map a name.'
      : null;

/** The crop season and name every new zone map needs, whichever way it is made. */
export function ZoneMapBasicsFields({
  seasons,
  value,
  onChange,
}: {
  seasons: { id: string; label: string }[];
  value: ZoneMapBasics;
  onChange: (v: ZoneMapBasics) => void;
}) {
  return (
    <div className="grid max-w-2xl gap-3 sm:grid-cols-2">
      <FormField
        label="Crop season"
        hint={seasons.length ? undefined : 'This field has no crop season yet: add one first.'}
      >
        <Select
          value={value.seasonId}
          onChange={(e) => onChange({ ...value, seasonId: e.target.value })}
          placeholder="Choose a crop season"
          options={seasons.map((s) => ({ value: s.id, label: s.label }))}
        />
      </FormField>
      <FormField label="Name of the zone map">
        <Input
          value={value.name}
          maxLength={120}
          onChange={(e) => onChange({ ...value, name: e.target.value })}
        />
      </FormField>
    </div>
  );
}
