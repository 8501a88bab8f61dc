import { z } from 'zod';

export const CROPS = [
  'corn',
  'soybean',
  'sorghum',
  'sunflower',
  'cotton',
  'canola',
  'dry-bean',
  'sugar-beet',
] as const;
export const cropSchema = z.enum(CROPS, { message: 'Choose a crop from the list' });
export type Crop = z.infer<typeof cropSchema>;

export const CROP_LABELS: Record<Crop, string> = {
  corn: 'Corn',
  soybean: 'Soybean',
  sorghum: 'Sorghum',
  sunflower: 'Sunflower',
  cotton: 'Cotton',
  canola: 'Canola',
  'dry-bean': 'Dry bean',
  'sugar-beet': 'Sugar beet',
};
