import { useMemo } from 'react';
import type { Coverage, Log } from '@shared/schemas/as-applied.schema';
import type { Prescription } from '@shared/schemas/prescription.schema';
import type { UnitSystem } from '@shared/units';
import { Facts } from '@/components/ui/facts';
import { formatArea, formatNumber } from '@/lib/format';
import type { MapOverlay } from '../audit-map-canvas';
import { MapPanel } from '../audit-maps';
import { errorStops } from '../map-colours';
import { ZoneSwatch } from '../ramp-key';
import { coverageDataUrl, rasterCorners } from './coverage-raster';
import { diagnosticMapBase } from './map-base';
import { DiagnosticPanel } from './panel';
import { formatLength, formatQuantity, MARK } from './units';

/** Under half a percent of the field skipped or doubled is not worth a word (diagnostic-findings.ts uses the same). */
const SMALL_SHARE = 0.005;

/** Skipped ground in vermillion, ground planted twice or more in blue (Okabe & Ito); once: no colour. */
export const COVERAGE_COLOURS = { skipped: MARK.vermillion, double: MARK.blue };

const Swatch = ({ colour, label }: { colour: string | null; label: string }) => (
  <li className="flex items-center gap-1.5">
    <span
      aria-hidden
      className="inline-block h-3 w-4 rounded-[2px] border border-ink/30"
      style={{ backgroundColor: colour ?? 'transparent' }}
    />
    {label}
  </li>
);

/**
 * Ground skipped, planted once and planted twice, the seed put down a second time, and a section layout
 * that would have cut the overlap; the raster drawn on the map.
 */
export function CoveragePanel({
  coverage: c,
  log,
  prescription: rx,
  system,
}: {
  coverage: Coverage;
  log: Log;
  prescription: Prescription;
  system: UnitSystem;
}) {
  const picture = useMemo(() => {
    try {
      return { url: coverageDataUrl(c.raster, COVERAGE_COLOURS), error: null };
    } catch (e) {
      return { url: null, error: (e as Error).message };
    }
  }, [c.raster]);
  const overlay = useMemo<MapOverlay | null>(
    () =>
      picture.url
        ? {
            sources: { coverage: { type: 'image', url: picture.url, coordinates: rasterCorners(c.raster) } },
            layers: [
              {
                id: 'coverage',
                type: 'raster',
                source: 'coverage',
                paint: { 'raster-resampling': 'nearest', 'raster-fade-duration': 0 },
              },
            ],
            hidePoints: true,
          }
        : null,
    [picture.url, c.raster],
  );
  const onceM2 = Math.max(0, c.plantedM2 - c.doubleM2);
  const share = (m2: number) => (c.fieldM2 > 0 ? ` (${formatNumber((100 * m2) / c.fieldM2, 1)} %)` : '');
  const a = c.sectionAdvice;
  const verdict =
    c.doubleM2 < SMALL_SHARE * c.fieldM2 && c.skippedM2 < SMALL_SHARE * c.fieldM2
      ? `Nearly all of the field was planted once: ${formatArea(c.skippedM2, system)} skipped and ${formatArea(c.doubleM2, system)} planted twice.`
      : `${formatArea(c.doubleM2, system)} of the field was planted twice or more and ${formatArea(c.skippedM2, system)} was skipped.`;
  const advice =
    !a || c.doubleM2 <= 0
      ? null
      : a.overlapCutM2 > 0
        ? `Sections of ${a.rowsPerSection} row${a.rowsPerSection === 1 ? '' : 's'} (${a.sections} sections, ${
            a.withinDisplayLimit ? 'within what the display controls' : 'more than the display controls'
          }) would have cut the overlap by ${formatArea(a.overlapCutM2, system)}.`
        : 'Narrower sections would not have cut the overlap here.';
  return (
    <DiagnosticPanel title="Skipped and double-planted ground" verdict={verdict}>
      <Facts
        columns={4}
        items={[
          {
            label: 'Skipped',
            value: `${formatArea(c.skippedM2, system)}${share(c.skippedM2)}`,
            numeric: true,
          },
          { label: 'Planted once', value: `${formatArea(onceM2, system)}${share(onceM2)}`, numeric: true },
          {
            label: 'Planted twice or more',
            value: `${formatArea(c.doubleM2, system)}${share(c.doubleM2)}`,
            numeric: true,
          },
          {
            label: 'Put down a second time',
            value: formatQuantity(c.quantityInOverlap, rx.product.rateKind, system),
            numeric: true,
          },
        ]}
      />
      {advice ? <p className="text-sm text-ink">{advice}</p> : null}
      {overlay ? (
        <MapPanel
          title="Coverage map"
          control={null}
          map={{
            ...diagnosticMapBase(log, rx, system),
            label: `Coverage map of ${log.fieldName}`,
            property: 'err',
            stops: errorStops(30),
            className: 'h-[380px]',
            describePoint: () => null,
            overlay,
            legend: (
              <div role="group" aria-label="Key: coverage" className="text-xs text-ink">
                <ul className="flex flex-wrap gap-x-4 gap-y-1">
                  <Swatch colour={COVERAGE_COLOURS.skipped} label="Skipped" />
                  <Swatch colour={COVERAGE_COLOURS.double} label="Planted twice or more" />
                  <Swatch colour={null} label="Planted once" />
                  <li className="flex items-center gap-1.5">
                    <ZoneSwatch />
                    Prescription zones
                  </li>
                </ul>
                <p className="mt-1 text-ink-soft">
                  Cells of {formatLength(c.cellSizeM, system)} a side over the field boundary.
                </p>
              </div>
            ),
          }}
        />
      ) : (
        <p role="alert" className="text-sm text-danger">
          The coverage map cannot be drawn: {picture.error}
        </p>
      )}
    </DiagnosticPanel>
  );
}
