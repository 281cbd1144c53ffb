// Crestline's benchmarks: `npm run bench` (node --import tsx scripts/bench.ts), or pick
// sections by name: `npm run bench -- worklist`. Each section is a function returning its
// figures; add a section by appending to `sections`.
import { fileURLToPath, pathToFileURL } from 'node:url';
import { gzipSync } from 'node:zlib';
import { build } from 'esbuild';
import { evaluate, type EvaluateInput } from '../src/lib/clinical/index.ts';

export interface BenchFigure {
  label: string;
  value: number;
  unit: string;
  /** Upper target; the figure passes when value < target. */
  target: number;
  /** Lower target instead: the figure passes when value ≥ atLeast. */
  atLeast?: number;
}

export interface BenchSection {
  name: string;
  /** Short name to pick it on the command line. */
  key?: string;
  run: () => Promise<BenchFigure[]> | BenchFigure[];
}

const ECHO_SET: EvaluateInput = {
  templateId: 'echo',
  measurements: {
    rhythm: 'sinus', myocardialDisease: 'no', significantMitralDisease: 'no',
    ivsdCm: 1.0, lviddCm: 5.0, pwdCm: 1.0, lvidsCm: 3.2, aorticRootCm: 3.4, lvefPercent: 60,
    laAreaA4cCm2: 18, laAreaA2cCm2: 17, laLengthA4cCm: 5.0, laLengthA2cCm: 5.2,
    eVelocityCmS: 80, aVelocityCmS: 60, septalEPrimeCmS: 6, lateralEPrimeCmS: 8,
    rvBasalMm: 36, rvMidMm: 29, tapseMm: 22, rvSPrimeCmS: 12, rvFacPercent: 45, raAreaCm2: 15,
    trVelocityMS: 3.0, ivcDiameterCm: 1.8, ivcCollapsePercent: 60, rvWallMm: 4,
  },
  patient: { sex: 'female', birthDate: '1970-03-01', examDate: '2025-03-01', heightCm: 170, weightKg: 70 },
};

const nodule = (lengthMm: number, extra: Partial<NonNullable<EvaluateInput['nodules']>[number]> = {}): NonNullable<EvaluateInput['nodules']>[number] => ({
  lobe: 'right', lengthMm, widthMm: 10, depthMm: 8,
  composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: [], ...extra,
});

const THYROID_SET: EvaluateInput = {
  templateId: 'thyroid',
  measurements: {
    rightLobeLengthCm: 4.8, rightLobeWidthCm: 1.6, rightLobeDepthCm: 1.5,
    leftLobeLengthCm: 4.5, leftLobeWidthCm: 1.5, leftLobeDepthCm: 1.4,
    isthmusThicknessMm: 3, echotexture: 'homogeneous', cervicalNodes: 'no-suspicious',
  },
  nodules: [
    nodule(12, { id: 'N1' }),
    nodule(26, { id: 'N2', lobe: 'left', echogenicity: 'hyperechoic-or-isoechoic' }),
    nodule(11, { id: 'N3', lobe: 'left', shape: 'taller-than-wide', foci: ['punctate'] }),
    nodule(15, { id: 'N4', lobe: 'isthmus', composition: 'spongiform' }),
  ],
  patient: { sex: 'female', birthDate: '1980-05-20', examDate: '2025-05-20' },
};

/** Median wall time in ms of `fn` over `runs` timed calls, after `warmup` untimed ones. */
export function medianMs(fn: () => unknown, runs = 2000, warmup = 500): number {
  for (let i = 0; i < warmup; i += 1) fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i += 1) {
    const start = process.hrtime.bigint();
    fn();
    times.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  times.sort((a, b) => a - b);
  const mid = Math.floor(times.length / 2);
  return times.length % 2 === 0 ? ((times[mid - 1] as number) + (times[mid] as number)) / 2 : (times[mid] as number);
}

function evaluateSection(name: string, input: EvaluateInput): BenchSection {
  return {
    name,
    run: () => {
      const check = evaluate(input);
      if (!check.ok) throw new Error(`${name}: fixture refused: ${JSON.stringify(check.fieldErrors)}`);
      return [{ label: 'median evaluate()', value: medianMs(() => evaluate(input)), unit: 'ms', target: 1 }];
    },
  };
}

