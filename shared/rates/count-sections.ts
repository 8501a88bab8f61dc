/**
 * Section count of a planter: ceil(rows / rows per section). On a split-row planter the row count is
 * always the full physical count of row units (common practice; DOMAIN.md §4).
 */
export function countSections(rowCount: number, rowsPerSection: number): number {
  if (!Number.isInteger(rowCount) || rowCount < 1)
    throw new RangeError('rowCount must be a positive integer');
  if (!Number.isInteger(rowsPerSection) || rowsPerSection < 1) {
    throw new RangeError('rowsPerSection must be a positive integer');
  }
  return Math.ceil(rowCount / rowsPerSection);
}

/** The fewest rows per section that keeps the section count within a display's limit. */
export function minRowsPerSection(rowCount: number, displaySectionLimit: number): number {
  if (!Number.isInteger(displaySectionLimit) || displaySectionLimit < 1) {
    throw new RangeError('displaySectionLimit must be a positive integer');
  }
  return Math.ceil(rowCount / displaySectionLimit);
}
