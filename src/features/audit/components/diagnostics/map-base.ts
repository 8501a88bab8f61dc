import type { Log } from '@shared/schemas/as-applied.schema';
import type { Prescription } from '@shared/schemas/prescription.schema';
import type { UnitSystem } from '@shared/units';

/** Width planted when the prescription names no planter, m (as the audit's own maps assume). */
const FALLBACK_SWATH_M = 9;

/** What every diagnostic map shares with the audit's maps: the log's points, the boundary and the zones. */
export function diagnosticMapBase(log: Log, rx: Prescription, system: UnitSystem) {
  return {
    unitSystem: system,
    logId: log.id,
    tileVersion: log.version,
    boundary: rx.boundary,
    zones: rx.zones.map((z) => ({ id: z.id, geometry: z.geometry })),
    swathM: rx.planter ? rx.planter.rowCount * rx.planter.rowSpacingM : FALLBACK_SWATH_M,
  };
}
