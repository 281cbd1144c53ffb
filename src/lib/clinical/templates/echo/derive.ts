import { derivedSink, type DerivedSink } from '../../evaluate/derived';
import type { Assessments, DeriveOutput, EvalContext } from '../../evaluate/types';
import { AORTIC_ROOT_METHOD, aorticRootZDevereux, DEVEREUX_MIN_AGE_YEARS, expectedAorticRootDevereuxCm } from '../../formulas/aortic-root';
import { BSA_METHOD_LABELS, indexToBsa } from '../../formulas/bsa';
import { diastolicFunction2016, type DiastolicBranch } from '../../formulas/diastolic';
import { averageEOverEPrime, bernoulliGradientMmHg, eOverA, eOverEPrime, estimateRapFromIvc, rvspMmHg } from '../../formulas/doppler';
import { laLengthsDisagree, laVolumeBiplaneAreaLengthMl } from '../../formulas/atrium';
import { fractionalShorteningPercent, lvGeometry, lvMassAseLinearG, relativeWallThickness, teichholzEfPercent, teichholzVolumeMl } from '../../formulas/lv';
import { classifyValue, SEX_NOT_APPLIED, selectReference } from '../../reference/classify';
import { ECHO_DERIVED } from './fields';

function deriveLv(ctx: EvalContext, sink: DerivedSink, notes: NonNullable<Assessments['notes']>): Assessments['lvGeometry'] {
  const { read, bsa } = ctx;
  const ivsd = read.number('ivsdCm', 'cm');
  const lvidd = read.number('lviddCm', 'cm');
  const pwd = read.number('pwdCm', 'cm');
  const lvids = read.number('lvidsCm', 'cm');
  const indexed = bsa === null ? null : { bsaMethod: bsa.method };
  if (lvidd !== null && bsa !== null) sink.add('lviddIndexCmM2', indexToBsa(lvidd, bsa.valueM2), { ...indexed });
  if (lvidd !== null && lvids !== null) {
    sink.add('fsPercent', fractionalShorteningPercent(lvidd, lvids));
    sink.add('teichholzEdvMl', teichholzVolumeMl(lvidd), { method: 'Teichholz' });
    sink.add('teichholzEsvMl', teichholzVolumeMl(lvids), { method: 'Teichholz' });
    sink.add('teichholzEfPercent', teichholzEfPercent(lvidd, lvids), { method: 'Teichholz; not used for the LVEF category' });
  }
  if (ivsd === null || lvidd === null || pwd === null) return null;
  const mass = sink.add('lvMassG', lvMassAseLinearG(ivsd, lvidd, pwd), { method: 'ASE linear method (Devereux-corrected cube)' });
  const rwt = sink.add('rwt', relativeWallThickness(pwd, lvidd)).value;
  if (bsa === null) {
    notes.lvGeometry = 'BSA not available (height or weight missing)';
    return null;
  }
  const lvmi = sink.add('lvmiGM2', indexToBsa(mass.value, bsa.valueM2), { method: 'ASE linear method', bsaMethod: bsa.method }).value;
  const sel = selectReference(ctx.referenceRanges, 'lvmi', ctx.sex, ctx.ageYears);
  if (sel.kind !== 'row' || sel.row.normalMax === null) {
    notes.lvGeometry = sel.kind === 'row' ? 'no LVMI limit' : sel.reason;
    return null;
  }
  return lvGeometry(lvmi, rwt, sel.row.normalMax);
}

// Branch of the 2016 algorithm. With sex unknown the LVEF is classified against both sexes'
// rows, and a branch is chosen only if both agree (they differ only at 52–53 %).
function diastolicBranch(ctx: EvalContext): DiastolicBranch | string {
  if (ctx.read.choice('rhythm') === 'atrial-fibrillation') return 'not applicable in atrial fibrillation';
  if (ctx.read.choice('significantMitralDisease') === 'yes') return 'not applicable with significant mitral valve disease';
  if (ctx.read.choice('myocardialDisease') === 'yes') return 'reduced-ef-or-myocardial-disease';
  const ef = ctx.read.number('lvefPercent', '%');
  if (ef === null) return 'cannot choose the algorithm branch: LVEF not available';
  const sexes = ctx.sex === null ? (['male', 'female'] as const) : [ctx.sex];
  const reduced = sexes.map((sex) => {
    const sel = selectReference(ctx.referenceRanges, 'lvef', sex, ctx.ageYears);
    return sel.kind === 'row' ? classifyValue(sel.row, ef, '%').status === 'low' : null;
  });
  if (reduced.includes(null)) return 'cannot choose the algorithm branch: no LVEF reference';
  if (reduced.every((r) => r === reduced[0])) return reduced[0] === true ? 'reduced-ef-or-myocardial-disease' : 'normal-ef';
  return `cannot choose the algorithm branch: LVEF is near the sex-specific limit and ${SEX_NOT_APPLIED}`;
}

