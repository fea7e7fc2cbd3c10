import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router';
import { Icon, type IconName } from './icon';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'quiet';
export type ButtonSize = 'sm' | 'md' | 'lg';

const base =
  'inline-flex items-center justify-center gap-2 whitespace-nowrap rounded-control font-medium ' +
  'transition-colors disabled:cursor-not-allowed disabled:opacity-55 aria-disabled:cursor-not-allowed aria-disabled:opacity-55 ' +
  'floor:min-h-12 floor:min-w-12 floor:text-base';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-accent text-white hover:bg-accent-strong border border-accent-strong',
  secondary: 'border border-rule-strong bg-card text-ink hover:bg-sunk',
  // destructive actions stay outlined: the word carries the weight, not a loud fill
  danger: 'border-2 border-bad bg-card text-bad hover:bg-bad-tint',
  quiet: 'text-accent underline-offset-4 hover:underline hover:bg-accent-tint',
};

const sizes: Record<ButtonSize, string> = {
  sm: 'h-8 px-2.5 text-sm floor:px-3.5',
  md: 'h-9 px-3.5 text-[0.95rem] floor:px-4',
  lg: 'h-11 px-5 text-base floor:h-12',
};

export function buttonClass(variant: ButtonVariant = 'secondary', size: ButtonSize = 'md'): string {
  return `${base} ${variants[variant]} ${sizes[size]}`;
}

type Own = { variant?: ButtonVariant; size?: ButtonSize; icon?: IconName; children?: ReactNode };

export function Button({
  variant,
  size,
  icon,
  children,
  type = 'button',
  ...rest
}: Own & ButtonHTMLAttributes<HTMLButtonElement>) {
  return (
    <button type={type} className={buttonClass(variant, size)} {...rest}>
      {icon && <Icon name={icon} size={size === 'sm' ? 16 : 18} />}
      {children}
    </button>
  );
}

export function ButtonLink({ variant, size, icon, children, ...rest }: Own & LinkProps) {
  return (
    <Link className={buttonClass(variant, size)} {...rest}>
      {icon && <Icon name={icon} size={size === 'sm' ? 16 : 18} />}
      {children}
    </Link>
  );
}
