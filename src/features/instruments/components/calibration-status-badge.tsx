import { calibrationStatusLabels, type CalibrationStatus } from "@shared/schemas/instrument";
import { Badge } from "@/components/ui/panel";

const tone = { calibrated: "moss", due_soon: "ochre", expired: "rust", never: "neutral" } as const;

export function CalibrationStatusBadge({ status }: { status: CalibrationStatus }) {
  return <Badge tone={tone[status]}>{calibrationStatusLabels[status]}</Badge>;
}
