/** Report statuses after FHIR's DiagnosticReport vocabulary (DESIGN.md). */
export const REPORT_STATUSES = ['draft', 'preliminary', 'final', 'amended'] as const;
export type ReportStatus = (typeof REPORT_STATUSES)[number];

export const REPORT_STATUS_LABELS: Record<ReportStatus, string> = {
  draft: 'Draft',
  preliminary: 'Preliminary',
  final: 'Final',
  amended: 'Amended',
};
