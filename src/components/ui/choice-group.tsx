import { useId } from 'react';

/**
 * A row of large radio buttons (one tap, no dropdown to open with gloves on). Native radios underneath,
 * so arrow keys and screen readers work as usual.
 */
export function ChoiceGroup<T extends string>({
  legend,
  name,
  value,
  options,
  onChange,
  error,
}: {
  legend: string;
  name: string;
  value: T | '';
  options: readonly { value: T; label: string }[];
  onChange(value: T): void;
  error?: string;
}) {
  const id = useId();
  return (
    <fieldset className="flex flex-col gap-1 text-sm" aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1 font-medium text-ink">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {options.map((o) => (
          <label
            key={o.value}
            className="flex min-h-11 min-w-11 cursor-pointer items-center justify-center rounded-md border border-rule bg-panel px-3 has-[:checked]:border-accent has-[:checked]:bg-accent has-[:checked]:text-white has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-accent"
          >
            <input type="radio" className="sr-only" name={name} value={o.value} checked={value === o.value} onChange={() => onChange(o.value)} />
            {o.label}
          </label>
        ))}
      </div>
      {error && <span id={`${id}-error`} className="text-xs text-state-bad">{error}</span>}
    </fieldset>
  );
}
