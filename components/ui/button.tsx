import Link from "next/link";

const variants = {
  primary: "bg-moss-600 text-white hover:bg-moss-700 disabled:bg-oat-300 disabled:text-ink-soft",
  secondary: "border border-moss-600 bg-white text-moss-700 hover:bg-moss-50 disabled:border-oat-300 disabled:text-ink-soft",
  danger: "bg-danger-ink text-white hover:bg-danger-ink/90 disabled:bg-oat-300",
} as const;

const base =
  "inline-flex min-h-11 items-center justify-center rounded-lg px-4 py-2 text-sm font-semibold transition-colors disabled:cursor-not-allowed";

type ButtonProps = React.ButtonHTMLAttributes<HTMLButtonElement> & { variant?: keyof typeof variants };

export function Button({ variant = "primary", className = "", ...props }: ButtonProps) {
  return <button className={`${base} ${variants[variant]} ${className}`} {...props} />;
}

export function ButtonLink({
  variant = "primary",
  className = "",
  ...props
}: React.ComponentProps<typeof Link> & { variant?: keyof typeof variants }) {
  return <Link className={`${base} ${variants[variant]} ${className}`} {...props} />;
}
