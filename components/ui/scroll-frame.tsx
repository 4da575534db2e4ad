/**
 * A wide table or chart that scrolls sideways inside the page on a phone, instead of widening the
 * page. Focusable and named, so a keyboard can scroll it and a screen reader says what it holds.
 */
export function ScrollFrame({ label, className = "", children }: { label: string; className?: string; children: React.ReactNode }) {
  return (
    // A region a keyboard must be able to reach to scroll (WCAG 2.1.1; axe's scrollable-region-focusable).
    <div className={`overflow-x-auto ${className}`} tabIndex={0} role="region" aria-label={label}>
      {children}
    </div>
  );
}
