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
      // A second line of defence only: code must not pass patient data to the logger at all.
      // (Not `name`: error and model names are logged on purpose.)
      paths: ['password', '*.password', 'email', '*.email', 'headers.cookie', 'familyName', 'givenName', '*.familyName', '*.givenName'],
      censor: '[redacted]',
    },
  },
  // Asynchronous writes: a busy server coalesces lines instead of one blocking write per
  // request; flushed on exit so the last lines are not lost.
  pino.destination({ dest: 1, sync: false }),
);
process.once('exit', () => log.flush());
