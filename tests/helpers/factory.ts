import { randomUUID } from 'node:crypto';
import type { Express } from 'express';
import {
  ConsultantGrower,
  Farm,
  Field,
  Grower,
  CropSeason,
  Planter,
  User,
  Workspace,
} from '../../server/db/associations';
import { hashPassword } from '../../server/lib/passwords';
import { inToM, mphToMps } from '../../shared/units';
import type { Role } from '../../shared/schemas/auth.schema';
import { signIn, uniqueEmail, type Caller } from './app';

export const TEST_PASSWORD = 'correct horse battery';
let cachedHash: Promise<string> | null = null;
const passwordHash = () => (cachedHash ??= hashPassword(TEST_PASSWORD));

/** A square boundary of `sideM` metres at about 45° N (a plain, valid polygon), as GeoJSON. */
export function squareBoundary(lon = -93.6, lat = 42.0, sideDeg = 0.005) {
  return {
    type: 'Polygon' as const,
    coordinates: [
      [
        [lon, lat],
        [lon + sideDeg, lat],
        [lon + sideDeg, lat + sideDeg],
        [lon, lat + sideDeg],
        [lon, lat],
      ],
    ],
  };
}

export function planterBody(growerId: string) {
  return {
    growerId,
    name: `Planter ${randomUUID().slice(0, 6)}`,
    rowCount: 24,
    rowSpacingM: inToM(30),
    arrangement: 'single',
    rowsPerSection: 2,
    displaySectionLimit: 16,
    holesPerDisc: [{ crop: 'corn', holes: 30 }],
    discRpmMin: 4,
    discRpmMax: 45,
    speedMinMps: mphToMps(4),
    speedPlannedMps: mphToMps(5),
    speedMaxMps: mphToMps(6.5),
    groundSpeedSource: 'gnss',
  };
}

export type World = Awaited<ReturnType<typeof makeWorld>>;

/**
 * A workspace of its own for one test file: two growers (A and B) each with a farm, a field, a crop
 * season and a planter; one person per role (the farmer belongs to A, the consultant reads A only).
 */
export async function makeWorld(app: Express, label = 'ws') {
  const ws = await Workspace.create({ name: `${label} ${randomUUID().slice(0, 8)}` });
  const mk = async (name: string) => {
    const grower = await Grower.create({
      workspaceId: ws.id,
      name,
      contactName: null,
      email: null,
      phone: null,
      notes: null,
    });
    const farm = await Farm.create({
      workspaceId: ws.id,
      growerId: grower.id,
      name: `${name} farm`,
      notes: null,
    });
    const field = await Field.create({
      workspaceId: ws.id,
      growerId: grower.id,
      farmId: farm.id,
      name: `${name} field`,
      notes: null,
      boundary: { type: 'MultiPolygon', coordinates: [squareBoundary().coordinates] },
    });
    const season = await CropSeason.create({
      workspaceId: ws.id,
      growerId: grower.id,
      fieldId: field.id,
      year: 2027,
      crop: 'corn',
      plannedPlantingDate: null,
      notes: null,
    });
    const { growerId: _g, ...profile } = planterBody(grower.id);
    const planter = await Planter.create({
      workspaceId: ws.id,
      growerId: grower.id,
      ...profile,
      arrangement: 'single',
      interplantRowCount: null,
      groundSpeedSource: 'gnss',
      holesPerDisc: [{ crop: 'corn', holes: 30 }],
      notes: null,
    });
    return { grower, farm, field, season, planter };
  };
  const a = await mk('Grower A');
  const b = await mk('Grower B');
  const hash = await passwordHash();
  const people = {} as Record<Role, User>;
  for (const role of ['admin', 'agronomist', 'farmer', 'consultant'] as Role[]) {
    people[role] = await User.create({
      workspaceId: ws.id,
      email: uniqueEmail(role),
      name: `Test ${role}`,
      role,
      status: 'active',
      passwordHash: hash,
      growerId: role === 'farmer' ? a.grower.id : null,
      lastSignInAt: null,
    });
  }
  await ConsultantGrower.create({ userId: people.consultant.id, growerId: a.grower.id, workspaceId: ws.id });
  const callers = {} as Record<Role, Caller>;
  for (const role of Object.keys(people) as Role[])
    callers[role] = await signIn(app, people[role].email, TEST_PASSWORD);
  return { ws, a, b, people, callers };
}
