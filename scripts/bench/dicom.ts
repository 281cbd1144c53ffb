/**
 * The DICOM listener under the scanners' two heavy jobs, on the bench database (100,000 past
 * exams): the worklist query for a day with 300 scheduled exams (C-FIND sent by dcmtk's findscu,
 * as the tests' scanner does), and storing a 20 MB
 * multi-frame ultrasound object sent by dcmtk's storescu (the whole run of the tool, so process
 * start and association are counted against us too).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { BenchFigure } from '../bench.ts';
import { freePort } from '../lib/net.mjs';
import { startDicomListener } from '../lib/standins.mjs';
import { makeUltrasoundDicom, newUid } from '../../tests/helpers/dicom.ts';
import { benchEnv, root } from './env.ts';

const AE = 'CRESTLINE';
const SCHEDULED = 300;
const MB = 1024 * 1024;

/** 300 booked exams across the three rooms, 30 days ahead, every 5 minutes per room from 07:00. */
const BOOK_DAY = `
INSERT INTO exams (accession_number, patient_id, exam_type_id, referrer_id, room_id, scanner_id, sonographer_id,
  scheduled_start, scheduled_end, duration_minutes, status, priority, indication, study_instance_uid, price_cents,
  currency, payer, deposit_cents, payment_state, version, created_at, updated_at)
SELECT CONCAT('W', LPAD(seq, 9, '0')), 1 + seq MOD 40, 1 + seq MOD 3, 1 + seq MOD 10, r.id, s.id, u.id,
  DATE_ADD(DATE_ADD(UTC_DATE(), INTERVAL 30 DAY), INTERVAL 13 * 60 + (seq DIV 3) * 5 MINUTE),
  DATE_ADD(DATE_ADD(UTC_DATE(), INTERVAL 30 DAY), INTERVAL 13 * 60 + (seq DIV 3) * 5 + 5 MINUTE), 5,
  IF(seq = 0, 'arrived', 'booked'), 'routine', 'Bench exam', CONCAT('2.25.8', seq), 18000, 'USD', 'insured', 0, 'none', 0, NOW(), NOW()
FROM seq_0_to_${SCHEDULED - 1}
JOIN (SELECT id, ROW_NUMBER() OVER (ORDER BY id) - 1 AS k FROM rooms) r ON r.k = seq MOD 3
JOIN scanners s ON s.room_id = r.id
JOIN (SELECT id, ROW_NUMBER() OVER (ORDER BY id) - 1 AS k FROM users WHERE role = 'sonographer') u ON u.k = seq MOD 3`;

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

/** Keys a scanner asks for in its worklist query (dcmtk's -k syntax), for a given day. */
const worklistKeys = (day: string) =>
  ['PatientName', 'PatientID', 'PatientBirthDate', 'PatientSex', 'AccessionNumber', 'StudyInstanceUID', 'RequestedProcedureDescription', 'ReferringPhysicianName',
    '(0040,0100)[0].Modality=US', '(0040,0100)[0].ScheduledStationAETitle', `(0040,0100)[0].ScheduledProcedureStepStartDate=${day}`,
    '(0040,0100)[0].ScheduledProcedureStepStartTime', '(0040,0100)[0].ScheduledProcedureStepDescription'].flatMap((k) => ['-k', k]);

/** One quiet run of findscu, as a scanner would query (printing nothing); wall time in ms. */
function findscu(port: number, callingAe: string, day: string): number {
  const started = process.hrtime.bigint();
  execFileSync('findscu', ['-q', '-W', '-aet', callingAe, '-aec', AE, ...worklistKeys(day), '127.0.0.1', String(port)], { stdio: 'ignore' });
  return Number(process.hrtime.bigint() - started) / 1e6;
}

/** The answers findscu reports for the day (an untimed run that prints them). */
function countAnswers(port: number, callingAe: string, day: string): number {
  const run = spawnSync('findscu', ['-W', '-aet', callingAe, '-aec', AE, ...worklistKeys(day), '127.0.0.1', String(port)], { encoding: 'utf8' });
  return ((run.stdout ?? '') + (run.stderr ?? '')).match(/Find Response: \d+ \(Pending\)/g)?.length ?? 0;
}

const median = (xs: number[]) => percentile([...xs].sort((a, b) => a - b), 50);

