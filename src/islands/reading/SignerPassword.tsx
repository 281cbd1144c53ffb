import type { Ref } from 'react';

/**
 * The physician's own password, asked again to sign a report or an addendum, with the server's
 * refusal under it.
 */
export function SignerPassword({ id, value, onChange, error, inputRef }: { id: string; value: string; onChange: (v: string) => void; error?: string; inputRef?: Ref<HTMLInputElement> }) {
  return (
    <>
      <label className="block max-w-xs">
        <span className="field-label">Your password</span>
        <input
          ref={inputRef}
          type="password"
          autoComplete="current-password"
          className="field-input"
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
        />
      </label>
      {error && <p id={`${id}-error`} role="alert" className="field-error">{error}</p>}
    </>
  );
}
