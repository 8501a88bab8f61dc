import type { ZoneProps } from '@shared/schemas/zone-map.schema';
import type { LegendEntry } from '@/components/map/legend';
import { NO_VALUE_COLOUR, rampColour } from '@/components/map/ramp';
import { formatNumber } from '@/lib/format';

export type ZoneColouring = {
  by: 'index' | 'class' | 'none';
  colourOf: (z: ZoneProps) => string;
  legend: LegendEntry[];
  title: string;
};

const distinct = (values: (number | null)[]) =>
  [...new Set(values.filter((v): v is number => v != null))].sort((a, b) => a - b);

/**
 * Zone colours on the cividis ramp: by productivity index when at least as many zones carry one as carry a
 * class (its value placed between the lowest and highest index), else by class (each class its own step);
 * one neutral colour when no zone has either.
 */
export function zoneColouring(zones: ZoneProps[]): ZoneColouring {
  const indexes = distinct(zones.map((z) => z.productivityIndex));
  const classes = distinct(zones.map((z) => z.classValue));
  const missing = (word: string) =>
    zones.some((z) => (word === 'index' ? z.productivityIndex : z.classValue) == null)
      ? [{ key: 'none', colour: NO_VALUE_COLOUR, label: word === 'index' ? 'No index' : 'No class' }]
      : [];
  const count = (key: 'productivityIndex' | 'classValue') => zones.filter((z) => z[key] != null).length;
  if (indexes.length && count('productivityIndex') >= count('classValue')) {
    const [lo, hi] = [indexes[0], indexes[indexes.length - 1]];
    const t = (v: number) => (hi === lo ? 0.5 : (v - lo) / (hi - lo));
    return {
      by: 'index',
      title: 'Productivity index',
      colourOf: (z) => (z.productivityIndex == null ? NO_VALUE_COLOUR : rampColour(t(z.productivityIndex))),
      legend: [
        ...indexes
          .slice(0, 9)
          .map((v) => ({ key: `i${v}`, colour: rampColour(t(v)), label: formatNumber(v, v % 1 ? 2 : 0) })),
        ...missing('index'),
      ],
    };
  }
  if (classes.length) {
    const t = (v: number) => (classes.length === 1 ? 0.5 : classes.indexOf(v) / (classes.length - 1));
    return {
      by: 'class',
      title: 'Class',
      colourOf: (z) => (z.classValue == null ? NO_VALUE_COLOUR : rampColour(t(z.classValue))),
      legend: [
        ...classes.map((v) => ({ key: `c${v}`, colour: rampColour(t(v)), label: `Class ${v}` })),
        ...missing('class'),
      ],
    };
  }
  return {
    by: 'none',
    title: 'Zones',
    colourOf: () => NO_VALUE_COLOUR,
    legend: [{ key: 'none', colour: NO_VALUE_COLOUR, label: 'No class or index yet' }],
  };
}