export async function dicomBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  e.sql(`USE crestline_bench; DELETE FROM exams WHERE accession_number LIKE 'W%' AND id NOT IN (SELECT exam_id FROM attachments WHERE exam_id IS NOT NULL); ${BOOK_DAY.replace(/\n/g, ' ')}`);
  const scannerAe = e.sql('SELECT ae_title FROM crestline_bench.scanners ORDER BY id LIMIT 1');
  const date = e.sql("SELECT DATE_FORMAT(DATE_ADD(UTC_DATE(), INTERVAL 30 DAY), '%Y%m%d')");
  const port = await freePort();
  // The objects stored here are thrown away afterwards (20 MB each; they would pile up run after run).
  const dataDir = mkdtempSync(path.join(tmpdir(), 'crestline-bench-dicom-'));
  const listener = await startDicomListener(root, { ...e.env, DATA_DIR: dataDir, DICOM_AE_TITLE: AE }, { host: '127.0.0.1', port, logFile: 'ignore' });
  try {
    // Worklist: findscu (dcmtk, the scanner of the tests) for the day of 300 exams and for an empty
    // day, 30 runs each after 5 warm-ups. The answer time is the difference: the empty day's run
    // is the tool's own start, the association and its release, which do not depend on the day.
    const emptyDay = '20300101';
    for (let i = 0; i < 5; i += 1) {
      findscu(port, scannerAe, date);
      findscu(port, scannerAe, emptyDay);
    }
    const full: number[] = [];
    const empty: number[] = [];
    const answers = countAnswers(port, scannerAe, date);
    for (let i = 0; i < 30; i += 1) {
      full.push(findscu(port, scannerAe, date));
      empty.push(findscu(port, scannerAe, emptyDay));
    }
    const answerTimes = full.map((ms, i) => ms - empty[i]!).sort((a, b) => a - b);
    console.log(`  (worklist for ${date}: ${answers} answers per query; findscu run ${median(full).toFixed(0)} ms for the day, ${median(empty).toFixed(0)} ms for an empty day)`);

    // Store: a multi-frame ultrasound object of about 20 MB for the arrived exam, sent 5 times (new UIDs each).
    const exam = e.sql("SELECT CONCAT(p.mrn, ' ', e.accession_number, ' ', e.study_instance_uid) FROM crestline_bench.exams e JOIN crestline_bench.patients p ON p.id = e.patient_id WHERE e.accession_number = 'W000000000'").split(' ');
    const dir = mkdtempSync(path.join(tmpdir(), 'crestline-bench-store-'));
    const rates: number[] = [];
    let size = 0;
    try {
      for (let i = 0; i < 6; i += 1) {
        const file = path.join(dir, `cine-${i}.dcm`);
        const bytes = makeUltrasoundDicom({ patientId: exam[0]!, accessionNumber: exam[1]!, studyInstanceUid: exam[2]!, sopInstanceUid: newUid(), sopClassUid: '1.2.840.10008.5.1.4.1.1.3.1', rows: 480, columns: 640, photometric: 'RGB', frames: 23 });
        writeFileSync(file, bytes);
        size = bytes.length;
        const started = process.hrtime.bigint();
        execFileSync('storescu', ['-aet', scannerAe, '-aec', AE, '127.0.0.1', String(port), file], { stdio: 'ignore' });
        const seconds = Number(process.hrtime.bigint() - started) / 1e9;
        if (i > 0) rates.push(size / MB / seconds); // the first one warms up
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    rates.sort((a, b) => a - b);
    const filed = e.sql("SELECT COUNT(*) FROM crestline_bench.attachments a JOIN crestline_bench.exams e ON e.id = a.exam_id WHERE e.accession_number = 'W000000000'");
    console.log(`  (object of ${(size / MB).toFixed(1)} MB, 5 timed sends; ${filed} objects filed on the exam so far)`);
    return [
      { label: 'C-FIND 300, median', value: percentile(answerTimes, 50), unit: 'ms', target: 100 },
      { label: 'C-FIND 300, p95', value: percentile(answerTimes, 95), unit: 'ms', target: Infinity },
      { label: 'findscu run, 300', value: median(full), unit: 'ms', target: Infinity },
      { label: 'C-STORE 20 MB, median', value: percentile(rates, 50), unit: 'MB/s', target: Infinity, atLeast: 50 },
      { label: 'C-STORE 20 MB, worst', value: rates[0]!, unit: 'MB/s', target: Infinity },
    ];
  } finally {
    await listener.stop();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
