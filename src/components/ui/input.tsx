import type { InputHTMLAttributes, TextareaHTMLAttributes } from 'react';

export const controlClass =
  'w-full rounded-control border border-rule-strong bg-field px-2.5 text-ink placeholder:text-ink-faint ' +
  'hover:border-ink-soft aria-[invalid=true]:border-2 aria-[invalid=true]:border-bad ' +
  'disabled:bg-sunk disabled:text-ink-soft floor:text-base';

type InputProps = InputHTMLAttributes<HTMLInputElement> & { mono?: boolean };

export function Input({ mono, ...rest }: InputProps) {
  return <input className={`${controlClass} h-9 floor:h-12 ${mono ? 'font-mono' : ''}`} {...rest} />;
}

export function Textarea(props: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea className={`${controlClass} min-h-20 py-2`} {...props} />;
}

export function Checkbox(props: Omit<InputHTMLAttributes<HTMLInputElement>, 'type'>) {
  return <input type="checkbox" className="size-4 accent-accent floor:size-6" {...props} />;
}
