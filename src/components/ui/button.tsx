import clsx from "clsx";
import { forwardRef, type ButtonHTMLAttributes } from "react";
import { Link, type LinkProps } from "react-router";
import { Spinner } from "./spinner";

type Variant = "primary" | "secondary" | "quiet" | "danger";
type Size = "md" | "sm";

const base =
  "inline-flex items-center justify-center gap-2 rounded-control font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-60 select-none";
const variants: Record<Variant, string> = {
  primary: "bg-steel-600 text-white hover:bg-steel-700 active:bg-steel-800",
  secondary: "border border-line-strong bg-surface text-ink hover:bg-sunken",
  quiet: "text-steel-700 hover:bg-steel-50",
  danger: "border border-rust-300 bg-surface text-rust-700 hover:bg-rust-50",
};
const sizes: Record<Size, string> = {
  md: "min-h-touch px-4 text-body",
  sm: "min-h-9 px-3 text-caption",
};

export function buttonClasses(variant: Variant = "primary", size: Size = "md", className?: string) {
  return clsx(base, variants[variant], sizes[size], className);
}

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: Size; pending?: boolean };

export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { variant = "primary", size = "md", pending = false, className, children, disabled, type = "button", ...rest },
  ref,
) {
  return (
    <button ref={ref} type={type} className={buttonClasses(variant, size, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending ? <Spinner size="sm" /> : null}
      {children}
    </button>
  );
});

export function ButtonLink({ variant = "secondary", size = "md", className, ...rest }: LinkProps & { variant?: Variant; size?: Size }) {
  return <Link className={buttonClasses(variant, size, className)} {...rest} />;
}
