/**
 * Logger settings shared by the server and the tests that prove no API key
 * reaches the log. Fastify's request serializer does not print headers, but any
 * line that does (a debugging serializer, an error with the request attached)
 * goes through these redaction paths first.
 */
export const LOG_REDACT_PATHS: readonly string[] = Object.freeze([
  'req.headers.authorization',
  'req.headers["x-api-key"]',
  'req.headers["proxy-authorization"]',
  'req.headers.cookie',
]);

export const LOG_REDACT_CENSOR = '[redacted]';

export interface ServiceLoggerOptions {
  level: string;
  redact: { paths: string[]; censor: string };
}

export function serviceLoggerOptions(level: string): ServiceLoggerOptions {
  return { level, redact: { paths: [...LOG_REDACT_PATHS], censor: LOG_REDACT_CENSOR } };
}
