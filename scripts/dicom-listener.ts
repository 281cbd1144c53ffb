/**
 * Crestline's DICOM listener: the scanners query the worklist (C-FIND), report procedure steps
 * (MPPS) and send images and structured reports (C-STORE) here. Started by `npm start` and
 * `npm test`; a clinic server runs it as its own service. Reads the same environment as the
 * web server, plus DICOM_HOST, DICOM_PORT and DICOM_AE_TITLE.
 */
import { closeDb } from '../src/db/connection';
import { config } from '../src/server/config';
import { startDicomListener } from '../src/server/dicom/listener';
import { log } from '../src/server/log';

const { DICOM_HOST: host, DICOM_PORT: port, DICOM_AE_TITLE: aeTitle } = config();
try {
  const listener = await startDicomListener({ host, port, aeTitle });
  log.info({ host, port, aeTitle }, 'DICOM listener started');
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    listener.close();
    await closeDb();
    log.info('DICOM listener stopped');
    process.exit(0);
  };
  for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => void stop());
} catch (error) {
  log.error({ host, port, err: { name: (error as Error)?.name, message: (error as Error)?.message } }, 'DICOM listener could not start');
  process.exit(1);
}
