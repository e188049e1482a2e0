import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router-dom';

export type ButtonVariant = 'primary' | 'secondary' | 'quiet' | 'danger';

// min-h-11/min-w-11: every target is at least 44×44 px, for gloved or hurried hands on a tablet.
const base =
  'inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-lg px-4 py-2 text-base font-semibold ' +
  'transition-colors no-underline disabled:cursor-not-allowed disabled:opacity-60';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-verdigris-700 text-white hover:bg-verdigris-800 active:bg-verdigris-900',
  secondary: 'border border-verdigris-700 bg-white text-verdigris-800 hover:bg-verdigris-50',
  quiet: 'text-verdigris-800 underline hover:bg-plaster-100',
  danger: 'bg-brick-700 text-white hover:bg-brick-800',
};

export function buttonClasses(variant: ButtonVariant = 'primary', extra = ''): string {
  return `${base} ${variants[variant]} ${extra}`.trim();
}

interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  /** Shows the work is under way and blocks a second press. */
  pending?: boolean;
  pendingLabel?: ReactNode;
}

export function Button({ variant = 'primary', pending = false, pendingLabel, className = '', type = 'button', disabled, children, ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClasses(variant, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending ? (pendingLabel ?? children) : children}
    </button>
  );
}

interface ButtonLinkProps extends LinkProps {
  variant?: ButtonVariant;
}

/** A link that looks like a button: for moving somewhere, never for doing something. */
export function ButtonLink({ variant = 'primary', className = '', ...rest }: ButtonLinkProps) {
  return <Link className={buttonClasses(variant, className)} {...rest} />;
}
