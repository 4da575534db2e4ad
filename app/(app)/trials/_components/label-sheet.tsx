import type { Label } from "@/lib/trials/labels";

/**
 * Labels to tape on the bags: the block code with its strain beside it, a QR code that opens the
 * phone harvest form for that block, and blank lines to write a flush's date and wet mass on.
 * The QR code is SVG made on the server (lib/trials/labels.ts): paths only, nothing to run.
 */
export function LabelSheet({ labels, trialCode }: { labels: Label[]; trialCode: string }) {
  return (
    <div className="label-sheet grid grid-cols-1 gap-0 sm:grid-cols-2 print:grid-cols-2" data-testid="label-sheet">
      {labels.map((label) => (
        <div key={label.blockCode} className="label flex gap-4 border border-dashed border-ink bg-white p-4 text-ink">
          <div
            className="size-28 shrink-0 [&_svg]:size-full"
            role="img"
            aria-label={`QR code: opens the harvest form for ${label.blockCode}`}
            data-harvest-url={label.harvestUrl}
            dangerouslySetInnerHTML={{ __html: label.qrSvg }}
          />
          <div className="min-w-0 flex-1">
            <p className="font-mono text-2xl font-bold tracking-wide">{label.blockCode}</p>
            <p className="text-base">
              <span className="font-semibold">Arm {label.armLabel}</span> · {label.strainCode} {label.strainName}
              {label.treatmentName ? ` · ${label.treatmentName}` : ""}
            </p>
            {label.roomName ? <p className="text-base font-semibold">Room: {label.roomName}</p> : null}
            <p className="text-sm">Trial {trialCode}</p>
            <dl className="mt-2 space-y-2 text-sm">
              <div className="flex items-end gap-2">
                <dt>Date</dt>
                <dd className="h-5 flex-1 border-b border-ink" />
              </div>
              <div className="flex items-end gap-2">
                <dt>Wet mass</dt>
                <dd className="h-5 flex-1 border-b border-ink" />
              </div>
            </dl>
          </div>
        </div>
      ))}
    </div>
  );
}
