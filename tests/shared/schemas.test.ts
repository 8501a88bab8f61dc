import { describe, expect, it } from 'vitest';
import { planterInputSchema } from '../../shared/schemas/planter.schema';
import { newPasswordSchema, signInSchema } from '../../shared/schemas/auth.schema';
import { fieldInputSchema } from '../../shared/schemas/field.schema';
import { inviteUserSchema } from '../../shared/schemas/user.schema';
import { growerInputSchema } from '../../shared/schemas/grower.schema';
import { inToM, mphToMps } from '../../shared/units';

const ID = '6b8b2afc-e43a-4754-ad36-3a20d539f337';
const planter = {
  growerId: ID,
  name: '24-row',
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
  groundSpeedSource: 'wheel',
};

const pathsOf = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) =>
  r.success ? [] : r.error!.issues.map((i) => i.path.join('.'));

describe('planter profile schema', () => {
  it('accepts a consistent profile', () => {
    expect(planterInputSchema.safeParse(planter).success).toBe(true);
  });

  it('refuses more sections than the display controls, naming rowsPerSection (common practice: 24 rows, 16 sections → 2 per section)', () => {
    const r = planterInputSchema.safeParse({ ...planter, rowsPerSection: 1 });
    expect(pathsOf(r)).toEqual(['rowsPerSection']);
    expect(r.error!.issues[0].message).toContain('at least 2 rows per section');
  });

  it('needs the interplant rows of a split-row planter and drops them for a single-rank one', () => {
    const split = {
      ...planter,
      rowCount: 23,
      rowSpacingM: inToM(15),
      arrangement: 'split-row',
      rowsPerSection: 1,
      displaySectionLimit: 24,
    };
    expect(pathsOf(planterInputSchema.safeParse(split))).toEqual(['interplantRowCount']);
    expect(planterInputSchema.parse({ ...split, interplantRowCount: 11 }).interplantRowCount).toBe(11);
    expect(planterInputSchema.parse({ ...planter, interplantRowCount: 11 }).interplantRowCount).toBeNull();
  });

  it('names the field of each inconsistency', () => {
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, discRpmMin: 50 }))).toEqual(['discRpmMax']);
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, speedPlannedMps: mphToMps(3) }))).toEqual([
      'speedPlannedMps',
    ]);
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, speedMaxMps: mphToMps(4.5) }))).toEqual([
      'speedMaxMps',
    ]);
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, rowsPerSection: 30 }))).toEqual([
      'rowsPerSection',
    ]);
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, rowCount: 24.5 }))).toContain('rowCount');
    expect(
      pathsOf(
        planterInputSchema.safeParse({
          ...planter,
          holesPerDisc: [
            { crop: 'corn', holes: 30 },
            { crop: 'corn', holes: 24 },
          ],
        }),
      ),
    ).toEqual(['holesPerDisc']);
    expect(pathsOf(planterInputSchema.safeParse({ ...planter, groundSpeedSource: 'sonar' }))).toEqual([
      'groundSpeedSource',
    ]);
  });

  it('does not mutate its input', () => {
    const input = structuredClone({ ...planter, interplantRowCount: 4 });
    const copy = structuredClone(input);
    planterInputSchema.parse(input);
    expect(input).toEqual(copy);
  });
});

describe('account schemas', () => {
  it('keeps passwords exactly as typed and refuses short or common ones', () => {
    expect(signInSchema.parse({ email: ' Ada@Example.COM ', password: ' pw ' })).toEqual({
      email: 'ada@example.com',
      password: ' pw ',
    });
    expect(newPasswordSchema.safeParse('seven77').success).toBe(false);
    expect(newPasswordSchema.safeParse('Password1').success).toBe(false);
    expect(newPasswordSchema.safeParse('a'.repeat(64)).success).toBe(true);
    expect(newPasswordSchema.safeParse('furrows and flags').success).toBe(true);
  });

  it('a farmer invitation needs a grower', () => {
    const r = inviteUserSchema.safeParse({ email: 'a@b.example', name: 'A', role: 'farmer' });
    expect(pathsOf(r)).toEqual(['growerId']);
    expect(
      inviteUserSchema.safeParse({ email: 'a@b.example', name: 'A', role: 'farmer', growerId: ID }).success,
    ).toBe(true);
  });
});

describe('register schemas', () => {
  it('turns empty optional text into null and trims names', () => {
    expect(growerInputSchema.parse({ name: '  Hill farm ', email: '', phone: '' })).toMatchObject({
      name: 'Hill farm',
      email: null,
      phone: null,
    });
    expect(pathsOf(growerInputSchema.safeParse({ name: '   ' }))).toEqual(['name']);
    expect(pathsOf(growerInputSchema.safeParse({ name: 'x', email: 'not-mail' }))).toEqual(['email']);
  });

  it('checks boundary coordinates and says where', () => {
    const ring = [
      [-93.6, 42],
      [-93.59, 42],
      [-93.59, 42.01],
      [-93.6, 42],
    ];
    expect(
      fieldInputSchema.safeParse({
        farmId: ID,
        name: 'F',
        boundary: { type: 'Polygon', coordinates: [ring] },
      }).success,
    ).toBe(true);
    const far = ring.map(([x, y], i) => (i === 1 ? [200, y] : [x, y]));
    const r = fieldInputSchema.safeParse({
      farmId: ID,
      name: 'F',
      boundary: { type: 'Polygon', coordinates: [far] },
    });
    expect(r.success).toBe(false);
    expect(pathsOf(r).some((p) => p.startsWith('boundary'))).toBe(true);
  });
});

describe('crop season schema', () => {
  it('takes an empty planting date as none, and refuses a date that is not real', async () => {
    const { seasonInputSchema } = await import('../../shared/schemas/season.schema');
    const base = { fieldId: ID, year: 2027, crop: 'corn' };
    expect(seasonInputSchema.parse({ ...base, plannedPlantingDate: '' }).plannedPlantingDate).toBeNull();
    expect(seasonInputSchema.parse({ ...base, plannedPlantingDate: '2027-04-28' }).plannedPlantingDate).toBe(
      '2027-04-28',
    );
    expect(pathsOf(seasonInputSchema.safeParse({ ...base, plannedPlantingDate: '28/04/2027' }))).toEqual([
      'plannedPlantingDate',
    ]);
    expect(pathsOf(seasonInputSchema.safeParse({ ...base, plannedPlantingDate: '2027-13-45' }))).toEqual([
      'plannedPlantingDate',
    ]);
  });
});
