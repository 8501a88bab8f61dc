import { useId, useState } from 'react';
import type { ImportPreview, ImportPurpose } from '@shared/schemas/import.schema';
import { Notice } from '@/components/ui/notice';
import { useCreateImport } from '../api/create-import';
import { CoordinatesChooser } from './coordinates-chooser';
import { ProblemList } from '@/components/form/problem-list';

const ACCEPT: Record<ImportPurpose, { accept: string; words: string }> = {
  boundary: {
    accept: '.geojson,.json,.zip,.kml,.kmz',
    words: 'GeoJSON (.geojson or .json), a zipped shapefile (.zip), KML or KMZ',
  },
  zones: {
    accept: '.geojson,.json,.zip,.kml,.kmz',
    words: 'GeoJSON (.geojson or .json), a zipped shapefile (.zip), KML or KMZ',
  },
  points: {
    accept: '.csv,.geojson,.json,.zip',
    words: 'CSV with longitude and latitude columns, GeoJSON points, or a zipped shapefile of points',
  },
};

const FORMAT_WORDS: Record<ImportPreview['format'], string> = {
  geojson: 'GeoJSON',
  shapefile: 'zipped shapefile',
  kml: 'KML',
  kmz: 'KMZ',
  csv: 'CSV',
};

/**
 * Step one of every import: choose a file, send it, and, when its coordinates are projected without a
 * .prj, ask which coordinate system they are in. Calls `onReady` with the preview once positions are known.
 */
export function ImportStep({
  purpose,
  fieldId,
  preview,
  onReady,
}: {
  purpose: ImportPurpose;
  fieldId: string;
  preview: ImportPreview | null;
  onReady: (p: ImportPreview | null) => void;
}) {
  const inputId = useId();
  const upload = useCreateImport();
  const [pending, setPending] = useState<ImportPreview | null>(null);
  const shown = pending ?? preview;

  const send = (file: File | undefined) => {
    if (!file) return;
    onReady(null);
    setPending(null);
    upload.mutate(
      { file, purpose, fieldId },
      {
        onSuccess: (p) => {
          if (p.coordinates.kind === 'projected') setPending(p);
          else onReady(p);
        },
      },
    );
  };

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={inputId} className="text-sm font-medium text-ink">
            File
          </label>
          <input
            id={inputId}
            type="file"
            accept={ACCEPT[purpose].accept}
            aria-describedby={`${inputId}-hint`}
            disabled={upload.isPending}
            onChange={(e) => send(e.target.files?.[0])}
            className="text-sm file:mr-3 file:cursor-pointer file:rounded-card file:border file:border-ink-line file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-ink hover:file:bg-paper"
          />
          <p id={`${inputId}-hint`} className="text-xs text-ink-soft">
            {ACCEPT[purpose].words}. The file is kept exactly as sent.
          </p>
        </div>
        {upload.isPending ? (
          <p role="status" className="flex items-center gap-2 pb-5 text-sm text-ink-soft">
            <span
              className="size-3.5 animate-spin rounded-full border-2 border-ink-faint border-t-transparent"
              aria-hidden
            />
            Reading the file…
          </p>
        ) : null}
      </div>
      {upload.isError ? (
        <Notice tone="danger" title="The file could not be read">
          <ProblemList error={upload.error} />
          <p className="mt-1">Nothing was saved. Fix the file, or choose another, and try again.</p>
        </Notice>
      ) : null}
      {shown ? (
        <p className="text-sm text-ink-soft">
          Read <span className="font-medium text-ink">{shown.fileName}</span> as {FORMAT_WORDS[shown.format]}
          {shown.layers.length > 1
            ? `, ${shown.layers.length} layers (${shown.layers.map((l) => `${l.name}: ${l.featureCount}`).join(', ')})`
            : ''}
          {pending
            ? '; its positions need their coordinate system first'
            : shown.pointCount != null
              ? `, ${shown.pointCount.toLocaleString('en-US')} points`
              : `, ${shown.features.length} polygon ${shown.features.length === 1 ? 'feature' : 'features'}`}
          .
        </p>
      ) : null}
      {shown && shown.warnings.length ? (
        <Notice tone="caution" title="Read, with remarks">
          <ul className="list-disc pl-5">
            {shown.warnings.map((w, i) => (
              <li key={i}>{w}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {pending ? (
        <CoordinatesChooser
          preview={pending}
          onChosen={(p) => {
            setPending(null);
            onReady(p);
          }}
        />
      ) : null}
    </div>
  );
}
