import { useState } from 'react';
import {
  EXPORT_FORMAT_LABELS,
  EXPORT_LAYOUTS,
  PRESCRIPTION_EXPORT_FORMATS,
  type Prescription,
} from '@shared/schemas/prescription.schema';
import { buttonClass } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Segmented } from '@/components/ui/segmented';

type Layout = (typeof EXPORT_LAYOUTS)[number];

const LAYOUTS: { value: Layout; label: string }[] = [
  { value: 'zones', label: 'Zones (polygons)' },
  { value: 'grid', label: 'Grid of square cells' },
];

/** A grid cell size the server takes: 2 to 100 m (shared/schemas/prescription.schema.ts). */
const cellProblem = (v: number) =>
  !Number.isFinite(v) ? 'Type the cell size in metres' : v < 2 || v > 100 ? 'Between 2 and 100 m' : null;

/**
 * Downloads of an approved (or replaced) version: GeoJSON, a zipped shapefile or ISO 11783-10 task data,
 * as the zones themselves or as a grid of square cells. Plain links: the browser saves what the server
 * names.
 */
export function ExportPanel({ prescription: p }: { prescription: Prescription }) {
  const [layout, setLayout] = useState<Layout>('zones');
  const [cellText, setCellText] = useState('10');
  const cell = Number(cellText);
  const problem = layout === 'grid' ? cellProblem(cell) : null;
  const href = (format: string) => {
    const q = new URLSearchParams({ format, layout });
    if (layout === 'grid') q.set('cellSizeM', String(cell));
    return `/api/prescriptions/${encodeURIComponent(p.id)}/export?${q.toString()}`;
  };
  return (
    <div className="space-y-3">
      {p.status === 'superseded' ? (
        <p className="text-sm text-caution">
          This version has been replaced by a newer approved one: export that one for planting.
        </p>
      ) : null}
      <div className="flex flex-wrap items-end gap-4">
        <div className="flex flex-col gap-1">
          <span className="text-sm font-medium text-ink">Layout</span>
          <Segmented<Layout> label="Layout" value={layout} options={LAYOUTS} onChange={setLayout} />
        </div>
        {layout === 'grid' ? (
          <FormField label="Cell size" unit="m" error={problem ?? undefined} className="w-32">
            <Input
              type="number"
              min={2}
              max={100}
              value={cellText}
              onChange={(e) => setCellText(e.target.value)}
            />
          </FormField>
        ) : null}
      </div>
      <div className="flex flex-wrap gap-2" role="group" aria-label="Downloads">
        {PRESCRIPTION_EXPORT_FORMATS.map((f) =>
          problem ? (
            <span
              key={f}
              className={buttonClass('secondary', 'md', 'pointer-events-none opacity-55')}
              aria-disabled
            >
              {EXPORT_FORMAT_LABELS[f]}
            </span>
          ) : (
            <a key={f} className={buttonClass('secondary', 'md')} href={href(f)} download>
              {EXPORT_FORMAT_LABELS[f]}
            </a>
          ),
        )}
      </div>
      <p className="text-xs text-ink-soft">
        Load the file into the planter&apos;s display as its manual describes, and check the rates it shows
        before planting.
      </p>
    </div>
  );
}
