/** The optional support condition a strike was recorded on, as the upload forms ask for it. */
import { supportLabels, supports, type Support } from "@shared/schemas/spec";
import { SelectField } from "@/components/ui/field";

export function SupportSelect({ label, value, onChange, disabled }: { label: string; value: Support | ""; onChange: (value: Support | "") => void; disabled?: boolean }) {
  return (
    <SelectField label={label} value={value} disabled={disabled} onChange={(e) => onChange(e.target.value as Support | "")}>
      <option value="">Not recorded</option>
      {supports.map((s) => (
        <option key={s} value={s}>
          {supportLabels[s]}
        </option>
      ))}
    </SelectField>
  );
}
