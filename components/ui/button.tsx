import Link from "next/link";
import type { ComponentProps } from "react";
import { cn } from "./cn";
import { Spinner } from "./spinner";

export type ButtonVariant = "primary" | "secondary" | "danger" | "ghost";
export type ButtonSize = "sm" | "md" | "lg";

const base =
  "inline-flex items-center justify-center gap-2 whitespace-nowrap rounded-md font-medium transition-colors " +
  "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus " +
  "disabled:cursor-not-allowed disabled:opacity-55 aria-disabled:cursor-not-allowed aria-disabled:opacity-55";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-ink text-on-ink hover:bg-ink/85 border border-ink",
  secondary: "bg-surface text-ink border border-rule-strong hover:bg-sunken",
  danger: "bg-fail text-on-fail border border-fail hover:bg-fail/85",
  ghost: "bg-transparent text-ink border border-transparent hover:bg-ink/8",
};

const sizes: Record<ButtonSize, string> = {
  sm: "h-8 px-2.5 text-sm",
  md: "h-9 px-3.5 text-sm",
  lg: "h-11 px-5 text-base",
};

/** Class names of a button, for elements that must look like one (links, summary, label). */
export function buttonClassName({
  variant = "primary",
  size = "md",
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}): string {
  return cn(base, variants[variant], sizes[size], className);
}

export type ButtonProps = ComponentProps<"button"> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner, disables the button and tells assistive technology it is busy. */
  loading?: boolean;
  /** Text read while loading, e.g. "Saving…". Defaults to the children. */
  loadingText?: string;
};

export function Button({
  variant = "primary",
  size = "md",
  loading = false,
  loadingText,
  disabled,
  className,
  children,
  type = "button",
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      className={buttonClassName({ variant, size, className })}
      {...rest}
    >
      {loading ? <Spinner size="sm" /> : null}
      {loading && loadingText ? loadingText : children}
    </button>
  );
}

export type LinkButtonProps = ComponentProps<typeof Link> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
};

/** A link that looks like a button (navigation, downloads). */
export function LinkButton({ variant = "secondary", size = "md", className, ...rest }: LinkButtonProps) {
  return <Link className={buttonClassName({ variant, size, className })} {...rest} />;
}
