import type { ProvenanceTag } from '../types';

// Section 9 item 7: the surveillance schemes disagree, so each is data and the report names
// the one used. Default SVS 2018: its intervals are the most completely sourced (SRC+) in
// CLINICAL.md; NHS, ACR, ESC 2024 and ESVS 2019 (MEM) can be chosen per clinic.

export type AaaSchemeId = 'svs-2018' | 'acr-2013' | 'nhs-aaa' | 'esc-2024' | 'esvs-2019';
export type AaaConvention = 'inner-to-inner' | 'outer-to-outer' | 'leading-edge';
export type AaaSizeBand = 'below-2.5' | '2.5-2.9' | '3.0-3.4' | '3.5-3.9' | '4.0-4.4' | '4.5-4.9' | '5.0-5.4' | '5.5-plus';

export interface SurveillanceAdvice {
  action: 'none' | 'discharge' | 'rescreen' | 'surveillance' | 'refer';
  /** Shortest interval of the advice in months; null when the scheme gives none. */
  intervalMonths: number | null;
  text: string;
  provenance: ProvenanceTag;
}

/** One band's advice, the same for both sexes or split by sex. */
export type BandAdvice = { any: SurveillanceAdvice } | { male: SurveillanceAdvice; female: SurveillanceAdvice };

export interface AaaScheme {
  id: AaaSchemeId;
  name: string;
  source: string;
  /** Measurement convention the scheme is defined for, when it names one. */
  convention: AaaConvention | null;
  bands: Readonly<Record<AaaSizeBand, BandAdvice>>;
}

const adv = (action: SurveillanceAdvice['action'], intervalMonths: number | null, text: string, provenance: ProvenanceTag): BandAdvice => ({
  any: { action, intervalMonths, text, provenance },
});
const none = (provenance: ProvenanceTag): BandAdvice => adv('none', null, 'no surveillance interval given by this scheme', provenance);

