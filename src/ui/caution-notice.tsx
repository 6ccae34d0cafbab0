/**
 * Shown wherever corrected values or residuals appear (results, exports, reports): residual
 * anomalies are relative values and no clearance for digging.
 */
import { AlertIcon } from "./icons";

export function CautionNotice({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      role="note"
      aria-label="Caution before digging"
      className="flex items-start gap-2 rounded-md border border-flare-500/50 bg-flare-50 px-3 py-2 text-sm text-flare-700"
    >
      <AlertIcon size={16} className="mt-0.5 shrink-0" />
      <p>
        <strong className="font-semibold">Caution: </strong>
        residuals are relative to the survey datum and are no clearance for digging.
        {compact
          ? " Check buried services and ordnance with licensed specialists."
          : " A quiet profile does not prove the ground is free of buried services, ordnance or foundations. Before any excavation, have the ground cleared by licensed specialists and follow the local codes for locating utilities and unexploded ordnance."}
      </p>
    </aside>
  );
}
