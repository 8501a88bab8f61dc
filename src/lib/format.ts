import {
  areaToDisplay,
  areaUnitLabel,
  rowSpacingToDisplay,
  lengthUnitLabel,
  speedToDisplay,
  speedUnitLabel,
  type UnitSystem,
} from '@shared/units';

const numberFormat = (decimals: number) =>
  new Intl.NumberFormat('en-US', { minimumFractionDigits: decimals, maximumFractionDigits: decimals });

export const formatNumber = (value: number, decimals = 0) => numberFormat(decimals).format(value);

/** An area in m² shown in acres or hectares by the unit system, one decimal. */
export const formatArea = (areaM2: number | null | undefined, system: UnitSystem) =>
  areaM2 == null ? '—' : `${formatNumber(areaToDisplay(areaM2, system), 1)} ${areaUnitLabel(system)}`;

/** Row spacing in metres shown in inches or centimetres. */
export const formatRowSpacing = (m: number, system: UnitSystem) =>
  `${formatNumber(rowSpacingToDisplay(m, system), 1)} ${lengthUnitLabel(system)}`;

/** A speed in m/s shown in mph or km/h. */
export const formatSpeed = (mps: number, system: UnitSystem) =>
  `${formatNumber(speedToDisplay(mps, system), 1)} ${speedUnitLabel(system)}`;

const dateFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
const dateTimeFormat = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
});

/** An ISO timestamp as a short local date; '—' when absent. */
export const formatDate = (iso: string | null | undefined) => (iso ? dateFormat.format(new Date(iso)) : '—');
export const formatDateTime = (iso: string | null | undefined) =>
  iso ? dateTimeFormat.format(new Date(iso)) : '—';

/** A calendar date (YYYY-MM-DD) without shifting it through a time zone. */
export const formatCalendarDate = (ymd: string | null | undefined) => {
  if (!ymd) return '—';
  const [y, m, d] = ymd.split('-').map(Number);
  return dateFormat.format(new Date(Date.UTC(y, m - 1, d, 12)));
};
