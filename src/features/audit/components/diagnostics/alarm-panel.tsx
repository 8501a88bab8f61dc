import { useMemo, useState } from 'react';
import type { FeatureCollection, Point } from 'geojson';
import type { AlarmReplay, Log } from '@shared/schemas/as-applied.schema';
import type { Prescription } from '@shared/schemas/prescription.schema';
import type { UnitSystem } from '@shared/units';
import { Checkbox } from '@/components/ui/input';
import { formatArea, formatNumber } from '@/lib/format';
import type { MapOverlay } from '../audit-map-canvas';
import { MapPanel } from '../audit-maps';
import { errorStops } from '../map-colours';
import { RampKey, ZoneSwatch } from '../ramp-key';
import { diagnosticMapBase } from './map-base';
import { DiagnosticPanel, FigureTable } from './panel';
import { formatDuration, MARK } from './units';

const SHORT_LAYER = 'alarms-short';
const LONG_LAYER = 'alarms-long';
const DIAMOND = 'alarm-diamond';

/**
 * The long delay's marker: an orange diamond with a dark edge. The short delay's is a dark dot with a white
 * edge: neither is a colour of the error ramp (red–blue) under them.
 */
function diamondImage(): ImageData {
  const s = 30;
  const canvas = document.createElement('canvas');
  canvas.width = s;
  canvas.height = s;
  const ctx = canvas.getContext('2d')!;
  ctx.beginPath();
  ctx.moveTo(s / 2, 2);
  ctx.lineTo(s - 2, s / 2);
  ctx.lineTo(s / 2, s - 2);
  ctx.lineTo(2, s / 2);
  ctx.closePath();
  ctx.fillStyle = MARK.orange;
  ctx.fill();
  ctx.lineWidth = 3;
  ctx.strokeStyle = MARK.ink;
  ctx.stroke();
  return ctx.getImageData(0, 0, s, s);
}

export const DotMark = () => (
  <svg viewBox="0 0 12 12" className="inline-block size-3" aria-hidden>
    <circle cx="6" cy="6" r="4.5" fill={MARK.ink} stroke="#fff" strokeWidth="1" />
  </svg>
);
export const DiamondMark = () => (
  <svg viewBox="0 0 14 14" className="inline-block size-3.5" aria-hidden>
    <path d="M7 1 L13 7 L7 13 L1 7 Z" fill={MARK.orange} stroke={MARK.ink} strokeWidth="1.2" />
  </svg>
);

const startsOf = (r: AlarmReplay, setting: number): FeatureCollection<Point> => ({
  type: 'FeatureCollection',
  features: r.alarms.map((a) => ({
    type: 'Feature',
    properties: { setting, direction: a.direction },
    geometry: { type: 'Point', coordinates: [a.lon, a.lat] },
  })),
});

/**
 * The alarm replay at two delays side by side: how often an alarm would have sounded, how long and over
 * how much ground the rate was out of the band, and how much of that no alarm reported; on the error map,
 * where each setting's alarms began.
 */