export const AAA_SCHEMES: Readonly<Record<AaaSchemeId, AaaScheme>> = {
  'svs-2018': {
    id: 'svs-2018',
    name: 'SVS 2018',
    source: 'Chaikof EL et al. J Vasc Surg 2018;67:2–77',
    convention: 'outer-to-outer',
    bands: {
      'below-2.5': none('CP'),
      '2.5-2.9': adv('rescreen', 120, 're-screen after 10 years', 'SRC+'),
      '3.0-3.4': adv('surveillance', 36, 'ultrasound every 3 years', 'SRC+'),
      '3.5-3.9': adv('surveillance', 36, 'ultrasound every 3 years', 'SRC+'),
      '4.0-4.4': adv('surveillance', 12, 'ultrasound every 12 months', 'SRC+'),
      '4.5-4.9': adv('surveillance', 12, 'ultrasound every 12 months', 'SRC+'),
      '5.0-5.4': adv('surveillance', 6, 'ultrasound every 6 months', 'SRC+'),
      '5.5-plus': adv('refer', null, 'at the repair threshold (men): vascular surgical review', 'SRC~'),
    },
  },
  'acr-2013': {
    id: 'acr-2013',
    name: 'ACR incidental findings 2013',
    source: 'Khosa F et al. J Am Coll Radiol 2013;10:789–794',
    convention: null,
    bands: {
      'below-2.5': none('CP'),
      '2.5-2.9': adv('rescreen', 60, 'ultrasound in 5 years', 'SRC+'),
      '3.0-3.4': adv('surveillance', 36, 'ultrasound every 3 years', 'SRC+'),
      '3.5-3.9': adv('surveillance', 24, 'ultrasound every 2 years', 'SRC+'),
      '4.0-4.4': adv('surveillance', 12, 'ultrasound every year', 'SRC+'),
      '4.5-4.9': adv('surveillance', 6, 'ultrasound every 6 months; consider vascular referral', 'SRC+'),
      '5.0-5.4': adv('surveillance', 3, 'ultrasound every 3–6 months; consider vascular referral', 'SRC+'),
      '5.5-plus': adv('refer', null, 'vascular referral (implied; the retrieved table stops at 5.5 cm)', 'MEM'),
    },
  },
  'nhs-aaa': {
    id: 'nhs-aaa',
    name: 'NHS AAA Screening Programme',
    source: 'NHS AAA Screening Programme care pathway (GOV.UK, 2021)',
    convention: 'inner-to-inner',
    bands: {
      'below-2.5': adv('discharge', null, 'below 3.0 cm: discharged from screening', 'SRC+'),
      '2.5-2.9': adv('discharge', null, 'below 3.0 cm: discharged from screening', 'SRC+'),
      '3.0-3.4': adv('surveillance', 12, 'surveillance every 12 months', 'SRC+'),
      '3.5-3.9': adv('surveillance', 12, 'surveillance every 12 months', 'SRC+'),
      '4.0-4.4': adv('surveillance', 12, 'surveillance every 12 months', 'SRC+'),
      '4.5-4.9': adv('surveillance', 3, 'surveillance every 3 months', 'SRC+'),
      '5.0-5.4': adv('surveillance', 3, 'surveillance every 3 months', 'SRC+'),
      '5.5-plus': adv('refer', null, 'refer to a vascular surgeon', 'SRC+'),
    },
  },
  'esc-2024': {
    id: 'esc-2024',
    name: 'ESC 2024 (as quoted secondarily)',
    source: '2024 ESC Guidelines for peripheral arterial and aortic diseases, Eur Heart J 2024',
    convention: null,
    bands: {
      'below-2.5': none('CP'),
      '2.5-2.9': adv('rescreen', null, 're-screen; interval uncertain (secondary sources disagree)', 'SRC~'),
      '3.0-3.4': adv('surveillance', 36, 'ultrasound every 3 years', 'SRC~'),
      '3.5-3.9': adv('surveillance', 36, 'ultrasound every 3 years', 'SRC~'),
      '4.0-4.4': adv('surveillance', 12, 'ultrasound every 12 months', 'SRC~'),
      '4.5-4.9': {
        male: { action: 'surveillance', intervalMonths: 12, text: 'ultrasound every 12 months (men)', provenance: 'SRC~' },
        female: { action: 'surveillance', intervalMonths: 6, text: 'ultrasound every 6 months (women)', provenance: 'SRC~' },
      },
      '5.0-5.4': {
        male: { action: 'surveillance', intervalMonths: 6, text: 'ultrasound every 6 months (men)', provenance: 'SRC~' },
        female: { action: 'refer', intervalMonths: null, text: 'at the repair threshold (women): vascular surgical review', provenance: 'SRC~' },
      },
      '5.5-plus': adv('refer', null, 'at the repair threshold: vascular surgical review', 'SRC~'),
    },
  },
  'esvs-2019': {
    id: 'esvs-2019',
    name: 'ESVS 2019 (from memory, unverified)',
    source: 'Wanhainen A et al. Eur J Vasc Endovasc Surg 2019;57:8–93',
    convention: null,
    bands: {
      'below-2.5': none('MEM'),
      '2.5-2.9': none('MEM'),
      '3.0-3.4': adv('surveillance', 36, 'ultrasound every 3 years', 'MEM'),
      '3.5-3.9': adv('surveillance', 36, 'ultrasound every 3 years', 'MEM'),
      '4.0-4.4': adv('surveillance', 12, 'ultrasound every year', 'MEM'),
      '4.5-4.9': adv('surveillance', 12, 'ultrasound every year', 'MEM'),
      '5.0-5.4': adv('surveillance', 3, 'ultrasound every 3–6 months', 'MEM'),
      '5.5-plus': adv('surveillance', 3, 'ultrasound every 3–6 months', 'MEM'),
    },
  },
};

export const DEFAULT_AAA_SCHEME: AaaSchemeId = 'svs-2018';
