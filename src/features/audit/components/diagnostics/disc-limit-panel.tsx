import type { DiscLimit } from '@shared/schemas/as-applied.schema';
import { formatRate, type RateUnit } from '@shared/rates/rate-units';
import type { UnitSystem } from '@shared/units';
import { formatArea, formatNumber, formatSpeed } from '@/lib/format';
import { DiagnosticPanel, FigureTable } from './panel';

/**
 * Where the seed disc was at its top speed and the rate fell short: per zone the shortfall, the area, the
 * speed driven and the speed at which the disc would have delivered the target.
 */
export function DiscLimitPanel({
  disc,
  rateUnit,
  system,
}: {
  disc: DiscLimit;
  rateUnit: RateUnit;
  system: UnitSystem;
}) {
  const zones = [...disc.zones].sort((a, b) => b.areaM2 - a.areaM2);
  const worst = zones[0];
  const verdict = worst
    ? `In ${worst.name} the disc turned as fast as it can and still fell ${formatNumber(worst.shortfallPct, 1)} % short: at ${formatSpeed(worst.drivenSpeedMps, system)} it could not reach ${formatRate(worst.targetSi, rateUnit)}. Driving at ${formatSpeed(worst.fastestSpeedMps, system)} or slower there (or a disc with more holes) would have delivered it.`
    : 'The disc never reached its top speed where the rate fell short.';
  const heads = ['Zone', 'Target', 'Short by', 'Area', 'Speed driven', 'Fastest speed for the target'];
  return (
    <DiagnosticPanel title="Seed disc at its top speed" verdict={verdict}>
      {zones.length ? (
        <FigureTable
          label="Disc at its top speed by zone"
          heads={heads}
          rows={zones.map((z) => ({
            key: z.zoneId,
            name: z.name,
            cells: [
              formatRate(z.targetSi, rateUnit),
              `${formatNumber(z.shortfallPct, 1)} %`,
              formatArea(z.areaM2, system),
              formatSpeed(z.drivenSpeedMps, system),
              formatSpeed(z.fastestSpeedMps, system),
            ],
          }))}
        />
      ) : null}
    </DiagnosticPanel>
  );
}
