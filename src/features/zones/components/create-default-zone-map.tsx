import { useState } from 'react';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useCreateZoneMap } from '../api/create-zone-map';
import { basicsProblem, type ZoneMapBasics } from './zone-map-basics';

/** A zone map with one default zone over the whole field, to split and draw on. */
export function CreateDefaultZoneMap({
  fieldId,
  basics,
  onCreated,
}: {
  fieldId: string;
  basics: ZoneMapBasics;
  onCreated: (m: ZoneMap) => void;
}) {
  const create = useCreateZoneMap();
  const [problem, setProblem] = useState<string | null>(null);
  const submit = () => {
    const missing = basicsProblem(basics);
    setProblem(missing);
    if (!missing)
      create.mutate({ fieldId, seasonId: basics.seasonId, name: basics.name }, { onSuccess: onCreated });
  };
  return (
    <div className="space-y-3">
      <p className="max-w-2xl text-sm text-ink-soft">
        The zone map starts as one default zone covering the whole boundary. Then draw zones on it, split it
        by lines, and set each zone's class or productivity index.
      </p>
      {problem ? <Notice tone="danger">{problem}</Notice> : null}
      {create.isError ? (
        <Notice tone="danger" title="The zone map was not created">
          <ProblemList error={create.error} />
        </Notice>
      ) : null}
      <Button variant="primary" busy={create.isPending} onClick={submit}>
        Create the zone map
      </Button>
    </div>
  );
}