const bundleSection: BenchSection = {
  name: 'Engine as shipped to the browser (esbuild, minified, gzip)',
  run: async () => {
    const entry = fileURLToPath(new URL('../src/lib/clinical/index.ts', import.meta.url));
    const out = await build({ entryPoints: [entry], bundle: true, minify: true, format: 'esm', platform: 'browser', write: false, logLevel: 'silent' });
    const bytes = out.outputFiles[0]?.contents ?? new Uint8Array();
    return [
      { label: 'minified', value: bytes.length / 1024, unit: 'KB', target: Infinity },
      { label: 'gzipped', value: gzipSync(bytes, { level: 9 }).length / 1024, unit: 'KB', target: 30 },
    ];
  },
};

export const sections: BenchSection[] = [
  { ...evaluateSection('Evaluate a full echo set', ECHO_SET), key: 'engine' },
  { ...evaluateSection('Evaluate a thyroid set with four nodules', THYROID_SET), key: 'engine' },
  { ...bundleSection, key: 'engine' },
  {
    name: 'Worklist endpoint, 100,000 past exams, 32 connections (autocannon)',
    key: 'worklist',
    run: async () => (await import('./bench/worklist.ts')).worklistBench(),
  },
  {
    name: 'Report autosave, full echo set, 16 connections',
    key: 'report',
    run: async () => (await import('./bench/report-save.ts')).reportSaveBench(),
  },
  {
    name: 'Echo form in Chromium: keystroke to derived value, and the page\'s JavaScript',
    key: 'report',
    run: async () => (await import('./bench/report-form.ts')).reportFormBench(),
  },
  {
    name: 'Signing, password checked again, 8 connections',
    key: 'sign',
    run: async () => (await import('./bench/report-sign.ts')).reportSignBench(),
  },
  {
    name: 'DICOM listener: worklist for a day of 300 exams, and a 20 MB multi-frame object (storescu)',
    key: 'dicom',
    run: async () => (await import('./bench/dicom.ts')).dicomBench(),
  },
  {
    name: 'Final report PDF, full echo report, rendered in-process (pdfkit)',
    key: 'pdf',
    run: async () => (await import('./bench/report-pdf.ts')).reportPdfBench(),
  },
  {
    name: 'Backup of the bench database (100,000 past exams): npm run backup, then restore it',
    key: 'backup',
    run: async () => (await import('./bench/backup.ts')).backupBench(),
  },
  {
    name: 'Clinic dashboard for a year (about 33,000 of the 100,000 bench exams), 20 requests one after the other',
    key: 'dashboard',
    run: async () => (await import('./bench/dashboard.ts')).dashboardBench(),
  },
];

const passes = (f: BenchFigure): boolean => (f.atLeast !== undefined ? f.value >= f.atLeast : f.value < f.target);

const format = (f: BenchFigure): string => {
  const value = f.unit === 'ms' ? f.value.toFixed(f.value < 10 ? 4 : 1) : f.unit === 'ratio' ? f.value.toFixed(2) : f.value.toFixed(1);
  const target =
    f.atLeast !== undefined
      ? `target ≥ ${f.atLeast}  ${passes(f) ? 'ok' : 'MISSED'}`
      : Number.isFinite(f.target)
        ? `target < ${f.target} ${f.unit}  ${passes(f) ? 'ok' : 'MISSED'}`
        : '';
  return `  ${f.label.padEnd(20)} ${`${value} ${f.unit}`.padStart(12)}   ${target}`;
};

/** Run sections in order and print their figures; sets a non-zero exit code if a target is missed. */
export async function runBench(list: readonly BenchSection[] = sections): Promise<void> {
  console.log(`Crestline benchmarks (node ${process.version})`);
  try {
    for (const section of list) {
      console.log(`\n${section.name}`);
      const figures = await section.run();
      for (const f of figures) {
        console.log(format(f));
        if (!passes(f)) process.exitCode = 1;
      }
    }
  } finally {
    // Sections that needed a database and app share one; stop it (and all it started).
    await (await import('./bench/env.ts')).stopBenchEnv();
  }
}

// Run only when invoked directly, so other scripts can import `sections` and `runBench`.
if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const picked = process.argv.slice(2);
  runBench(picked.length ? sections.filter((s) => s.key && picked.includes(s.key)) : sections).catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  });
}
