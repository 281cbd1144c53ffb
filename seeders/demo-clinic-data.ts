/** The demo clinic's fixed facts. All names, addresses and numbers are invented. */
import accounts from './demo-accounts.json';

/** Shared by every demo account; printed by `npm start`. Demo only. */
export const DEMO_PASSWORD: string = accounts.password;
export const DEMO_USERS = accounts.users;

export const CLINIC = {
  name: 'Fernhollow Ultrasound Clinic',
  addressLines: ['220 Willow Terrace, Suite 3', 'Alderbrook, ST 40917'],
  phone: '+1 555 0100 300',
  email: 'hello@fernhollow.test',
  timeZone: 'America/Chicago',
  currency: 'USD',
};


export const EXAM_TYPES = [
  {
    code: 'thyroid',
    name: 'Thyroid ultrasound',
    templateId: 'thyroid',
    durationMinutes: 30,
    probeKind: 'linear' as const,
    preparationText: 'No preparation is needed. Wear a top that leaves the neck free, and bring any earlier neck scans.',
    selfPayPriceCents: 18_000,
    depositCents: 5_000,
    currency: 'USD',
  },
  {
    code: 'abdomen-complete',
    name: 'Abdomen, complete',
    templateId: 'abdomen',
    durationMinutes: 45,
    probeKind: 'curvilinear' as const,
    preparationText: 'Nothing to eat for 8 hours before the scan; plain water is fine. Take your usual medicines with a little water.',
    selfPayPriceCents: 26_000,
    depositCents: 7_500,
    currency: 'USD',
  },
  {
    code: 'echo-tte',
    name: 'Echocardiogram, transthoracic',
    templateId: 'echo',
    durationMinutes: 60,
    probeKind: 'phased-array' as const,
    preparationText: 'No preparation is needed. Take your usual medicines. Please bring a list of them.',
    selfPayPriceCents: 42_000,
    depositCents: 10_000,
    currency: 'USD',
  },
];

export const ROOMS = [
  {
    name: 'Room 1',
    scanner: 'Scanner, room 1',
    aeTitle: 'FHUS01',
    sonographer: 'sono1',
    examCodes: ['thyroid', 'abdomen-complete'],
    probes: [
      { kind: 'linear' as const, modelLabel: 'Linear 4–15', minFrequencyMhz: 4, maxFrequencyMhz: 15 },
      { kind: 'curvilinear' as const, modelLabel: 'Curved 1–6', minFrequencyMhz: 1, maxFrequencyMhz: 6 },
    ],
  },
  {
    name: 'Room 2',
    scanner: 'Scanner, room 2',
    aeTitle: 'FHUS02',
    sonographer: 'sono2',
    examCodes: ['abdomen-complete', 'thyroid'],
    probes: [
      { kind: 'linear' as const, modelLabel: 'Linear 5–14', minFrequencyMhz: 5, maxFrequencyMhz: 14 },
      { kind: 'curvilinear' as const, modelLabel: 'Curved 2–5', minFrequencyMhz: 2, maxFrequencyMhz: 5 },
    ],
  },
  {
    name: 'Room 3 (cardiac)',
    scanner: 'Scanner, room 3',
    aeTitle: 'FHUS03',
    sonographer: 'sono3',
    examCodes: ['echo-tte'],
    probes: [
      { kind: 'phased-array' as const, modelLabel: 'Phased 1–5', minFrequencyMhz: 1, maxFrequencyMhz: 5 },
      { kind: 'curvilinear' as const, modelLabel: 'Curved 1–6 (cardiac room)', minFrequencyMhz: 1, maxFrequencyMhz: 6 },
    ],
  },
];

export const INDICATIONS: Record<string, string[]> = {
  thyroid: ['Palpable nodule, left neck', 'Follow-up of a known thyroid nodule', 'Low TSH, goitre on examination', 'Neck swelling for assessment'],
  'abdomen-complete': ['Right upper quadrant pain after meals', 'Raised liver enzymes', 'Abdominal aortic aneurysm surveillance', 'Unexplained weight loss'],
  'echo-tte': ['Breathlessness on exertion', 'Hypertension: assess for LV hypertrophy', 'New systolic murmur', 'Palpitations'],
};
