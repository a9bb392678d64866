import {
  BadRequestException,
  ParseUUIDPipe,
  type ValidationError,
  ValidationPipe,
} from '@nestjs/common';

function collect(errors: ValidationError[], prefix: string, out: Record<string, string[]>): void {
  for (const e of errors) {
    const key = prefix ? `${prefix}.${e.property}` : e.property;
    if (e.constraints) out[key] = Object.values(e.constraints);
    if (e.children?.length) collect(e.children, key, out);
  }
}

/**
 * One validation pipe for every route: unknown properties are refused (whitelist +
 * forbidNonWhitelisted) and the error body carries a sentence plus the messages per field.
 */
export function createValidationPipe(): ValidationPipe {
  return new ValidationPipe({
    whitelist: true,
    forbidNonWhitelisted: true,
    transform: true,
    stopAtFirstError: false,
    exceptionFactory: (errors) => {
      const fields: Record<string, string[]> = {};
      collect(errors, '', fields);
      const first = Object.values(fields)[0]?.[0];
      const message =
        Object.keys(fields).length === 1 && first
          ? first
          : `Please correct these fields and try again: ${Object.entries(fields)
              .map(([k, v]) => `${k} (${v.join('; ')})`)
              .join(', ')}.`;
      return new BadRequestException({ statusCode: 400, message, fields });
    },
  });
}

/** Parses an id route parameter; a malformed one gets a sentence instead of a parser message. */
export function idParam(what: string): ParseUUIDPipe {
  return new ParseUUIDPipe({
    exceptionFactory: () =>
      new BadRequestException(`This ${what} id is not valid. Reload the page and try again.`),
  });
}
