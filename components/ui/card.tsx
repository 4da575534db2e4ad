export function Card({ title, children, className = "" }: { title?: string; children: React.ReactNode; className?: string }) {
  return (
    <section className={`rounded-xl border border-oat-300 bg-white p-5 shadow-sm ${className}`}>
      {title ? <h2 className="mb-3 text-lg font-semibold text-moss-800">{title}</h2> : null}
      {children}
    </section>
  );
}
