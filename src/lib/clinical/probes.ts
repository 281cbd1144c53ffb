import type { ProbeKind, TemplateId } from './types';

/** Typical transmit frequency band of each probe kind (CLINICAL.md §7, common practice; exact bands vary by probe). */
export const PROBE_KINDS: Readonly<Record<ProbeKind, { label: string; typicalMHz: readonly [number, number] }>> = {
  linear: { label: 'Linear array', typicalMHz: [5, 15] },
  curvilinear: { label: 'Curvilinear (convex) array', typicalMHz: [2, 5] },
  'phased-array': { label: 'Phased array', typicalMHz: [1, 5] },
};

/** Default probe per exam, common practice: superficial → linear, abdomen → curvilinear, adult TTE → phased array. */
export const DEFAULT_PROBE: Readonly<Record<TemplateId, ProbeKind>> = {
  thyroid: 'linear',
  abdomen: 'curvilinear',
  echo: 'phased-array',
};
