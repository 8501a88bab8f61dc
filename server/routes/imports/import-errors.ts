import { DomainError } from '../../errors';

/**
 * A file Sowright cannot read or will not open: the message says what is wrong and where, for the person
 * who sent it. Codes: `unreadable_file` (422), `too_large` (413), `coordinates_unknown` (422),
 * `unknown_crs` (422); geometry input problems use `invalid_geometry` (422).
 */
export class FileReadError extends DomainError {
  constructor(message: string, code = 'unreadable_file', details?: DomainError['details']) {
    super(code, message, details);
  }
}

/** HTTP status of the codes above, for the import and boundary routers' own error mapping. */
export const IMPORT_ERROR_STATUS: Record<string, number> = {
  unreadable_file: 422,
  too_large: 413,
  coordinates_unknown: 422,
  unknown_crs: 422,
  invalid_geometry: 422,
};
