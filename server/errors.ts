/** Domain errors. Services throw these; only the error middleware knows HTTP status codes. */
export class DomainError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly details?: { path: (string | number)[]; message: string }[],
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** Not there, or not yours: the two answer alike so existence never leaks. */
export class NotFoundError extends DomainError {
  constructor(what = 'Record') {
    super('not_found', `${what} not found`);
  }
}
export class UnauthenticatedError extends DomainError {
  constructor(message = 'Sign in to continue') {
    super('unauthenticated', message);
  }
}
export class ForbiddenError extends DomainError {
  constructor(message = 'Your role may not do this') {
    super('forbidden', message);
  }
}
export class ConflictError extends DomainError {
  constructor(message: string, code = 'conflict', details?: DomainError['details']) {
    super(code, message, details);
  }
}
export class ValidationError extends DomainError {
  constructor(message: string, details?: DomainError['details']) {
    super('validation_failed', message, details);
  }
}
export class InvalidCredentialsError extends DomainError {
  constructor() {
    super('invalid_credentials', 'E-mail or password is not right');
  }
}
