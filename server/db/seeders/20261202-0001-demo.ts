import { readFileSync } from 'node:fs';
import type { InferCreationAttributes } from 'sequelize';
import type { Role } from '../../../shared/schemas/auth.schema';
import type { MigrationContext } from '../umzug';
import { ConsultantGrower, CropSeason, Farm, Field, Grower, Planter, User, Workspace } from '../associations';
import { hashPassword } from '../../lib/passwords';
import { ringFromOffsets } from '../../../shared/geo/offset-position';
import { inToM, mphToMps } from '../../../shared/units';

/**
 * The demo: an invented agronomy practice, its growers, farms, fields and planters, one person per role.
 * Every name is invented; the field outlines are generated here from east/north offsets in metres around
 * plausible farmland coordinates in the US Corn Belt.
 */
export const DEMO_WORKSPACE = 'Quillmere Agronomy (demo)';
/** Demo sign-ins, also printed by `npm start` and listed in the README. */
export const DEMO_USERS = JSON.parse(
  readFileSync(new URL('../demo-users.json', import.meta.url), 'utf8'),
) as {
  email: string;
  name: string;
  role: Role;
  password: string;
}[];

type FieldPlan = {
  name: string;
  origin: [number, number];
  outline: [number, number][];
  holes?: [number, number][][];
};

// Outlines in metres east and north of each field's south-west corner (a half-mile is 804.672 m).
const QUARTER: [number, number][] = [
  [0, 0],
  [804.672, 0],
  [804.672, 804.672],
  [0, 804.672],
];
const CUT_CORNER: [number, number][] = [
  [0, 0],
  [640, 0],
  [700, 120],
  [700, 520],
  [120, 560],
  [0, 430],
];
const CREEK_BEND: [number, number][] = [
  [0, 0],
  [520, 0],
  [560, 180],
  [480, 330],
  [520, 470],
  [0, 470],
];
const LONG_STRIP: [number, number][] = [
  [0, 0],
  [1200, 0],
  [1200, 260],
  [0, 260],
];

const GROWERS: {
  name: string;
  contactName: string;
  email: string;
  phone: string;
  farms: { name: string; fields: FieldPlan[] }[];
  planter: Omit<
    InferCreationAttributes<Planter>,
    'workspaceId' | 'growerId' | 'id' | 'version' | 'archivedAt' | 'createdAt' | 'updatedAt'
  >;
}[] = [
  {
    name: 'Oduya Family Farms',
    contactName: 'Dell Oduya',
    email: 'dell@oduya-farms.example',
    phone: '+1 555 0142',
    farms: [
      {
        name: 'Home place',
        fields: [
          {
            name: 'North quarter',
            origin: [-93.6215, 42.0412],
            outline: QUARTER,
            // The farmstead and its windbreak, left out of the field.
            holes: [
              [
                [40, 700],
                [40, 780],
                [150, 780],
                [150, 700],
              ],
            ],
          },
          { name: 'Schoolhouse forty', origin: [-93.6118, 42.0297], outline: CUT_CORNER },
        ],
      },
      {
        name: 'River farm',
        fields: [{ name: 'Creek bend', origin: [-93.5862, 42.0153], outline: CREEK_BEND }],
      },
    ],
    planter: {
      name: '24-row front fold',
      rowCount: 24,
      rowSpacingM: inToM(30),
      arrangement: 'single',
      interplantRowCount: null,
      rowsPerSection: 2,
      displaySectionLimit: 16,
      holesPerDisc: [
        { crop: 'corn', holes: 30 },
        { crop: 'soybean', holes: 60 },
      ],
      discRpmMin: 4,
      discRpmMax: 45,
      speedMinMps: mphToMps(4),
      speedPlannedMps: mphToMps(5.5),
      speedMaxMps: mphToMps(7),
      groundSpeedSource: 'wheel',
      notes: 'Wheel-speed sensor on the left rear tractor wheel.',
    },
  },
  {
    name: 'Brennick Grain',
    contactName: 'Marta Brennick',
    email: 'office@brennick-grain.example',
    phone: '+1 555 0178',
    farms: [
      {
        name: 'East section',
        fields: [
          { name: 'Long strip', origin: [-89.0531, 40.5128], outline: LONG_STRIP },
          { name: 'Pond field', origin: [-89.0402, 40.5212], outline: QUARTER },
        ],
      },
    ],
    planter: {
      name: '12/23 split-row',
      rowCount: 23,
      rowSpacingM: inToM(15),
      arrangement: 'split-row',
      interplantRowCount: 11,
      rowsPerSection: 1,
      displaySectionLimit: 24,
      holesPerDisc: [
        { crop: 'corn', holes: 30 },
        { crop: 'soybean', holes: 60 },
      ],
      discRpmMin: 4,
      discRpmMax: 50,
      speedMinMps: mphToMps(4.5),
      speedPlannedMps: mphToMps(5),
      speedMaxMps: mphToMps(6.5),
      groundSpeedSource: 'radar',
      notes: 'Interplant rows lifted for corn.',
    },
  },
  {
    name: 'Halloway Ridge Partners',
    contactName: 'Sam Halloway',
    email: 'sam@halloway-ridge.example',
    phone: '+1 555 0113',
    farms: [
      {
        name: 'Ridge farm',
        fields: [{ name: 'West slope', origin: [-95.9931, 41.2874], outline: CUT_CORNER }],
      },
    ],
    planter: {
      name: '8-row rigid',
      rowCount: 8,
      rowSpacingM: inToM(30),
      arrangement: 'single',
      interplantRowCount: null,
      rowsPerSection: 1,
      displaySectionLimit: 16,
      holesPerDisc: [{ crop: 'corn', holes: 30 }],
      discRpmMin: 4,
      discRpmMax: 40,
      speedMinMps: mphToMps(4),
      speedPlannedMps: mphToMps(5),
      speedMaxMps: mphToMps(6),
      groundSpeedSource: 'gnss',
      notes: null,
    },
  },
];