function deriveDoppler(ctx: EvalContext, sink: DerivedSink): Assessments['rap'] {
  const { read } = ctx;
  const e = read.number('eVelocityCmS', 'cm/s');
  const a = read.number('aVelocityCmS', 'cm/s');
  const septal = read.number('septalEPrimeCmS', 'cm/s');
  const lateral = read.number('lateralEPrimeCmS', 'cm/s');
  if (e !== null && a !== null) sink.add('eOverA', eOverA(e, a));
  if (e !== null && septal !== null && lateral !== null) sink.add('eOverEPrimeAverage', averageEOverEPrime(e, septal, lateral));
  // A single-site ratio is reported (and graded) only when the average cannot be formed.
  else if (e !== null && septal !== null) sink.add('eOverEPrimeSeptal', eOverEPrime(e, septal));
  else if (e !== null && lateral !== null) sink.add('eOverEPrimeLateral', eOverEPrime(e, lateral));
  const tr = read.number('trVelocityMS', 'm/s');
  if (tr !== null) sink.add('trGradientMmHg', bernoulliGradientMmHg(tr), { method: 'simplified Bernoulli 4v²' });
  const ivc = read.number('ivcDiameterCm', 'cm');
  const collapse = read.number('ivcCollapsePercent', '%');
  const rap = ivc === null || collapse === null ? null : estimateRapFromIvc(ivc, collapse);
  if (rap !== null) sink.add('rapMmHg', rap.rapMmHg, { method: 'IVC size and collapse (Rudski 2010)' });
  if (rap !== null && tr !== null) sink.add('rvspMmHg', rvspMmHg(tr, rap.rapMmHg), { method: '4·TRVmax² + RAP' });
  return rap;
}

/** BSA, LV mass and geometry, LA volume, Doppler indices, RAP/RVSP, diastolic grade and root z-score. */
export function deriveEcho(ctx: EvalContext): DeriveOutput {
  const sink = derivedSink(ECHO_DERIVED);
  const notes: NonNullable<Assessments['notes']> = {};
  const { read, bsa } = ctx;
  if (bsa !== null) sink.add('bsaM2', bsa.valueM2, { method: BSA_METHOD_LABELS[bsa.method], bsaMethod: bsa.method });
  else notes.bsa = 'height or weight missing: indexed values not calculated';

  const lvGeometryResult = deriveLv(ctx, sink, notes);

  const la = [read.number('laAreaA4cCm2', 'cm2'), read.number('laAreaA2cCm2', 'cm2'), read.number('laLengthA4cCm', 'cm'), read.number('laLengthA2cCm', 'cm')] as const;
  if (la[0] !== null && la[1] !== null && la[2] !== null && la[3] !== null) {
    const k = ctx.options.laAreaLengthConstant;
    const volume = sink.add('laVolumeMl', laVolumeBiplaneAreaLengthMl(la[0], la[1], la[2], la[3], k), { method: `biplane area-length, constant ${k}` });
    if (laLengthsDisagree(la[2], la[3])) notes.la = 'the two LA lengths differ by more than 5 mm';
    if (bsa !== null) sink.add('laviMlM2', indexToBsa(volume.value, bsa.valueM2), { method: 'biplane area-length', bsaMethod: bsa.method });
  }

  const rap = deriveDoppler(ctx, sink);

  const branch = diastolicBranch(ctx);
  let diastolic: Assessments['diastolic'] = null;
  if (branch === 'normal-ef' || branch === 'reduced-ef-or-myocardial-disease') {
    diastolic = diastolicFunction2016(branch, {
      eVelocityCmS: read.number('eVelocityCmS', 'cm/s'),
      aVelocityCmS: read.number('aVelocityCmS', 'cm/s'),
      septalEPrimeCmS: read.number('septalEPrimeCmS', 'cm/s'),
      lateralEPrimeCmS: read.number('lateralEPrimeCmS', 'cm/s'),
      trVelocityMS: read.number('trVelocityMS', 'm/s'),
      laviMlM2: sink.get('laviMlM2')?.value ?? null,
    });
  } else notes.diastolic = branch;

  const root = read.number('aorticRootCm', 'cm');
  if (root !== null) {
    if (bsa === null) notes.aorticRoot = 'BSA not available';
    else if (ctx.sex === null) notes.aorticRoot = SEX_NOT_APPLIED;
    else if (ctx.ageYears < DEVEREUX_MIN_AGE_YEARS) notes.aorticRoot = 'Devereux regression applies above 15 years';
    else {
      const meta = { method: AORTIC_ROOT_METHOD, bsaMethod: bsa.method };
      sink.add('aorticRootExpectedCm', expectedAorticRootDevereuxCm(ctx.ageYears, bsa.valueM2, ctx.sex), meta);
      sink.add('aorticRootZ', aorticRootZDevereux(root, ctx.ageYears, bsa.valueM2, ctx.sex), meta);
    }
  }
  return { derived: sink.list, assessments: { lvGeometry: lvGeometryResult, diastolic, rap, notes } };
}
