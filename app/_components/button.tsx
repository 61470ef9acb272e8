import Link from "next/link";
import type { ButtonHTMLAttributes, ReactNode } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";

interface CommonProps {
  variant?: Variant;
  size?: "normal" | "small";
  children: ReactNode;
  className?: string;
}

function classes(variant: Variant, size: "normal" | "small", extra?: string): string {
  return ["button", variant === "secondary" ? "" : `button--${variant}`, size === "small" ? "button--small" : "", extra ?? ""].filter(Boolean).join(" ");
}

export type ButtonProps = CommonProps & ButtonHTMLAttributes<HTMLButtonElement>;

/** A button; `type` defaults to "button" so only the intended one submits a form. */
export function Button({ variant = "secondary", size = "normal", className, type = "button", children, ...rest }: ButtonProps) {
  return (
    <button type={type} className={classes(variant, size, className)} {...rest}>
      {children}
    </button>
  );
}

/** A link styled as a button, for navigation that reads as an action ("Add a source"). */
export function ButtonLink({ variant = "secondary", size = "normal", className, href, children }: CommonProps & { href: string }) {
  return (
    <Link href={href} className={classes(variant, size, className)}>
      {children}
    </Link>
  );
}
