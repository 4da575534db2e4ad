/** Particulars folded under a summary line: labelled values a person opens when they want them. */
export function FoldedDetails({ summary, details }: { summary: React.ReactNode; details: readonly { label: string; value: string }[] }) {
  return (
    <details>
      <summary className="min-h-11 cursor-pointer content-center font-semibold text-moss-700">{summary}</summary>
      <dl className="mt-1 max-w-md space-y-1">
        {details.map((detail, index) => (
          <div key={index}>
            <dt className="font-semibold">{detail.label}</dt>
            <dd className="break-words">{detail.value}</dd>
          </div>
        ))}
      </dl>
    </details>
  );
}
