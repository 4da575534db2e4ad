const tones = {
  info: "border-moss-100 bg-moss-50 text-moss-800",
  caution: "border-caution-ink/30 bg-caution-bg text-caution-ink",
  danger: "border-danger-ink/30 bg-danger-bg text-danger-ink",
} as const;

/** A boxed message; `caution` is for the trade's safety reminders, `danger` for errors. */
export function Notice({
  tone = "info",
  title,
  children,
  id,
}: {
  tone?: keyof typeof tones;
  title?: string;
  children: React.ReactNode;
  id?: string;
}) {
  return (
    <div id={id} role={tone === "danger" ? "alert" : "note"} className={`rounded-lg border px-4 py-3 text-sm ${tones[tone]}`}>
      {title ? <p className="mb-1 font-semibold">{title}</p> : null}
      <div className="space-y-1">{children}</div>
    </div>
  );
}
