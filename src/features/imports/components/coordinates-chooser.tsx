import { useState } from 'react';
import { chooseCoordinatesSchema, type ImportPreview } from '@shared/schemas/import.schema';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { formatNumber } from '@/lib/format';
import { useChooseCoordinates } from '../api/choose-coordinates';
import { ProblemList } from '@/components/form/problem-list';

const OTHER = 'other';

/**
 * A file in metres with no .prj: Sowright never guesses the coordinate system, it asks, offering the
 * likely ones the server found (UTM zones about the field) and any EPSG code.
 */
export function CoordinatesChooser({
  preview,
  onChosen,
}: {
  preview: ImportPreview;
  onChosen: (p: ImportPreview) => void;
}) {
  const coords = preview.coordinates;
  const candidates = coords.kind === 'projected' ? coords.candidates : [];
  const [choice, setChoice] = useState(candidates[0]?.code ?? OTHER);
  const [other, setOther] = useState('');
  const [typedError, setTypedError] = useState<string | null>(null);
  const choose = useChooseCoordinates();
  if (coords.kind !== 'projected') return null;
  const [x0, y0, x1, y1] = coords.bbox;

  const submit = () => {
    const code = choice === OTHER ? other.trim().toUpperCase() : choice;
    const parsed = chooseCoordinatesSchema.safeParse({ code });
    if (!parsed.success) {
      setTypedError(parsed.error.issues[0]?.message ?? 'Not an EPSG code');
      return;
    }
    setTypedError(null);
    choose.mutate({ importId: preview.id, code: parsed.data.code }, { onSuccess: onChosen });
  };

  return (
    <Notice tone="caution" title="Which coordinate system is this file in?">
      <p>
        Its positions are in metres, not longitude and latitude (x {formatNumber(x0)} to {formatNumber(x1)}, y{' '}
        {formatNumber(y0)} to {formatNumber(y1)}), and it carries no coordinate system (no .prj). Sowright
        does not guess: choose the one it was made in. If you are not sure, ask whoever made the file.
      </p>
      <fieldset className="mt-2 space-y-1 text-ink">
        <legend className="sr-only">Coordinate system</legend>
        {candidates.map((c) => (
          <label key={c.code} className="flex items-center gap-2">
            <input
              type="radio"
              name="crs"
              value={c.code}
              checked={choice === c.code}
              onChange={() => setChoice(c.code)}
              className="accent-clay-600"
            />
            <span>
              {c.label} <span className="font-mono text-ink-soft">{c.code}</span>
            </span>
          </label>
        ))}
        <label className="flex items-center gap-2">
          <input
            type="radio"
            name="crs"
            value={OTHER}
            checked={choice === OTHER}
            onChange={() => setChoice(OTHER)}
            className="accent-clay-600"
          />
          <span>Another EPSG code</span>
        </label>
      </fieldset>
      {choice === OTHER ? (
        <FormField label="EPSG code" error={typedError ?? undefined} className="mt-2 w-56">
          <Input value={other} onChange={(e) => setOther(e.target.value)} placeholder="EPSG:32615" />
        </FormField>
      ) : null}
      {choose.isError ? (
        <div className="mt-2 text-danger">
          <ProblemList error={choose.error} />
        </div>
      ) : null}
      <Button className="mt-3" variant="primary" size="sm" busy={choose.isPending} onClick={submit}>
        Use this coordinate system
      </Button>
    </Notice>
  );
}