export function AlarmPanel({
  replays,
  log,
  prescription: rx,
  system,
}: {
  replays: AlarmReplay[];
  log: Log;
  prescription: Prescription;
  system: UnitSystem;
}) {
  const [short, long] = [...replays].sort((a, b) => a.delayS - b.delayS);
  const [show, setShow] = useState({ short: true, long: true });
  const band = `±${formatNumber((short?.bandFraction ?? 0) * 100)} %`;

  const overlay = useMemo<MapOverlay | null>(() => {
    if (!short) return null;
    return {
      sources: {
        'alarms-short': { type: 'geojson', data: startsOf(short, 0) },
        'alarms-long': { type: 'geojson', data: long ? startsOf(long, 1) : startsOf(short, 1) },
      },
      layers: [
        {
          id: SHORT_LAYER,
          type: 'circle',
          source: 'alarms-short',
          paint: {
            'circle-color': MARK.ink,
            'circle-radius': 3.5,
            'circle-stroke-color': '#ffffff',
            'circle-stroke-width': 1,
          },
        },
        {
          id: LONG_LAYER,
          type: 'symbol',
          source: 'alarms-long',
          filter: long ? ['==', ['get', 'setting'], 1] : ['==', 1, 0],
          layout: { 'icon-image': DIAMOND, 'icon-allow-overlap': true, 'icon-ignore-placement': true },
        },
      ],
      images: { [DIAMOND]: diamondImage },
    };
  }, [short, long]);

  if (!short || !overlay) return null;
  const settings = long ? [short, long] : [short];
  const none = short.count === 0 && (!long || long.count === 0);
  const verdict = none
    ? `With a band of ${band}, the rate never stayed out of the band long enough to sound an alarm at ${long ? 'either delay' : `${formatNumber(short.delayS)} s`}.`
    : long
      ? long.count < short.count
        ? `With a band of ${band}, an alarm after ${formatNumber(short.delayS)} s would have sounded ${formatNumber(short.count)} times; after ${formatNumber(long.delayS)} s, ${formatNumber(long.count)} times. The longer delay left ${formatArea(long.unreportedAreaM2, system)} out of the band with no alarm.`
        : `With a band of ${band}, both delays would have sounded as often (${formatNumber(short.count)} alarms): the rate seldom left the band for long.`
      : `With a band of ${band}, an alarm after ${formatNumber(short.delayS)} s would have sounded ${formatNumber(short.count)} times.`;
  const hidden = [...(show.short ? [] : [SHORT_LAYER]), ...(show.long && long ? [] : [LONG_LAYER])];
  const bandPct = short.bandFraction * 100;
  const stops = errorStops(2 * bandPct);
  const listed = (r: AlarmReplay) =>
    r.alarms.length < r.count
      ? ` (${formatNumber(r.alarms.length)} of them, spread over the log, on the map)`
      : '';

  return (
    <DiagnosticPanel title="Alarms at two delays" verdict={verdict}>
      <FigureTable
        label="Alarm replay"
        heads={[
          '',
          ...settings.map((r, i) => (
            <span key={r.delayS} className="inline-flex items-center gap-1.5">
              {i === 0 ? <DotMark /> : <DiamondMark />}
              {band}, after {formatNumber(r.delayS)} s
            </span>
          )),
        ]}
        rows={[
          { key: 'Alarms', name: 'Alarms', cells: settings.map((r) => formatNumber(r.count)) },
          {
            key: 'Out of the band',
            name: 'Out of the band',
            cells: settings.map(
              (r) => `${formatDuration(r.outOfBandTimeS)}, ${formatArea(r.outOfBandAreaM2, system)}`,
            ),
          },
          {
            key: 'Out of the band with no alarm',
            name: 'Out of the band with no alarm',
            cells: settings.map(
              (r) => `${formatDuration(r.unreportedTimeS)}, ${formatArea(r.unreportedAreaM2, system)}`,
            ),
          },
        ]}
      />
      {none ? null : (
        <MapPanel
          title="Where alarms would have begun"
          control={
            <span className="flex flex-wrap gap-x-4 gap-y-1">
              {settings.map((r, i) => (
                <Checkbox
                  key={r.delayS}
                  label={`After ${formatNumber(r.delayS)} s`}
                  checked={i === 0 ? show.short : show.long}
                  onChange={(e) => setShow({ ...show, [i === 0 ? 'short' : 'long']: e.target.checked })}
                />
              ))}
            </span>
          }
          map={{
            ...diagnosticMapBase(log, rx, system),
            label: `Alarm map of ${log.fieldName}`,
            property: 'err',
            stops,
            className: 'h-[380px]',
            describePoint: (v) =>
              v.err != null ? (
                <span className="font-mono">{formatNumber(v.err, 1)} % from target</span>
              ) : null,
            overlay: { ...overlay, hidden },
            legend: (
              <RampKey
                title="Applied against target"
                stops={stops}
                ticks={[-2 * bandPct, 0, 2 * bandPct].map((v) => ({
                  value: v,
                  label: v === 0 ? 'on target' : `${v > 0 ? '+' : '−'}${formatNumber(Math.abs(v))} %`,
                }))}
                marks={[
                  ...settings.map((r, i) => ({
                    key: `alarm-${i}`,
                    swatch: i === 0 ? <DotMark /> : <DiamondMark />,
                    label: `Alarm begins, ${formatNumber(r.delayS)} s delay${listed(r)}`,
                  })),
                  { key: 'zones', swatch: <ZoneSwatch />, label: 'Prescription zones' },
                ]}
              />
            ),
          }}
        />
      )}
    </DiagnosticPanel>
  );
}
