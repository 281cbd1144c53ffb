import { useEffect, useRef, useState } from 'react';

// The provider's browser library, loaded from the provider (it must never be bundled or
// self-hosted). Only used in live mode; not exercised on these offline machines.
type StripeJs = {
  elements(o: { clientSecret: string }): { create(type: 'payment'): { mount(el: HTMLElement): void } };
  confirmPayment(o: { elements: unknown; redirect: 'if_required' }): Promise<{ error?: { message?: string } }>;
};
declare global {
  interface Window {
    Stripe?: (key: string) => StripeJs;
  }
}

function loadProviderScript(): Promise<void> {
  if (window.Stripe) return Promise.resolve();
  return new Promise((resolve, reject) => {
    const s = document.createElement('script');
    s.src = 'https://js.stripe.com/v3';
    s.onload = () => resolve();
    s.onerror = () => reject(new Error('The card form could not be loaded.'));
    document.head.appendChild(s);
  });
}

/** The provider's own card element; the card never passes through Crestline's server. */
export function ProviderCardForm({ publishableKey, clientSecret, label, onDone }: { publishableKey: string; clientSecret: string; label: string; onDone: (ok: boolean, message: string) => void }) {
  const host = useRef<HTMLDivElement>(null);
  const [ctx, setCtx] = useState<{ stripe: StripeJs; elements: unknown } | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    loadProviderScript()
      .then(() => {
        const stripe = window.Stripe!(publishableKey);
        const elements = stripe.elements({ clientSecret });
        elements.create('payment').mount(host.current!);
        setCtx({ stripe, elements });
      })
      .catch((e: Error) => setError(e.message));
  }, [publishableKey, clientSecret]);
  return (
    <div className="space-y-3">
      <div ref={host} className="rounded-md border border-ink-200 p-3" />
      {error && <p role="alert" className="field-error">{error}</p>}
      <button type="button" className="btn-primary" disabled={!ctx} onClick={async () => {
        const result = await ctx!.stripe.confirmPayment({ elements: ctx!.elements, redirect: 'if_required' });
        if (result.error) onDone(false, result.error.message ?? 'The card was declined.');
        else onDone(true, 'Payment sent; it shows as paid as soon as the payment service confirms it.');
      }}>{label}</button>
    </div>
  );
}
