import { Form, Input } from 'antd';
import { useEffect, useId, useState, type ReactNode } from 'react';
import { formatForInput } from '@/lib/format';
import { parseValues } from './spec-draft';

function parseOne(text: string): number | null {
  const trimmed = text.trim();
  if (trimmed === '') return null;
  const { values, bad } = parseValues(trimmed);
  // Anything unreadable becomes NaN, which the schema rejects with its own message.
  return bad === null && values.length === 1 ? values[0]! : Number.NaN;
}

const same = (a: number | null, b: number | null) => a === b || (Number.isNaN(a) && Number.isNaN(b));

/**
 * A number typed as text (so 1e-8 and 0.9π work), with its unit, its allowed
 * range as a hint, and the schema's message when the value is not allowed.
 */
export function NumberField({
  label,
  value,
  onChange,
  unit,
  hint,
  error,
  placeholder,
  extra,
}: {
  label: string;
  value: number | null;
  onChange: (value: number | null) => void;
  unit?: string;
  hint?: string;
  error?: string;
  placeholder?: string;
  extra?: ReactNode;
}) {
  const id = useId();
  const [text, setText] = useState(formatForInput(value));
  // Follow changes made from outside (e.g. a reset), without fighting the typing.
  useEffect(() => {
    if (!same(parseOne(text), value)) setText(formatForInput(value));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  return (
    <Form.Item
      label={label}
      htmlFor={id}
      validateStatus={error ? 'error' : undefined}
      help={error}
      extra={error ? undefined : (extra ?? hint)}
      className="spec-field"
    >
      <Input
        id={id}
        value={text}
        inputMode="decimal"
        placeholder={placeholder}
        suffix={unit ? <span className="spec-field__unit">{unit}</span> : undefined}
        onChange={(event) => {
          setText(event.target.value);
          onChange(parseOne(event.target.value));
        }}
        aria-invalid={error ? true : undefined}
      />
    </Form.Item>
  );
}