export async function up({ context: sequelize }: MigrationContext) {
  if (await Workspace.findOne({ where: { name: DEMO_WORKSPACE } })) return;
  await sequelize.transaction(async () => {
    const ws = await Workspace.create({ name: DEMO_WORKSPACE });
    const growers: Grower[] = [];
    for (const [i, g] of GROWERS.entries()) {
      const grower = await Grower.create({
        workspaceId: ws.id,
        name: g.name,
        contactName: g.contactName,
        email: g.email,
        phone: g.phone,
        notes: null,
      });
      growers.push(grower);
      for (const f of g.farms) {
        const farm = await Farm.create({
          workspaceId: ws.id,
          growerId: grower.id,
          name: f.name,
          notes: null,
        });
        for (const plan of f.fields) {
          const rings = [
            ringFromOffsets(plan.origin, plan.outline),
            ...(plan.holes ?? []).map((h) => ringFromOffsets(plan.origin, h).reverse()),
          ];
          const field = await Field.create({
            workspaceId: ws.id,
            growerId: grower.id,
            farmId: farm.id,
            name: plan.name,
            notes: null,
            boundary: { type: 'MultiPolygon', coordinates: [rings] },
          });
          await CropSeason.create({
            workspaceId: ws.id,
            growerId: grower.id,
            fieldId: field.id,
            year: 2027,
            crop: (i + f.fields.indexOf(plan)) % 2 === 0 ? 'corn' : 'soybean',
            plannedPlantingDate: (i + f.fields.indexOf(plan)) % 2 === 0 ? '2027-04-28' : '2027-05-12',
            notes: null,
          });
        }
      }
      await Planter.create({ workspaceId: ws.id, growerId: grower.id, ...g.planter });
    }
    for (const u of DEMO_USERS) {
      const user = await User.create({
        workspaceId: ws.id,
        email: u.email,
        name: u.name,
        role: u.role,
        status: 'active',
        passwordHash: await hashPassword(u.password),
        growerId: u.role === 'farmer' ? growers[0].id : null,
        lastSignInAt: null,
      });
      if (u.role === 'consultant') {
        for (const g of growers.slice(0, 2)) {
          await ConsultantGrower.create({ userId: user.id, growerId: g.id, workspaceId: ws.id });
        }
      }
    }
  });
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query('DELETE FROM workspaces WHERE name = :name', {
    replacements: { name: DEMO_WORKSPACE },
  });
}
