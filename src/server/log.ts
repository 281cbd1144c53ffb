import pino from 'pino';

/**
 * The one structured logger. Log identifiers (user id, exam id, accession number), never
 * patient names, birth dates or report text; the redact list is a second line of defence.
 */
export const log = pino(
  {
    level: process.env.LOG_LEVEL ?? 'info',
    base: { app: 'crestline' },
    redact: {
      paths: ['password', '*.password', 'email', '*.email', 'name', '*.name', 'headers.cookie'],
      censor: '[redacted]',
    },
  },
  // Buffered writes (one line per request would otherwise be one synchronous write each);
  // flushed on exit so the last lines are not lost.
  pino.destination({ dest: 1, sync: false, minLength: 4096 }),
);
process.once('exit', () => log.flush());
