// Urgent-finding prompts (CLINICAL.md §4). A prompt only asks the physician to consider direct
// communication; the communication itself is logged by a person. Categories follow the ACR
// Actionable Reporting Work Group (1 minutes, 2 hours, 3 days); the list is the clinic's to
// approve, so every rule has a stable id and can be switched off per clinic.

export type UrgentRuleId =
  | 'aaa-repair-threshold'
  | 'aaa-rapid-growth'
  | 'lvef-severe'
  | 'tirads-tr5-fna'
  | 'thyroid-extrathyroidal-extension'
  | 'thyroid-suspicious-nodes';

export interface UrgentRule {
  id: UrgentRuleId;
  category: 1 | 2 | 3;
  description: string;
  source: string;
}

export const URGENT_RULES: Readonly<Record<UrgentRuleId, UrgentRule>> = {
  'aaa-repair-threshold': {
    id: 'aaa-repair-threshold',
    category: 2,
    description: 'Asymptomatic AAA at the repair threshold (≥ 5.5 cm men, ≥ 5.0 cm women): prompt vascular referral',
    source: 'common practice; thresholds SVS/ESVS (SRC~)',
  },
  'aaa-rapid-growth': {
    id: 'aaa-rapid-growth',
    category: 3,
    description: 'AAA growth ≥ 1.0 cm/year or ≥ 0.5 cm in 6 months',
    source: 'SVS/ESVS summaries (SRC~)',
  },
  'lvef-severe': {
    id: 'lvef-severe',
    category: 2,
    description: 'Severe LV dysfunction (LVEF in the ASE severe band, < 30 %)',
    source: 'common practice; band from Lang et al. JASE 2015',
  },
  'tirads-tr5-fna': {
    id: 'tirads-tr5-fna',
    category: 3,
    description: 'TR5 nodule meeting FNA size',
    source: 'common practice; levels per Tessler et al. JACR 2017',
  },
  'thyroid-extrathyroidal-extension': {
    id: 'thyroid-extrathyroidal-extension',
    category: 3,
    description: 'Nodule with extrathyroidal extension',
    source: 'common practice',
  },
  'thyroid-suspicious-nodes': {
    id: 'thyroid-suspicious-nodes',
    category: 3,
    description: 'Suspicious cervical lymph nodes',
    source: 'common practice',
  },
};

/** Build a prompt for a rule, e.g. `urgentPrompt('tirads-tr5-fna', 'Nodule 2: TR5, 1.2 cm')`. */
export function urgentPrompt(ruleId: UrgentRuleId, detail: string): { ruleId: UrgentRuleId; category: 1 | 2 | 3; message: string } {
  const rule = URGENT_RULES[ruleId];
  return { ruleId, category: rule.category, message: `${rule.description}. ${detail}` };
}
