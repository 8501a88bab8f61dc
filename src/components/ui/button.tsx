import type { ButtonHTMLAttributes } from 'react';
import { Link, type LinkProps } from 'react-router-dom';

type Variant = 'primary' | 'secondary' | 'ghost' | 'danger';
type Size = 'sm' | 'md';

const base =
  'inline-flex items-center justify-center gap-1.5 rounded-card font-medium whitespace-nowrap transition-colors disabled:cursor-not-allowed disabled:opacity-55 cursor-pointer';
const variants: Record<Variant, string> = {
  primary: 'bg-clay-600 text-paper-raised hover:bg-clay-700 border border-clay-700',
  secondary: 'bg-paper-raised text-ink border border-ink-line hover:border-ink-faint hover:bg-paper',
  ghost: 'text-ink-soft hover:text-ink hover:bg-paper-sunk border border-transparent',
  danger: 'bg-danger text-paper-raised border border-danger hover:brightness-110',
};
const sizes: Record<Size, string> = { sm: 'h-7 px-2.5 text-sm', md: 'h-9 px-3.5 text-base' };

export const buttonClass = (variant: Variant = 'secondary', size: Size = 'md', extra = '') =>
  `${base} ${variants[variant]} ${sizes[size]} ${extra}`;

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  size?: Size;
  busy?: boolean;
};

export function Button({
  variant,
  size,
  busy,
  className = '',
  type = 'button',
  disabled,
  children,
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      className={buttonClass(variant, size, className)}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...rest}
    >
      {busy ? (
        <span
          className="size-3 animate-spin rounded-full border-2 border-current border-t-transparent"
          aria-hidden
        />
      ) : null}
      {children}
    </button>
  );
}

/** A link that looks like a button: for navigation, never for actions. */
export function ButtonLink({
  variant,
  size,
  className = '',
  ...rest
}: LinkProps & { variant?: Variant; size?: Size }) {
  return <Link className={buttonClass(variant, size, className)} {...rest} />;
}
