import type { ClinicProfile } from '../../lib/schemas/clinic';
import { formatMoney } from '../../lib/booking/refunds';

/** A rendered message: subject, plain text and HTML with the same content. */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

export interface ExamFacts {
  patientName: string;
  examTypeName: string;
  accessionNumber: string;
  /** Already in the clinic's words and time zone, e.g. "Thu 3 Dec 2026 at 09:15". */
  when: string;
  room: string;
  preparation: string;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function layout(clinic: ClinicProfile, heading: string, paragraphs: string[]): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 12px">${p}</p>`).join('');
  return `<!doctype html><html lang="en"><body style="margin:0;background:#f4f6f9;font-family:Arial,Helvetica,sans-serif;color:#1f2b3b">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border-radius:10px;border-top:4px solid #1b7a6c">
<tr><td style="padding:24px 28px">
<p style="margin:0 0 4px;font-size:13px;color:#4c6079">${esc(clinic.name)}</p>
<h1 style="margin:0 0 16px;font-size:20px">${esc(heading)}</h1>${body}
<p style="margin:20px 0 0;font-size:12px;color:#6c7f99">${esc(clinic.addressLines.join(', '))}${clinic.phone ? ' · ' + esc(clinic.phone) : ''}</p>
</td></tr></table></td></tr></table></body></html>`;
}

function footer(clinic: ClinicProfile): string {
  return `\n--\n${clinic.name}\n${clinic.addressLines.join('\n')}\n${clinic.phone}`;
}

/** Sent on booking: when, where, and how to prepare. */
export function bookingConfirmation(clinic: ClinicProfile, e: ExamFacts): MailContent {
  const subject = `Your ${e.examTypeName.toLowerCase()} on ${e.when}`;
  const lines = [
    `Dear ${e.patientName},`,
    `your appointment for a ${e.examTypeName.toLowerCase()} is booked for ${e.when} in ${e.room}.`,
    `How to prepare: ${e.preparation}`,
    `Please arrive 10 minutes early and bring photo identification. To change or cancel, call us on ${clinic.phone}.`,
    `Reference: ${e.accessionNumber}`,
  ];
  return {
    subject,
    text: lines.join('\n\n') + footer(clinic),
    html: layout(clinic, 'Your appointment is booked', [
      esc(lines[0]!),
      `Your appointment for a <b>${esc(e.examTypeName.toLowerCase())}</b> is booked for <b>${esc(e.when)}</b> in ${esc(e.room)}.`,
      `<b>How to prepare:</b> ${esc(e.preparation)}`,
      esc(lines[3]!),
      `<span style="color:#6c7f99">Reference: ${esc(e.accessionNumber)}</span>`,
    ]),
  };
}

/** Sent the day before. */
export function reminder(clinic: ClinicProfile, e: ExamFacts): MailContent {
  const subject = `Reminder: your ${e.examTypeName.toLowerCase()} tomorrow`;
  const lines = [
    `Dear ${e.patientName},`,
    `a reminder of your ${e.examTypeName.toLowerCase()} on ${e.when} in ${e.room}.`,
    `How to prepare: ${e.preparation}`,
    `If you cannot come, please call us on ${clinic.phone} so another patient can have the time.`,
  ];
  return {
    subject,
    text: lines.join('\n\n') + footer(clinic),
    html: layout(clinic, 'See you tomorrow', [
      esc(lines[0]!),
      `A reminder of your <b>${esc(e.examTypeName.toLowerCase())}</b> on <b>${esc(e.when)}</b> in ${esc(e.room)}.`,
      `<b>How to prepare:</b> ${esc(e.preparation)}`,
      esc(lines[3]!),
    ]),
  };
}

/** Sent on cancellation, with what happens to money already paid. */
export function cancellation(clinic: ClinicProfile, e: ExamFacts, money: { refundCents: number; keptCents: number; currency: string; reason: string } | null): MailContent {
  const subject = `Cancelled: your ${e.examTypeName.toLowerCase()} on ${e.when}`;
  const moneyLine = money
    ? money.refundCents > 0
      ? `We are refunding ${formatMoney(money.refundCents, money.currency)} to your card; it can take a few days to appear. ${money.reason}`
      : `${money.reason} (${formatMoney(money.keptCents, money.currency)}).`
    : '';
  const lines = [`Dear ${e.patientName},`, `your ${e.examTypeName.toLowerCase()} on ${e.when} has been cancelled.`, moneyLine, `To book a new time, call us on ${clinic.phone}.`].filter(Boolean);
  return {
    subject,
    text: lines.join('\n\n') + footer(clinic),
    html: layout(clinic, 'Your appointment is cancelled', lines.map(esc)),
  };
}

/** Sent when a deposit or balance has been paid. */
export function receipt(clinic: ClinicProfile, e: ExamFacts, p: { kind: 'deposit' | 'balance'; amountCents: number; currency: string; paidAt: string; providerId: string }): MailContent {
  const amount = formatMoney(p.amountCents, p.currency);
  const what = p.kind === 'deposit' ? 'deposit' : 'payment';
  const subject = `Receipt: ${amount} ${what} for your ${e.examTypeName.toLowerCase()}`;
  const lines = [
    `Dear ${e.patientName},`,
    `we have received your ${what} of ${amount} on ${p.paidAt} for your ${e.examTypeName.toLowerCase()} (${e.when}).`,
    `Reference: ${e.accessionNumber} / ${p.providerId}`,
  ];
  return {
    subject,
    text: lines.join('\n\n') + footer(clinic),
    html: layout(clinic, 'Thank you for your payment', [esc(lines[0]!), `We have received your ${what} of <b>${esc(amount)}</b> on ${esc(p.paidAt)} for your ${esc(e.examTypeName.toLowerCase())} (${esc(e.when)}).`, `<span style="color:#6c7f99">${esc(lines[2]!)}</span>`]),
  };
}

/**
 * To the referring clinician when a report is signed (or corrected by an addendum): that it is
 * ready and where to read it, never what it says (no diagnosis, no patient name in an e-mail).
 */
export function reportReady(
  clinic: ClinicProfile,
  r: { referrerName: string; examTypeName: string; examDay: string; accessionNumber: string; link: string; expiresOn: string; reason: 'final' | 'addendum' },
): MailContent {
  const what = r.reason === 'final' ? 'The final report' : 'An addendum to the report';
  const subject = r.reason === 'final' ? `Report ready: ${r.examTypeName}, reference ${r.accessionNumber}` : `Report corrected: ${r.examTypeName}, reference ${r.accessionNumber}`;
  const lines = [
    `Dear ${r.referrerName},`,
    `${what} of the ${r.examTypeName.toLowerCase()} of ${r.examDay} that you requested (reference ${r.accessionNumber}) is ready.`,
    `Read it here after signing in to ${clinic.name}'s Crestline: ${r.link}`,
    `The link works until ${r.expiresOn}. It is for you alone; please do not forward it. For questions call us on ${clinic.phone}.`,
  ];
  return {
    subject,
    text: lines.join('\n\n') + footer(clinic),
    html: layout(clinic, r.reason === 'final' ? 'A report is ready' : 'A report was corrected', [
      esc(lines[0]!),
      esc(lines[1]!),
      `<a href="${esc(r.link)}" style="display:inline-block;background:#1b7a6c;color:#ffffff;text-decoration:none;padding:10px 16px;border-radius:6px">Read the report</a>`,
      `<span style="font-size:13px;color:#4c6079">${esc(lines[3]!)}</span>`,
    ]),
  };
}
