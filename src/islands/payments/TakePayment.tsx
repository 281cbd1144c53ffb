import { useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import { formatMoney } from '../../lib/booking/refunds';
import { TEST_PAYMENT_METHODS } from '../../lib/schemas/exams';
import { ProviderCardForm } from './ProviderCardForm';

export interface PaymentAnswer {
  outcome: 'succeeded' | 'declined' | 'pending' | 'requires-action';
  message: string;
  paymentState: string;
  clientSecret?: string;
}

interface Props {
  examId: number;
  kind: 'deposit' | 'balance';
  amountCents: number;
  currency: string;
  mode: 'test' | 'live' | 'off';
  publishableKey?: string;
  onDone: (answer: PaymentAnswer) => void;
}

/**
 * Takes a deposit or balance. Against the local payments stand-in it offers the provider's
 * documented test payment methods; in live mode the card is typed into the provider's own
 * element, so card numbers never reach Crestline.
 */
export function TakePayment({ examId, kind, amountCents, currency, mode, publishableKey, onDone }: Props) {
  const [method, setMethod] = useState<string>(TEST_PAYMENT_METHODS[0].id);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [clientSecret, setClientSecret] = useState<string | null>(null);
  const label = `${kind === 'deposit' ? 'Take deposit' : 'Take balance'} of ${formatMoney(amountCents, currency)}`;

  if (mode === 'off') return <p className="text-sm text-ink-500">Card payments are not set up on this server.</p>;

  const submit = async () => {
    setBusy(true);
    setProblem(null);
    try {
      const { payment } = await api<{ payment: PaymentAnswer }>(`/api/exams/${examId}/payments`, { method: 'POST', body: mode === 'test' ? { kind, paymentMethod: method } : { kind } });
      if (payment.outcome === 'requires-action' && payment.clientSecret) setClientSecret(payment.clientSecret);
      else if (payment.outcome === 'declined') setProblem(payment.message);
      else onDone(payment);
    } catch (e) {
      setProblem(e instanceof ApiError ? e.message : 'The payment could not be taken.');
    } finally {
      setBusy(false);
    }
  };

  if (clientSecret && publishableKey) {
    return <ProviderCardForm publishableKey={publishableKey} clientSecret={clientSecret} label={label} onDone={(ok, message) => (ok ? onDone({ outcome: 'pending', message, paymentState: 'deposit-due' }) : setProblem(message))} />;
  }

  return (
    <div className="space-y-3">
      {mode === 'test' && (
        <fieldset>
          <legend className="field-label">Payment method (test mode: the local payments stand-in)</legend>
          <div className="mt-1 space-y-1">
            {TEST_PAYMENT_METHODS.map((m) => (
              <label key={m.id} className="flex items-center gap-2 text-sm">
                <input type="radio" name={`pm-${kind}-${examId}`} value={m.id} checked={method === m.id} onChange={() => setMethod(m.id)} />
                {m.label}
              </label>
            ))}
          </div>
        </fieldset>
      )}
      {problem && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{problem}</p>}
      <button type="button" className="btn-primary" disabled={busy} onClick={submit}>{busy ? 'Taking payment…' : label}</button>
    </div>
  );
}
