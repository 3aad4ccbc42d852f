import { SelectField } from "@/components/ui/field";
import type { ProgramOption } from "@/db/queries/programs";

/**
 * The program a new site, variety or trait joins. Shown only to people who run several programs (and to
 * admins); with one program there is nothing to choose and the server uses it.
 */
export function ProgramField({ programs, id = "programId", defaultValue, errors, className }: { programs: ProgramOption[]; id?: string; defaultValue?: string; errors?: string[]; className?: string }) {
  if (programs.length <= 1) return null;
  return (
    <SelectField label="Program" name="programId" id={id} defaultValue={defaultValue ?? ""} errors={errors} className={className}>
      <option value="">Choose…</option>
      {programs.map((p) => (
        <option key={p.id} value={p.id}>
          {p.name}
        </option>
      ))}
    </SelectField>
  );
}
