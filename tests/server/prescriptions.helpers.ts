import { expect } from 'vitest';
import type request from 'supertest';
import type { Caller } from '../helpers/app';
import type { World } from '../helpers/factory';
import { prescriptionSchema, type Prescription } from '../../shared/schemas/prescription.schema';
import { productSchema, type Product } from '../../shared/schemas/product.schema';
import { rateToSi } from '../../shared/rates/rate-units';
import { DEFAULT_SEEDS_PER_UNIT } from '../../shared/rates/seed-units';
import { addZone, cell, createMap, polygon, tidy } from './zone-maps.helpers';

/** The answer is a whole Prescription of the shared schema (and the status is as expected). */
export function expectRx(res: request.Response, status = 200): Prescription {
  expect(res.status, JSON.stringify(res.body).slice(0, 600)).toBe(status);
  return prescriptionSchema.parse(res.body);
}

export const perAc = (seedsPerAc: number) => rateToSi(seedsPerAc, 'seeds/ac');

/** A corn seed product: 80 000 seeds a unit (DOMAIN.md §3, common practice) at 300 a unit. */
export async function cornProduct(caller: Caller, name = 'Test hybrid 104'): Promise<Product> {
  const res = await caller.post('/api/products', {
    kind: 'seed',
    name,
    crop: 'corn',
    rateKind: 'count',
    unitName: 'unit',
    unitSize: DEFAULT_SEEDS_PER_UNIT.corn,
    pricePerUnit: 300,
    currency: 'USD',
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return productSchema.parse(res.body);
}

/** A zone map of grower A's field split into a west (index 0.9) and an east (index 1.1) half. */
export async function halvesMap(agronomist: Caller, w: World) {
  let map = await createMap(agronomist, w, 'Halves');
  map = await addZone(agronomist, map, 'West', polygon(cell(0, 0, 0.5, 1)), { productivityIndex: 0.9 });
  map = await addZone(agronomist, map, 'East', polygon(cell(0.5, 0, 1, 1)), { productivityIndex: 1.1 });
  return tidy(agronomist, map);
}

/** A draft on grower A's field: default 32 000, bounds 20 000 – 60 000 seeds/ac. */
export async function draftFor(agronomist: Caller, w: World, zoneMapId: string, productId: string) {
  return expectRx(
    await agronomist.post('/api/prescriptions', {
      zoneMapId,
      productId,
      planterId: w.a.planter.id,
      name: 'Corn 2027 rates',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(32_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(60_000),
    }),
    201,
  );
}

/** The body of a save that keeps everything and sets the given rates (seeds/ac by zone name). */
export function saveBody(rx: Prescription, ratesPerAc: Record<string, number>) {
  return {
    version: rx.version,
    name: rx.name,
    productId: rx.product.id,
    planterId: rx.planter?.id ?? null,
    rateUnit: rx.rateUnit,
    defaultRateSi: rx.defaultRateSi,
    outOfFieldRateSi: rx.outOfFieldRateSi,
    minRateSi: rx.minRateSi,
    maxRateSi: rx.maxRateSi,
    rates: rx.zones.map((z) => ({
      zoneId: z.id,
      rateSi: z.name in ratesPerAc ? perAc(ratesPerAc[z.name]) : z.rateSi,
    })),
  };
}
