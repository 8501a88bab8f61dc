import type { Field } from '@shared/schemas/field.schema';

type MultiPolygon = NonNullable<Field['boundary']>;

/**
 * A small drawing of a boundary, north up. Longitudes are scaled by the cosine of the mean latitude
 * (equirectangular), which keeps a field's shape true enough at this size; it is not a map.
 */
export function BoundaryOutline({
  boundary,
  size = 220,
  label,
}: {
  boundary: MultiPolygon;
  size?: number;
  label: string;
}) {
  const positions = boundary.coordinates.flat(2);
  if (positions.length === 0) return null;
  const lats = positions.map((p) => p[1]);
  const meanLat = lats.reduce((a, b) => a + b, 0) / lats.length;
  const k = Math.cos((meanLat * Math.PI) / 180);
  const xy = (p: number[]) => [p[0] * k, -p[1]] as const;
  const pts = positions.map(xy);
  const minX = Math.min(...pts.map((p) => p[0]));
  const maxX = Math.max(...pts.map((p) => p[0]));
  const minY = Math.min(...pts.map((p) => p[1]));
  const maxY = Math.max(...pts.map((p) => p[1]));
  const span = Math.max(maxX - minX, maxY - minY) || 1;
  const pad = 16;
  const scale = (size - 2 * pad) / span;
  const ox = pad + (size - 2 * pad - (maxX - minX) * scale) / 2;
  const oy = pad + (size - 2 * pad - (maxY - minY) * scale) / 2;
  const d = boundary.coordinates
    .flatMap((polygon) =>
      polygon.map(
        (ring) =>
          ring
            .map((p, i) => {
              const [x, y] = xy(p);
              return `${i === 0 ? 'M' : 'L'}${(ox + (x - minX) * scale).toFixed(1)} ${(oy + (y - minY) * scale).toFixed(1)}`;
            })
            .join(' ') + ' Z',
      ),
    )
    .join(' ');
  return (
    <svg
      viewBox={`0 0 ${size} ${size}`}
      width={size}
      height={size}
      role="img"
      aria-label={label}
      className="rounded-card border border-ink-line bg-paper-raised"
    >
      <path
        d={d}
        fillRule="evenodd"
        className="fill-clay-100 stroke-clay-600"
        strokeWidth={1.5}
        strokeLinejoin="round"
      />
      <text x={size - 4} y={11} textAnchor="end" className="fill-ink-faint font-mono text-[9px]">
        N↑
      </text>
    </svg>
  );
}
